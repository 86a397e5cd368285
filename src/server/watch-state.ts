// Trip watch, the state the API reads and writes (issue #20): whether a trip is watched, who gets
// its e-mail, its window, its runs and the notice the trip page shows. The runs themselves are in
// watch-run.ts; the pure rules in src/domain/watch/change.ts.
import type { Kysely } from 'kysely';
import type { DB, TripRow } from '../../db/schema';
import { planTimeline } from '../engine';
import { dueForRun, inWatchWindow, WATCH_LEAD_DAYS, watchedByDefault } from '../domain/watch/change';
import type { RigRole } from './access';
import { env } from './env';
import { HttpError } from './errors';
import { toUnits, type Units } from '../lib/units';

const DAY_MS = 86_400_000;
/** The timeline shows at most this many runs. */
export const RUNS_SHOWN = 20;

export type { WatchVerdict } from '../domain/watch/view';
/** The answer of GET /api/trips/:id/watch, as the page reads it. */
export type { TripWatch as WatchView, WatchRun as WatchRunDto } from '../domain/watch/view';
import type { TripWatch as WatchView, WatchRun as WatchRunDto, WatchVerdict } from '../domain/watch/view';

/** First arrival and end of a trip (ms since the epoch), from its stored stops and drives. */
export function tripFrame(trip: Pick<TripRow, 'stops' | 'drives'>): { startMs: number; endMs: number } | null {
  try {
    const stops = JSON.parse(trip.stops) as { timeZone: string; arrive: string; nights: number; arriveHour?: number }[];
    if (!Array.isArray(stops) || stops.length === 0) return null;
    const tl = planTimeline(
      stops.map((s) => ({ ...s, arriveHour: s.arriveHour ?? 15 })),
      JSON.parse(trip.drives),
    );
    return Number.isFinite(tl.startMs) && Number.isFinite(tl.endMs) ? { startMs: tl.startMs, endMs: tl.endMs } : null;
  } catch {
    return null;
  }
}

/** Whether the watch is on for a trip: the owner's or an editor's choice, else the default. */
export function watchOn(choice: number | boolean | null | undefined, frame: { startMs: number; endMs: number }, nowMs: number): boolean {
  if (choice === null || choice === undefined) return watchedByDefault(frame.startMs, frame.endMs, nowMs);
  return Boolean(choice);
}

/** When the watch runs this trip next, or null when it will not (off, ended, or WATCH=off). */
export function nextRunAt(enabled: boolean, frame: { startMs: number; endMs: number }, lastRunAt: string | null, nowMs: number, intervalMinutes = env.WATCH_INTERVAL_MINUTES): string | null {
  if (!enabled || env.WATCH === 'off' || nowMs >= frame.endMs) return null;
  const from = frame.startMs - WATCH_LEAD_DAYS * DAY_MS;
  const last = lastRunAt ? Date.parse(lastRunAt) : null;
  let next = last === null ? nowMs : last + intervalMinutes * 60_000;
  if (inWatchWindow(frame.startMs, frame.endMs, nowMs) && dueForRun(last, nowMs, intervalMinutes)) next = nowMs;
  next = Math.max(next, from);
  return next < frame.endMs ? new Date(next).toISOString() : null;
}

/** Whether a person with this role gets the trip's watch e-mail, given their own choice. */
export function mailsPerson(role: RigRole | string, choice: 'follow' | 'stop' | null | undefined): boolean {
  if (choice === 'stop') return false;
  if (role === 'owner' || role === 'editor') return true;
  return role === 'viewer' && choice === 'follow';
}

function toRun(r: {
  forecast_id: string;
  ran_at: string;
  status: string;
  min_soc_pct: number;
  first_cutoff_at: string | null;
  first_cutoff_local: string | null;
  changed: number | boolean;
  reason: string | null;
  band_low_pct: number | null;
  band_high_pct: number | null;
}): WatchRunDto {
  return {
    forecastId: r.forecast_id,
    ranAt: new Date(r.ran_at).toISOString(),
    verdict: r.status as WatchVerdict,
    minSocPct: Number(r.min_soc_pct),
    firstCutoffAt: r.first_cutoff_at,
    firstCutoffLocal: r.first_cutoff_local,
    changed: Boolean(r.changed),
    reason: r.reason,
    band: r.band_low_pct === null || r.band_high_pct === null ? null : { lowSocPct: Number(r.band_low_pct), highSocPct: Number(r.band_high_pct) },
  };
}

/** The watch as the trip page shows it to one person. */
export async function watchView(db: Kysely<DB>, input: { trip: TripRow; role: RigRole; userId: string; now?: Date }): Promise<WatchView> {
  const nowMs = (input.now ?? new Date()).getTime();
  const frame = tripFrame(input.trip);
  if (!frame) throw new HttpError('invalid_request', 'This trip has no stops to watch yet.', [{ path: 'stops', message: 'add a stop' }]);
  const [state, person, runs] = await Promise.all([
    db.selectFrom('trip_watches').selectAll().where('trip_id', '=', input.trip.id).executeTakeFirst(),
    db.selectFrom('watch_people').select('choice').where('trip_id', '=', input.trip.id).where('user_id', '=', input.userId).executeTakeFirst(),
    db.selectFrom('watch_runs').selectAll().where('trip_id', '=', input.trip.id).orderBy('ran_at', 'desc').orderBy('forecast_id', 'desc').limit(RUNS_SHOWN).execute(),
  ]);
  const defaultOn = watchedByDefault(frame.startMs, frame.endMs, nowMs);
  const enabled = watchOn(state?.enabled, frame, nowMs);
  const notice =
    state?.notice_at && state.notice_forecast_id && state.notice_status
      ? {
          at: new Date(state.notice_at).toISOString(),
          verdict: state.notice_status as WatchVerdict,
          previousVerdict: (state.notice_previous_status as WatchVerdict | null) ?? null,
          summary: state.notice_summary ?? '',
          forecastId: state.notice_forecast_id,
        }
      : null;
  return {
    enabled,
    defaultOn,
    canToggle: input.role === 'owner' || input.role === 'editor',
    following: mailsPerson(input.role, person?.choice),
    window: { from: new Date(frame.startMs - WATCH_LEAD_DAYS * DAY_MS).toISOString(), to: new Date(frame.endMs).toISOString() },
    nextRunAt: nextRunAt(enabled, frame, state?.last_run_at ?? null, nowMs),
    lastError: state?.last_error ?? null,
    notice,
    runs: runs.reverse().map(toRun),
  };
}

/** Turns the watch of a trip on or off (the owner's or an editor's choice; kept over the default). */
export async function setWatchEnabled(db: Kysely<DB>, tripId: string, enabled: boolean): Promise<void> {
  const now = new Date().toISOString();
  await db
    .insertInto('trip_watches')
    .values({ trip_id: tripId, enabled: enabled ? 1 : 0, updated_at: now })
    .onConflict((oc) => oc.column('trip_id').doUpdateSet({ enabled: enabled ? 1 : 0, updated_at: now }))
    .execute();
}

/** One person's choice for one trip's watch e-mail: 'follow', or 'stop' (unsubscribed). */
export async function setMailChoice(db: Kysely<DB>, tripId: string, userId: string, choice: 'follow' | 'stop'): Promise<void> {
  const now = new Date().toISOString();
  await db
    .insertInto('watch_people')
    .values({ trip_id: tripId, user_id: userId, choice, updated_at: now })
    .onConflict((oc) => oc.columns(['trip_id', 'user_id']).doUpdateSet({ choice, updated_at: now }))
    .execute();
}

export interface Recipient {
  userId: string;
  name: string;
  email: string;
  lastMailedAt: string | null;
  /** The person's units setting: temperatures in their e-mail follow it. */
  units: Units;
}

/** Who gets a trip's watch e-mail: owners and editors of its crew and following members, less anyone who stopped it. */
export async function watchRecipients(db: Kysely<DB>, trip: Pick<TripRow, 'id' | 'crew_id'>): Promise<Recipient[]> {
  const rows = await db
    .selectFrom('crew_members')
    .innerJoin('user', 'user.id', 'crew_members.user_id')
    .leftJoin('watch_people', (j) => j.onRef('watch_people.user_id', '=', 'crew_members.user_id').on('watch_people.trip_id', '=', trip.id))
    .select(['user.id as userId', 'user.name as name', 'user.email as email', 'crew_members.role as role', 'watch_people.choice as choice', 'user.units as units'])
    // At most one watch e-mail per person per 12 hours across all their trips (issue 20): the latest sent for any trip.
    .select((eb) =>
      eb
        .selectFrom('watch_people as sent')
        .select((s) => s.fn.max('sent.last_mailed_at').as('at'))
        .whereRef('sent.user_id', '=', 'crew_members.user_id')
        .as('lastMailedAt'),
    )
    .where('crew_members.crew_id', '=', trip.crew_id)
    .orderBy('user.email')
    .execute();
  return rows
    .filter((r) => mailsPerson(r.role, r.choice))
    .map((r) => ({ userId: r.userId, name: r.name, email: r.email, lastMailedAt: r.lastMailedAt ? new Date(r.lastMailedAt).toISOString() : null, units: toUnits(r.units) }));
}
