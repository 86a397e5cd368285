import type { Kysely } from 'kysely';
import type { CheckInRow, DB, RigRow, TripRow } from '../../db/schema';
import { validatePlan, type ResolvedPlan } from '../engine';
import { previousOf, reforecastReading } from '../domain/checkins/checkins';
import type { CheckInDto, CheckInOutcome, CheckInValues, PreviousOutcome } from '../domain/checkins/checkins.schema';
import { tripAccess, type Actor, type Need, type RigGrant } from './access';
import { HttpError } from './errors';
import { assemblePlan, getForecast } from './forecasts';
import { listLoads } from './loads';
import { toRigDto } from './rigs';
import { toTripDto } from './trips';
import { conflict, nowIso } from './versions';

// Check-ins: an at-camp reading that re-forecasts the rest of the trip. The id is the client's,
// so the insert is idempotent: the same check-in sent again (a retry after a lost answer, or a
// queue that syncs twice) is stored once and answered with the stored row.

interface Stored {
  outcome: CheckInOutcome;
  previous: PreviousOutcome | null;
  note: string | null;
}

type Row = CheckInRow & { creator_name: string | null };

function toDto(r: Row): CheckInDto {
  const stored = JSON.parse(r.result) as Stored;
  return {
    id: r.id,
    tripId: r.trip_id,
    at: r.at,
    source: r.source,
    socPct: r.soc_pct,
    restingVolts: r.resting_volts,
    forecastId: r.forecast_id,
    outcome: stored.outcome,
    previous: stored.previous,
    note: stored.note,
    createdBy: r.created_by ? { id: r.created_by, name: r.creator_name ?? 'Former member' } : null,
    createdAt: r.created_at,
    version: r.version,
  };
}

function rows(db: Kysely<DB>) {
  return db.selectFrom('check_ins').leftJoin('user', 'user.id', 'check_ins.created_by').selectAll('check_ins').select('user.name as creator_name');
}

async function byId(db: Kysely<DB>, id: string): Promise<CheckInDto | undefined> {
  const r = await rows(db).where('check_ins.id', '=', id).executeTakeFirst();
  return r ? toDto(r) : undefined;
}

/** A trip's check-ins, the latest reading first. */
export async function listCheckIns(db: Kysely<DB>, tripId: string): Promise<CheckInDto[]> {
  const r = await rows(db).where('check_ins.trip_id', '=', tripId).orderBy('check_ins.at_ms', 'desc').orderBy('check_ins.created_at', 'desc').execute();
  return r.map(toDto);
}

/** The check-in and its trip, when the user may do `need` with the trip; 404 outside their crews. */
export async function checkInAccess(db: Kysely<DB>, user: Actor, id: string, need: Need): Promise<RigGrant & { trip: TripRow; checkIn: CheckInDto }> {
  const checkIn = await byId(db, id);
  const notFound = () => new HttpError('not_found', "There is no check-in with this id among your crews' trips.");
  if (!checkIn) throw notFound();
  const access = await tripAccess(db, user, checkIn.tripId, need).catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound() : e;
  });
  return { ...access, checkIn };
}

/** Same reading as the one stored under this id? (A retry, not a different check-in reusing the id.) */
function sameReading(stored: CheckInDto, tripId: string, input: CheckInValues): boolean {
  return (
    stored.tripId === tripId &&
    Date.parse(stored.at) === Date.parse(input.at) &&
    (input.socPct !== undefined ? stored.source === 'soc' && stored.socPct === input.socPct : stored.source === 'volts' && stored.restingVolts === input.restingVolts)
  );
}

/** The plan a check-in re-forecasts: the named (or latest) saved forecast's snapshot, else the trip as it is now. */
async function basis(db: Kysely<DB>, trip: TripRow, rig: RigRow, forecastId: string | null | undefined): Promise<{ plan: ResolvedPlan; previous: PreviousOutcome | null }> {
  let id = forecastId ?? null;
  if (id) {
    const owner = await db.selectFrom('forecasts').select('trip_id').where('id', '=', id).executeTakeFirst();
    if (!owner || owner.trip_id !== trip.id) throw new HttpError('invalid_request', 'The forecast to re-forecast from is not one of this trip’s saved forecasts.', [{ path: 'forecastId', message: 'not a saved forecast of this trip' }]);
  } else {
    id = (await db.selectFrom('forecasts').select('id').where('trip_id', '=', trip.id).orderBy('created_at', 'desc').orderBy('id', 'desc').limit(1).executeTakeFirst())?.id ?? null;
  }
  if (id) {
    const f = await getForecast(db, id);
    if (f) {
      return { plan: f.plan, previous: previousOf({ forecastId: f.id, name: f.name, forecast: f.forecast }) };
    }
  }
  const checked = validatePlan(assemblePlan(toRigDto(rig, true), await listLoads(db, rig.id), toTripDto(trip, true)));
  if (!checked.ok) throw new HttpError('invalid_plan', `This trip cannot be forecast yet: ${checked.envelope.error.message}`, checked.envelope.issues);
  return { plan: checked.plan, previous: null };
}

/**
 * Records a check-in and its re-forecast. Returns the stored check-in and whether this call
 * created it (false: the same check-in was already stored — nothing changes). The same id with a
 * different reading or on another trip is a 409 carrying the stored one.
 */
export async function createCheckIn(db: Kysely<DB>, ctx: { trip: TripRow; rig: RigRow; userId: string }, input: CheckInValues): Promise<{ checkIn: CheckInDto; created: boolean }> {
  const replay = async (): Promise<{ checkIn: CheckInDto; created: boolean } | null> => {
    const stored = await byId(db, input.id);
    if (!stored) return null;
    if (!sameReading(stored, ctx.trip.id, input)) {
      throw new HttpError('conflict', 'A different check-in was already saved with this id.', [{ path: 'id', message: 'already used for another reading' }], { current: stored.tripId === ctx.trip.id ? stored : null });
    }
    return { checkIn: stored, created: false };
  };
  const earlier = await replay();
  if (earlier) return earlier;

  const { plan, previous } = await basis(db, ctx.trip, ctx.rig, input.forecastId);
  const atMs = Date.parse(input.at);
  const re = reforecastReading(plan, atMs, input.restingVolts !== undefined ? { restingVolts: input.restingVolts } : { socPct: input.socPct! });
  if (!re.ok) {
    const message = re.path === 'at' ? `The check-in time ${re.message}` : re.message;
    throw new HttpError('invalid_request', message, [{ path: re.path, message: re.message }]);
  }
  const { socPct, note } = re;

  const res = await db
    .insertInto('check_ins')
    .values({
      id: input.id,
      crew_id: ctx.trip.crew_id,
      trip_id: ctx.trip.id,
      at: input.at,
      at_ms: atMs,
      source: input.restingVolts !== undefined ? 'volts' : 'soc',
      soc_pct: socPct,
      resting_volts: input.restingVolts ?? null,
      forecast_id: previous?.forecastId ?? null,
      result: JSON.stringify({ outcome: re.outcome, previous, note } satisfies Stored),
      created_by: ctx.userId,
      created_at: nowIso(),
    })
    .onConflict((oc) => oc.column('id').doNothing())
    .executeTakeFirst();
  if (Number(res.numInsertedOrUpdatedRows ?? 0n) === 0) {
    // Another request stored the same id between our read and our insert.
    const raced = await replay();
    if (raced) return raced;
  }
  return { checkIn: (await byId(db, input.id))!, created: true };
}

/** Removes a check-in while it still has the version read. */
export async function deleteCheckIn(db: Kysely<DB>, id: string, version: number): Promise<void> {
  const res = await db.deleteFrom('check_ins').where('id', '=', id).where('version', '=', version).executeTakeFirst();
  if (res.numDeletedRows === 0n) {
    const now = await byId(db, id);
    if (!now) throw new HttpError('not_found', "There is no check-in with this id among your crews' trips.");
    throw conflict('check-in', now);
  }
}
