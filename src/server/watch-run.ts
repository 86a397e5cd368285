// Trip watch, one tick (issue #20): claim the watch lease, pick the trips due a run, re-run each with
// fresh weather (in the worker pool), save the run as a "watch" forecast, compare it with the answer
// the crew last saw and, when the change matters, write the notice and queue one e-mail per person —
// all in one transaction that only commits while the answer seen is still the one compared with, so
// two instances ticking at once never tell one change twice. `runWatchTick` takes the clock, so the
// tests and the dev control drive it without waiting for real time.
import type { Kysely } from 'kysely';
import type { DB, RigRow, TripRow } from '../../db/schema';
import type { Forecast, ForecastSummary, ResolvedPlan } from '../engine';
import { dueForRun, inWatchWindow, mayMail, watchChanges, type WatchAnswer, type WatchChangeReason } from '../domain/watch/change';
import { changedDay } from '../domain/watch/changed-day';
import { REASON_WORDS, watchMail } from '../domain/watch/mail';
import { reserveOf, verdict } from '../domain/forecasts/verdict';
import type { StopLike } from '../domain/weather/weather';
import { formatDay, formatRowTime, localParts } from '../lib/format';
import { env } from './env';
import { assemblePlan, getForecast, packHourly } from './forecasts';
import { listLoads } from './loads';
import { renderMail } from './mail';
import { enqueueMail, kickOutbox } from './outbox';
import { toRigDto } from './rigs';
import { bandFor } from './trip-weather';
import { toTripDto } from './trips';
import { claimLease, releaseLease, signUnsubscribe } from './watch';
import { tripFrame, watchOn, watchRecipients, type WatchVerdict } from './watch-state';
import { fillTripWeather } from './weather';
import { watchRunInPool } from './workers/pool';
import type { WeatherSources } from '../domain/weather/band';

/** The lease's name and how long one tick may hold it before another instance may take over. */
export const WATCH_LEASE = 'watch-run';
const LEASE_MS = 15 * 60_000;
/** This process, as a lease holder. */
const PROCESS_HOLDER = `${process.pid}-${crypto.randomUUID()}`;

export interface TickResult {
  /** Trips re-run and saved. */
  ran: number;
  /** Runs whose answer changed in a way that matters (a notice written). */
  changed: number;
  /** E-mails queued. */
  mailed: number;
}

export interface TickOptions {
  now?: Date;
  /** Where links in the e-mail point: the app's public origin. */
  origin: string;
  /** The lease holder (defaults to this process). */
  holder?: string;
  intervalMinutes?: number;
}

const breathe = () => new Promise<void>((resolve) => setImmediate(resolve));

/** One tick: every due trip re-run once, unless another instance holds the watch lease. */
export async function runWatchTick(db: Kysely<DB>, opts: TickOptions): Promise<TickResult> {
  const now = opts.now ?? new Date();
  const holder = opts.holder ?? PROCESS_HOLDER;
  const total: TickResult = { ran: 0, changed: 0, mailed: 0 };
  // The lease runs on the real clock: it is about instances running at the same time, not the trips' clock.
  if (!(await claimLease(db, WATCH_LEASE, holder, Date.now(), LEASE_MS))) return total;
  try {
    const due = await dueTrips(db, now, opts.intervalMinutes ?? env.WATCH_INTERVAL_MINUTES);
    for (const { trip, rig, lastRunAt } of due) {
      await breathe();
      if (!(await claimTrip(db, trip.id, lastRunAt, now))) continue;
      try {
        const r = await runWatchedTrip(db, trip, rig, now, opts.origin);
        if (r.ran) total.ran++;
        if (r.changed) total.changed++;
        total.mailed += r.mailed;
      } catch (err) {
        console.error('[sunreckon] trip watch run failed', trip.id, err);
        await recordError(db, trip.id, now, 'The watch could not re-run this trip; it tries again at the next run.');
      }
    }
  } finally {
    await releaseLease(db, WATCH_LEASE, holder);
  }
  return total;
}

interface DueTrip {
  trip: TripRow;
  rig: RigRow;
  lastRunAt: string | null;
}

/** Trips watched now, inside their window (16 days before the first arrival until the end) and due a run. */
async function dueTrips(db: Kysely<DB>, now: Date, intervalMinutes: number): Promise<DueTrip[]> {
  const rows = await db
    .selectFrom('trips')
    .innerJoin('rigs', 'rigs.id', 'trips.rig_id')
    .leftJoin('trip_watches', 'trip_watches.trip_id', 'trips.id')
    .selectAll('trips')
    .select(['rigs.id as r_id', 'trip_watches.enabled as w_enabled', 'trip_watches.last_run_at as w_last_run_at'])
    .where('trips.deleted_at', 'is', null)
    .where('rigs.deleted_at', 'is', null)
    .where((eb) => eb.or([eb('trip_watches.enabled', 'is', null), eb('trip_watches.enabled', '=', 1)]))
    .orderBy('trips.id')
    .execute();
  const nowMs = now.getTime();
  const picked: { trip: TripRow; lastRunAt: string | null }[] = [];
  for (const r of rows) {
    const { r_id: _rig, w_enabled, w_last_run_at, ...trip } = r;
    const frame = tripFrame(trip);
    if (!frame) continue;
    if (!watchOn(w_enabled, frame, nowMs) || !inWatchWindow(frame.startMs, frame.endMs, nowMs)) continue;
    const last = w_last_run_at ? new Date(w_last_run_at).toISOString() : null;
    if (!dueForRun(last ? Date.parse(last) : null, nowMs, intervalMinutes)) continue;
    picked.push({ trip: trip as TripRow, lastRunAt: w_last_run_at });
  }
  if (picked.length === 0) return [];
  const rigs = await db
    .selectFrom('rigs')
    .selectAll()
    .where('id', 'in', [...new Set(picked.map((p) => p.trip.rig_id))])
    .execute();
  const byId = new Map(rigs.map((r) => [r.id, r]));
  return picked.flatMap((p) => {
    const rig = byId.get(p.trip.rig_id);
    return rig ? [{ ...p, rig }] : [];
  });
}

/** Marks the trip as run at `now` unless another instance did since it was picked; true when this one may run it. */
async function claimTrip(db: Kysely<DB>, tripId: string, lastRunAt: string | null, now: Date): Promise<boolean> {
  const iso = now.toISOString();
  await ensureWatchRow(db, tripId, iso);
  const res = await db
    .updateTable('trip_watches')
    .set({ last_run_at: iso, updated_at: iso })
    .where('trip_id', '=', tripId)
    .where((eb) => (lastRunAt === null ? eb('last_run_at', 'is', null) : eb('last_run_at', '=', lastRunAt)))
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** The trip's watch row, made when missing (every later write is a conditional update of it). */
async function ensureWatchRow(db: Kysely<DB>, tripId: string, iso: string): Promise<void> {
  await db
    .insertInto('trip_watches')
    .values({ trip_id: tripId, updated_at: iso })
    .onConflict((oc) => oc.column('trip_id').doNothing())
    .execute();
}

async function recordError(db: Kysely<DB>, tripId: string, now: Date, message: string): Promise<void> {
  await db.updateTable('trip_watches').set({ last_error: message, last_error_at: now.toISOString() }).where('trip_id', '=', tripId).execute();
}

/** The three verdicts the watch compares (assumed weather and the band do not change the verdict here). */
export function watchVerdictOf(summary: ForecastSummary, plan: ResolvedPlan, reserveSocPct: number | null): WatchVerdict {
  if (summary.firstCutoffAt) return 'runs-out';
  const reserve = reserveOf({ summary } as Forecast, plan, reserveSocPct);
  return reserve > summary.floorSocPct && summary.minSocPct < reserve ? 'below-reserve' : 'makes-it';
}

function answerOf(status: WatchVerdict, s: ForecastSummary): WatchAnswer {
  return { status, cutoffAtMs: s.firstCutoffAt ? Date.parse(s.firstCutoffAt) : null, lowestPct: s.minSocPct };
}

/** The answer the crew last saw: the watch's own, or else the trip's latest forecast run by a person. */
async function seenAnswer(db: Kysely<DB>, trip: TripRow): Promise<{ forecastId: string | null; answer: WatchAnswer; stored: boolean } | null> {
  const st = await db.selectFrom('trip_watches').selectAll().where('trip_id', '=', trip.id).executeTakeFirst();
  if (st?.seen_status && st.seen_min_soc_pct !== null) {
    return {
      forecastId: st.seen_forecast_id,
      stored: true,
      answer: { status: st.seen_status, cutoffAtMs: st.seen_cutoff_at ? Date.parse(st.seen_cutoff_at) : null, lowestPct: Number(st.seen_min_soc_pct) },
    };
  }
  const last = await db
    .selectFrom('forecasts')
    .select('id')
    .where('trip_id', '=', trip.id)
    .where('kind', '=', 'plan')
    .orderBy('created_at', 'desc')
    .orderBy('id', 'desc')
    .limit(1)
    .executeTakeFirst();
  if (!last) return null;
  const f = await getForecast(db, last.id);
  if (!f) return null;
  return { forecastId: f.id, stored: false, answer: answerOf(watchVerdictOf(f.forecast.summary, f.plan, f.reserveSocPct), f.forecast.summary) };
}

/** The latest check-in taken during the trip and not after `now`. */
async function latestCheckIn(db: Kysely<DB>, tripId: string, nowMs: number, startMs: number): Promise<{ atMs: number; socPct: number; id: string } | null> {
  const c = await db
    .selectFrom('check_ins')
    .select(['id', 'at_ms', 'soc_pct'])
    .where('trip_id', '=', tripId)
    .where('at_ms', '<=', nowMs)
    .where('at_ms', '>=', startMs)
    .orderBy('at_ms', 'desc')
    .limit(1)
    .executeTakeFirst();
  return c ? { atMs: Number(c.at_ms), socPct: Number(c.soc_pct), id: c.id } : null;
}

/**
 * Re-runs one trip and tells the crew when the answer changed in a way that matters. The tick calls
 * it after claiming the lease and the trip; on its own (as the race test does) the transaction's
 * check of the answer seen still keeps one change from being told twice.
 */
export async function runWatchedTrip(
  db: Kysely<DB>,
  trip: TripRow,
  rig: RigRow,
  now: Date,
  origin: string,
  /** `compared`: awaited between reading the answer seen and writing (the race test holds runs there together). */
  hooks: { compared?: () => Promise<void> } = {},
): Promise<{ ran: boolean; changed: boolean; mailed: number }> {
  const nothing = { ran: false, changed: false, mailed: 0 };
  const nowMs = now.getTime();
  await ensureWatchRow(db, trip.id, now.toISOString());
  const frame = tripFrame(trip);
  if (!frame) return nothing;
  const typed = toTripDto(trip, true);
  const fill = await fillTripWeather(db, typed.stops as unknown as StopLike[], {
    forecastUrl: env.WEATHER_FORECAST_URL,
    archiveUrl: env.WEATHER_ARCHIVE_URL,
    timeoutMs: env.WEATHER_TIMEOUT_MS,
    now,
  });
  if (fill.status !== 'ok') {
    // Nothing is saved or mailed: the last answer stands until the service answers again.
    await recordError(db, trip.id, now, fill.message ?? 'The weather service could not be reached; the last answer stands.');
    return nothing;
  }
  const filled = { ...typed, stops: typed.stops.map((s, i) => ({ ...s, weather: fill.stops[i]?.weather ?? s.weather })) } as typeof typed;
  const loads = await listLoads(db, rig.id);
  const from = await latestCheckIn(db, trip.id, nowMs, frame.startMs);
  const out = await watchRunInPool({
    plan: assemblePlan(toRigDto(rig, true), loads, filled),
    reserveSocPct: trip.reserve_soc_pct,
    from: from ? { atMs: from.atMs, socPct: from.socPct } : null,
  });
  if (!out.ok) {
    await recordError(db, trip.id, now, out.message);
    return nothing;
  }
  const { plan, forecast: result, advice, adviceImperial } = out;
  const band = from ? null : await bandFor(typed, fill, plan, result).catch(() => null);
  const sources: WeatherSources = {
    kind: fill.kind,
    status: fill.status,
    message: fill.message,
    medianYear: fill.medianYear,
    stops: fill.stops.map((s) => ({ name: s.name, days: s.days })),
  };

  // The run, saved as a forecast marked "watch" with the engine revision that made it.
  const forecastId = crypto.randomUUID();
  const ranAt = now.toISOString();
  const { hourly, ...rest } = result;
  await db
    .insertInto('forecasts')
    .values({
      id: forecastId,
      crew_id: trip.crew_id,
      trip_id: trip.id,
      rig_id: rig.id,
      name: `Watch run of ${ranAt.slice(0, 16).replace('T', ' ')} UTC`,
      plan: JSON.stringify(plan),
      summary: JSON.stringify(result.summary),
      result: JSON.stringify({ ...rest, weatherSources: sources, band, watch: { fromCheckIn: from }, hourly: packHourly(hourly) }),
      reserve_soc_pct: trip.reserve_soc_pct,
      created_by: null,
      created_at: ranAt,
      engine_revision: result.engineRevision,
      kind: 'watch',
    })
    .execute();

  const status = watchVerdictOf(result.summary, plan, trip.reserve_soc_pct);
  const answer = answerOf(status, result.summary);
  const v = verdict(result, plan, trip.reserve_soc_pct);
  const cutoffAt = result.summary.firstCutoffAt;
  const seen = await seenAnswer(db, trip);
  const reasons: WatchChangeReason[] = watchChanges(seen?.answer ?? null, answer);
  await hooks.compared?.();
  const run = {
    forecast_id: forecastId,
    trip_id: trip.id,
    ran_at: ranAt,
    status,
    min_soc_pct: result.summary.minSocPct,
    first_cutoff_at: cutoffAt,
    first_cutoff_local: cutoffAt ? formatRowTime(cutoffAt) : null,
    band_low_pct: band ? Math.min(...band.runs.map((r) => r.minSocPct)) : null,
    band_high_pct: band ? Math.max(...band.runs.map((r) => r.minSocPct)) : null,
  };
  const seenValues = { seen_forecast_id: forecastId, seen_status: status, seen_min_soc_pct: result.summary.minSocPct, seen_cutoff_at: cutoffAt };
  if (reasons.length === 0) {
    await db.transaction().execute(async (trx) => {
      await trx.insertInto('watch_runs').values({ ...run, changed: 0, reason: null }).execute();
      const done = { last_error: null, last_error_at: null, updated_at: ranAt };
      await trx.updateTable('trip_watches').set(done).where('trip_id', '=', trip.id).execute();
      // With nothing seen yet, this run becomes the answer seen (unless another instance set one meanwhile).
      if (!seen?.stored) await trx.updateTable('trip_watches').set(seenValues).where('trip_id', '=', trip.id).where('seen_status', 'is', null).execute();
    });
    return { ran: true, changed: false, mailed: 0 };
  }

  // A change that matters: the notice, the answer seen and the e-mails, in one transaction.
  const day = changedDay(seen?.forecastId ? ((await getForecast(db, seen.forecastId))?.plan ?? null) : null, plan, cutoffAt ? (localParts(cutoffAt)?.date ?? null) : null);
  const why = day ? ` The weather for ${formatDay(day.date)} at ${day.stop} changed the most.` : '';
  const reasonText = reasons.map((r) => REASON_WORDS[r]).join('; ');
  const summary = `${v.headline}.${why}`;
  const recipients = await watchRecipients(db, trip);
  let mailed = 0;
  const committed = await db.transaction().execute(async (trx) => {
    const cas = await trx
      .updateTable('trip_watches')
      .set({
        ...seenValues,
        notice_at: ranAt,
        notice_forecast_id: forecastId,
        notice_status: status,
        notice_previous_status: seen?.answer.status ?? null,
        notice_summary: summary,
        last_error: null,
        last_error_at: null,
        updated_at: ranAt,
      })
      .where('trip_id', '=', trip.id)
      .where((eb) =>
        seen?.stored
          ? seen.forecastId === null
            ? eb('seen_forecast_id', 'is', null)
            : eb('seen_forecast_id', '=', seen.forecastId)
          : eb('seen_status', 'is', null),
      )
      .executeTakeFirst();
    if (Number(cas.numUpdatedRows) !== 1) return false;
    await trx.insertInto('watch_runs').values({ ...run, changed: 1, reason: reasonText }).execute();
    for (const p of recipients) {
      if (!mayMail(p.lastMailedAt ? Date.parse(p.lastMailedAt) : null, nowMs)) continue;
      const tripUrl = `${origin}/trips/${trip.id}`;
      const unsubscribeUrl = `${origin}/watch/unsubscribe?token=${signUnsubscribe(env.authSecret, { tripId: trip.id, userId: p.userId })}`;
      const m = watchMail({ tripName: trip.name, headline: v.headline, cutoffAt: v.cutoffAt, cutoffStop: v.cutoffStop, cutoffZone: plan.stops.find((st) => st.name === v.cutoffStop)?.timeZone ?? null, reasons, changedDay: day, advice: p.units === 'imperial' ? adviceImperial : advice, tripUrl, unsubscribeUrl });
      const greeting = `Hello ${p.name || 'there'},`;
      const lines = m.text.split('\n').filter((line) => line.trim() && !line.startsWith('Open the trip:') && !line.startsWith('Stop these e-mails'));
      // The unsubscribe address as a link in the HTML part too (renderMail links only the button).
      const html = renderMail({
        subject: m.subject,
        greeting,
        intro: lines,
        action: { label: 'Open the trip', url: tripUrl },
        outro: [`Stop these e-mails for this trip: ${unsubscribeUrl}`],
      }).html.replace(`: ${unsubscribeUrl}`, `: <a href="${unsubscribeUrl}" style="color:inherit;">${unsubscribeUrl}</a>`);
      // A mail program offers the same address as its own "unsubscribe", and may stop the mail
      // with one POST to it (RFC 2369, RFC 8058; the page takes the token from the address then).
      const headers = { 'List-Unsubscribe': `<${unsubscribeUrl}>`, 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' };
      await enqueueMail(trx, 'trip-watch', p.email, { subject: m.subject, text: `${greeting}\n\n${m.text}`, html, headers });
      await trx
        .insertInto('watch_people')
        .values({ trip_id: trip.id, user_id: p.userId, choice: null, last_mailed_at: ranAt, updated_at: ranAt })
        .onConflict((oc) => oc.columns(['trip_id', 'user_id']).doUpdateSet({ last_mailed_at: ranAt, updated_at: ranAt }))
        .execute();
      mailed++;
    }
    return true;
  });
  if (!committed) {
    // Another instance told this change first; this run stays in the history as unchanged.
    await db.insertInto('watch_runs').values({ ...run, changed: 0, reason: null }).execute();
    return { ran: true, changed: false, mailed: 0 };
  }
  if (mailed > 0) kickOutbox();
  return { ran: true, changed: true, mailed };
}
