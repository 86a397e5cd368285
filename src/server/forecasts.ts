import type { Kysely } from 'kysely';
import { LRUCache } from 'lru-cache';
import type { DB, RigRow, TripRow } from '../../db/schema';
import { validatePlan, type Forecast, type HourlyRow, type Plan, type ResolvedPlan } from '../engine';
import type { LoadDto } from '../domain/loads/loads.schema';
import type { RigDto } from '../domain/rigs/rigs.schema';
import type { TripDto } from '../domain/trips/trips.schema';
import { defaultSnapshotName, snapshotLabel } from '../domain/forecasts/snapshot-name';
import { cachedForecast } from './sun-cache';
import { tripAccess, type Actor, type Need } from './access';
import { HttpError } from './errors';
import { listLoads } from './loads';
import { toRigDto } from './rigs';
import { toTripDto } from './trips';
import { bandFor, weatherForRun } from './trip-weather';

/** Builds the engine plan of a trip from its rig and the rig's loads (as they are now). */
export function assemblePlan(rig: RigDto, loads: LoadDto[], trip: TripDto): Plan {
  return {
    bank: rig.bank,
    arrays: rig.arrays,
    chargers: rig.chargers,
    ...(rig.inverter ? { inverter: rig.inverter } : {}),
    loads: loads.map((l) => ({
      name: l.name,
      watts: l.watts,
      quantity: l.quantity,
      supply: l.supply,
      windows: l.windows,
      dutyPct: l.dutyPct,
      days: l.days,
      response: l.response,
      setpointC: l.setpointC,
      location: l.location,
      surgeWatts: l.surgeWatts,
    })),
    stops: trip.stops,
    drives: trip.drives,
  } as Plan;
}

export interface ForecastListItem {
  id: string;
  tripId: string;
  name: string;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  summary: Forecast['summary'];
  reserveSocPct: number | null;
  /** The engine revision that made it (forecasts saved before revisions were recorded are 1). */
  engineRevision: number;
}

export interface ForecastDto extends ForecastListItem {
  rigId: string;
  plan: ResolvedPlan;
  forecast: Forecast;
}

type Columns = { [K in keyof HourlyRow]: HourlyRow[K][] };

/** Stores the hourly rows column-wise: one array per field. */
export function packHourly(rows: HourlyRow[]): Columns {
  const keys = (rows[0] ? Object.keys(rows[0]) : []) as (keyof HourlyRow)[];
  const cols = {} as Record<string, unknown[]>;
  for (const k of keys) cols[k] = rows.map((r) => r[k]);
  return cols as Columns;
}

/** The inverse of packHourly. */
export function unpackHourly(cols: Columns): HourlyRow[] {
  const keys = Object.keys(cols) as (keyof HourlyRow)[];
  const n = keys[0] ? (cols[keys[0]] as unknown[]).length : 0;
  const rows: HourlyRow[] = [];
  for (let i = 0; i < n; i++) {
    const row = {} as Record<string, unknown>;
    for (const k of keys) row[k] = (cols[k] as unknown[])[i];
    rows.push(row as unknown as HourlyRow);
  }
  return rows;
}

/** Runs the engine on the trip as it is now and saves plan and result; a plan the engine refuses is a 400. */
export async function createForecast(
  db: Kysely<DB>,
  input: {
    rig: RigDto;
    loads: LoadDto[];
    trip: TripDto;
    userId: string;
    name?: string;
    /** Saved with the result: where each day's weather came from and the band ("how sure is this?"). */
    extras?: (plan: ResolvedPlan, result: Forecast) => Promise<Record<string, unknown>>;
  },
): Promise<ForecastDto> {
  const checked = validatePlan(assemblePlan(input.rig, input.loads, input.trip));
  if (!checked.ok) {
    throw new HttpError('invalid_plan', `This trip cannot be forecast yet: ${checked.envelope.error.message}`, checked.envelope.issues);
  }
  const plan = checked.plan;
  // A re-run of the trip with other loads or bank reuses its sun (sun-cache.ts).
  const result = cachedForecast(plan);
  const id = crypto.randomUUID();
  const createdAt = new Date().toISOString();
  const name = input.name?.trim() || defaultSnapshotName(createdAt, plan);
  const { hourly, ...rest } = result;
  const extras = input.extras ? await input.extras(plan, result) : {};
  await db
    .insertInto('forecasts')
    .values({
      id,
      crew_id: input.trip.crewId,
      trip_id: input.trip.id,
      rig_id: input.rig.id,
      name,
      plan: JSON.stringify(plan),
      summary: JSON.stringify(result.summary),
      result: JSON.stringify({ ...rest, ...extras, hourly: packHourly(hourly) }),
      reserve_soc_pct: input.trip.reserveSocPct,
      created_by: input.userId,
      created_at: createdAt,
      engine_revision: result.engineRevision,
    })
    .execute();
  const created = await getForecast(db, id);
  if (!created) throw new Error('saved forecast vanished');
  return created;
}

/** Forecasts a trip with its rig and the rig's loads as they are now, and saves the result. */
export async function forecastTrip(db: Kysely<DB>, input: { trip: TripRow; rig: RigRow; canWrite: boolean; userId: string; name?: string }): Promise<ForecastDto> {
  const loads = await listLoads(db, input.rig.id);
  // Untyped days get the weather service's days (typed days win; a failed service leaves them assumed).
  const typed = toTripDto(input.trip, input.canWrite);
  const { trip, fill, sources } = await weatherForRun(db, typed);
  return createForecast(db, {
    rig: toRigDto(input.rig, input.canWrite),
    loads,
    trip,
    userId: input.userId,
    name: input.name,
    extras: async (plan, result) => ({ weatherSources: sources, band: await bandFor(typed, fill, plan, result) }),
  });
}

const listColumns = [
  'forecasts.id',
  'forecasts.trip_id',
  'forecasts.rig_id',
  'forecasts.crew_id',
  'forecasts.name',
  'forecasts.summary',
  'forecasts.reserve_soc_pct',
  'forecasts.created_at',
  'forecasts.created_by',
  'forecasts.engine_revision',
  'user.name as creator_name',
] as const;

/** Saved forecasts of a trip run by people, newest first, without their hourly series. */
export async function listForecasts(db: Kysely<DB>, tripId: string): Promise<ForecastListItem[]> {
  const rows = await db
    .selectFrom('forecasts')
    .leftJoin('user', 'user.id', 'forecasts.created_by')
    .select(listColumns)
    .where('forecasts.trip_id', '=', tripId)
    // The trip watch's runs (kind 'watch') have their own timeline (GET /api/trips/:id/watch).
    .where('forecasts.kind', '=', 'plan')
    .orderBy('forecasts.created_at', 'desc')
    .execute();
  // Forecasts saved with the old UTC default name are called by the local time at the trip's first stop.
  const trip = await db.selectFrom('trips').select('stops').where('id', '=', tripId).executeTakeFirst();
  const stops = trip ? (JSON.parse(trip.stops) as { name?: string; timeZone: string }[]).slice(0, 1).map((s) => ({ name: s.name ?? 'Stop 1', timeZone: s.timeZone })) : [];
  return rows.map((r) => {
    const item = toListItem(r);
    return { ...item, name: snapshotLabel(item.name, item.createdAt, { stops }) };
  });
}

function toListItem(r: { id: string; trip_id: string; name: string; summary: string; reserve_soc_pct: number | null; created_at: string; created_by: string | null; creator_name: string | null; engine_revision: number | null }): ForecastListItem {
  return {
    id: r.id,
    tripId: r.trip_id,
    name: r.name,
    createdAt: r.created_at,
    createdBy: r.created_by ? { id: r.created_by, name: r.creator_name ?? 'Former member' } : null,
    summary: JSON.parse(r.summary),
    reserveSocPct: r.reserve_soc_pct,
    engineRevision: r.engine_revision ?? 1,
  };
}

/** One saved forecast with its plan snapshot and full result, or undefined. */
export async function getForecast(db: Kysely<DB>, id: string): Promise<(ForecastDto & { crewId: string }) | undefined> {
  const r = await db
    .selectFrom('forecasts')
    .leftJoin('user', 'user.id', 'forecasts.created_by')
    .select([...listColumns, 'forecasts.plan', 'forecasts.result'])
    .where('forecasts.id', '=', id)
    .executeTakeFirst();
  if (!r) return undefined;
  const stored = JSON.parse(r.result) as Omit<Forecast, 'hourly'> & { hourly: Columns };
  const item = toListItem(r);
  const plan = JSON.parse(r.plan) as ResolvedPlan;
  return {
    ...item,
    // A forecast saved with the old UTC default name is called by the local time at its first stop.
    name: snapshotLabel(item.name, item.createdAt, plan),
    crewId: r.crew_id,
    rigId: r.rig_id,
    plan,
    // A snapshot keeps the numbers it was saved with; one saved before revisions were recorded is revision 1.
    forecast: { ...stored, engineRevision: r.engine_revision ?? 1, hourly: unpackHourly(stored.hourly) },
  };
}

/**
 * The saved forecast pages' island text, kept per process (`FORECAST_PAGE_CACHE_MB`, default 8; 0 = off).
 * A saved forecast never changes once written (it is only ever inserted or deleted), but what the
 * page shows with it can: its creator's name. So each page read asks the database for the row's
 * light columns (no plan, no hours) and finds the text under all of them; a deleted forecast is
 * never found, a renamed creator makes a new key. The heavy part — parsing the stored plan and
 * hours and writing the island's text — then happens once per forecast and process.
 */
const PAGE_CACHE_BYTES = Math.max(0, Number(process.env.FORECAST_PAGE_CACHE_MB ?? 8)) * 1024 * 1024;
const pageTexts = PAGE_CACHE_BYTES > 0 ? new LRUCache<string, ForecastPageText>({ maxSize: PAGE_CACHE_BYTES, sizeCalculation: (v) => (v.text.length + v.html.length) * 2 + 200 }) : null;

/** A saved forecast's page text (see forecastPageText). */
export interface ForecastPageText {
  tripId: string;
  /** The island's text. */
  text: string;
  /** The same text as HTML text content (`&` and `<` escaped), for the page to write as it is. */
  html: string;
}

/**
 * A saved forecast as its page hands it to the island: `toText` of the forecast without its crew
 * and rig ids (the page passes `savedForecastToJson`) and that text escaped for HTML, with the trip
 * it belongs to; undefined when there is none. The caller checks the reader's access to that trip.
 */
export async function forecastPageText(db: Kysely<DB>, id: string, toText: (saved: Omit<ForecastDto, 'rigId'>) => string): Promise<ForecastPageText | undefined> {
  const r = await db.selectFrom('forecasts').leftJoin('user', 'user.id', 'forecasts.created_by').select(listColumns).where('forecasts.id', '=', id).executeTakeFirst();
  if (!r) return undefined;
  const key = JSON.stringify([r.id, r.trip_id, r.name, r.created_at, r.created_by, r.creator_name, r.engine_revision, r.reserve_soc_pct]);
  const kept = pageTexts?.get(key);
  if (kept) return kept;
  const saved = await getForecast(db, id);
  if (!saved) return undefined;
  const { crewId: _crew, rigId: _rig, ...rest } = saved;
  const text = toText(rest);
  const made = { tripId: saved.tripId, text, html: text.replaceAll('&', '&amp;').replaceAll('<', '&lt;') };
  pageTexts?.set(key, made);
  return made;
}

/** The row's trip id (for access checks), or undefined. */
export async function forecastTripId(db: Kysely<DB>, id: string): Promise<string | undefined> {
  const r = await db.selectFrom('forecasts').select('trip_id').where('id', '=', id).executeTakeFirst();
  return r?.trip_id;
}

/** Removes a saved forecast. */
export async function deleteForecast(db: Kysely<DB>, id: string): Promise<void> {
  await db.deleteFrom('forecasts').where('id', '=', id).execute();
}

const notFound = () => new HttpError('not_found', "There is no saved forecast with this id among your crews' trips.");

/** Checks the user may do `need` with the saved forecast's trip; 404 for a forecast outside their crews. */
export async function forecastAccess(db: Kysely<DB>, user: Actor, id: string, need: Need): Promise<void> {
  const tripId = await forecastTripId(db, id);
  if (!tripId) throw notFound();
  await tripAccess(db, user, tripId, need).catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound() : e;
  });
}

/** A saved forecast, or a 404. */
export async function savedForecast(db: Kysely<DB>, id: string): Promise<ForecastDto & { crewId: string }> {
  const f = await getForecast(db, id);
  if (!f) throw notFound();
  return f;
}
