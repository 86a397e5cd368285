import type { Kysely } from 'kysely';
import type { z } from 'zod';
import type { DB, TripRow } from '../../db/schema';
import { planSchema, type driveSchema, type stopSchema } from '../engine';
import type { TripChanges, TripDto, TripValues } from '../domain/trips/trips.schema';
import { listVisibleRigs } from './access';
import { HttpError, type Issue } from './errors';
import { zodIssues } from './http';
import { driveIssues } from '../domain/trips/drives';
import { conflict, nowIso } from './versions';

type Stop = z.output<typeof stopSchema>;
type Drive = z.output<typeof driveSchema>;

/** A trip row as the API shows it. */
export function toTripDto(row: TripRow, canEdit: boolean, canDelete = false): TripDto {
  return {
    id: row.id,
    crewId: row.crew_id,
    rigId: row.rig_id,
    name: row.name,
    stops: JSON.parse(row.stops),
    drives: JSON.parse(row.drives),
    reserveSocPct: row.reserve_soc_pct,
    canEdit,
    canDelete,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/**
 * The itinerary's cross-field rules (stops in order and not overlapping, drives inside the trip,
 * weather days, generator hours), checked by the engine's own plan schema with the rig's bank so
 * that a saved trip always runs. Issues keep the plan's paths: `stops.1.arrive`, `drives.0.date`.
 */
export function checkItinerary(bankJson: string, stops: Stop[], drives: Drive[]): void {
  const r = planSchema.safeParse({ bank: JSON.parse(bankJson), stops, drives });
  // The drive rules of the trip schema, again on the trip as a PATCH would leave it.
  const drivePlace = driveIssues(stops, drives).map((i) => ({ path: i.path.join('.'), message: i.message }));
  if (r.success && drivePlace.length === 0) return;
  const planIssues: Issue[] = r.success ? [] : zodIssues(r.error).filter((i) => /^(stops|drives)(\.|$)/.test(i.path));
  // Where both name one field, the plainer drive message stands.
  const issues = [...planIssues.filter((p) => !drivePlace.some((d) => d.path === p.path)), ...drivePlace];
  if (issues.length) throw new HttpError('invalid_request', 'The stops and drives need fixing.', issues);
}

/** Trips on every rig the user can see (or on one rig), by start date. */
export async function listTrips(db: Kysely<DB>, userId: string, rigId?: string): Promise<TripDto[]> {
  const grants = (await listVisibleRigs(db, userId)).filter((g) => rigId === undefined || g.rig.id === rigId);
  if (grants.length === 0) return [];
  const canWrite = new Map(grants.map((g) => [g.rig.id, g.canWrite]));
  const owns = new Set(grants.filter((g) => g.role === 'owner').map((g) => g.rig.id));
  const rows = await db.selectFrom('trips').selectAll().where('rig_id', 'in', [...canWrite.keys()]).where('deleted_at', 'is', null).execute();
  return rows
    .map((r) => toTripDto(r, canWrite.get(r.rig_id) ?? false, owns.has(r.rig_id)))
    .sort((a, b) => (a.stops[0]?.arrive ?? '').localeCompare(b.stops[0]?.arrive ?? '') || a.name.localeCompare(b.name) || a.id.localeCompare(b.id));
}

async function tripRow(db: Kysely<DB>, id: string): Promise<TripRow> {
  const row = await db.selectFrom('trips').selectAll().where('id', '=', id).executeTakeFirst();
  if (!row) throw new HttpError('not_found', "There is no trip with this id among your crews' rigs.");
  return row;
}

/** Saves a new trip on a rig the caller may write to; the trip belongs to the rig's crew. */
export async function createTrip(db: Kysely<DB>, userId: string, rig: { id: string; crew_id: string }, input: TripValues, canDelete = false): Promise<TripDto> {
  const now = nowIso();
  const id = crypto.randomUUID();
  await db
    .insertInto('trips')
    .values({
      id,
      crew_id: rig.crew_id,
      rig_id: rig.id,
      name: input.name,
      stops: JSON.stringify(input.stops),
      drives: JSON.stringify(input.drives),
      reserve_soc_pct: input.reserveSocPct,
      created_by: userId,
      created_at: now,
      updated_at: now,
    })
    .execute();
  return toTripDto(await tripRow(db, id), true, canDelete);
}

/**
 * Changes the fields sent (a new `rig` moves the trip there) while the trip still has the version
 * read: a stale version is a 409 with the current trip before anything else is checked; the
 * itinerary rules then run on the trip as it would be after the change.
 */
export async function updateTrip(db: Kysely<DB>, tripId: string, rig: { id: string; crew_id: string; bank: string }, patch: TripChanges, canDelete = false): Promise<TripDto> {
  const { version, rigId: _rigId, ...f } = patch;
  return db.transaction().execute(async (trx) => {
    const before = await tripRow(trx, tripId);
    if (before.version !== version) throw conflict('trip', toTripDto(before, true, canDelete));
    checkItinerary(rig.bank, f.stops ?? JSON.parse(before.stops), f.drives ?? JSON.parse(before.drives));
    const res = await trx
      .updateTable('trips')
      .set((eb) => ({
        rig_id: rig.id,
        crew_id: rig.crew_id,
        ...(f.name !== undefined && { name: f.name }),
        ...(f.stops !== undefined && { stops: JSON.stringify(f.stops) }),
        ...(f.drives !== undefined && { drives: JSON.stringify(f.drives) }),
        ...(f.reserveSocPct !== undefined && { reserve_soc_pct: f.reserveSocPct }),
        version: eb('version', '+', 1),
        updated_at: nowIso(),
      }))
      .where('id', '=', tripId)
      .where('version', '=', version)
      .executeTakeFirst();
    const row = await tripRow(trx, tripId);
    if (res.numUpdatedRows === 0n) throw conflict('trip', toTripDto(row, true, canDelete));
    return toTripDto(row, true, canDelete);
  });
}

/**
 * Deletes a trip softly while it still has the version read: it, its saved forecasts and check-ins are
 * hidden at once; a crew owner can restore it for 30 days, then the purge removes it for good.
 */
export async function deleteTrip(db: Kysely<DB>, tripId: string, version: number, userId: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const res = await trx
      .updateTable('trips')
      .set((eb) => ({ deleted_at: nowIso(), deleted_by: userId, version: eb('version', '+', 1) }))
      .where('id', '=', tripId)
      .where('version', '=', version)
      .where('deleted_at', 'is', null)
      .executeTakeFirst();
    if (res.numUpdatedRows === 0n) throw conflict('trip', toTripDto(await tripRow(trx, tripId), true, true));
  });
}
