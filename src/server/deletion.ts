import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import { daysLeft, purgeBefore, type DeletedItem, type DeletionCounts } from '../domain/shared/deletion';
import type { RigDto } from '../domain/rigs/rigs.schema';
import type { TripDto } from '../domain/trips/trips.schema';
import { HttpError } from './errors';
import { toRigDto } from './rigs';
import { toTripDto } from './trips';

// Soft deletion of rigs and trips (migration 0010). A deleted row keeps everything that hangs off it,
// hidden by access.ts (a deleted rig is no longer visible, so its loads, trips, forecasts and check-ins
// 404 with it); a crew owner restores it within 30 days; the purge removes it for good after that.

const count = (r: { n: number | string | bigint } | undefined) => Number(r?.n ?? 0);

/** What deleting the rig takes with it: its loads, trips in use, their saved forecasts and check-ins, its monitor logs. */
export async function rigDeletionCounts(db: Kysely<DB>, rigId: string): Promise<DeletionCounts> {
  const liveTrips = db.selectFrom('trips').select('trips.id').where('trips.rig_id', '=', rigId).where('trips.deleted_at', 'is', null);
  const [loads, trips, forecasts, checkIns, logs] = await Promise.all([
    db
      .selectFrom('loads')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('rig_id', '=', rigId)
      .executeTakeFirst(),
    db
      .selectFrom('trips')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('rig_id', '=', rigId)
      .where('deleted_at', 'is', null)
      .executeTakeFirst(),
    db
      .selectFrom('forecasts')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trip_id', 'in', liveTrips)
      .where('kind', '=', 'plan')
      .executeTakeFirst(),
    db
      .selectFrom('check_ins')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trip_id', 'in', liveTrips)
      .executeTakeFirst(),
    db
      .selectFrom('monitor_logs')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('rig_id', '=', rigId)
      .executeTakeFirst(),
  ]);
  return { loads: count(loads), trips: count(trips), forecasts: count(forecasts), checkIns: count(checkIns), logs: count(logs) };
}

/** What deleting the trip takes with it: its saved forecasts (the crew's, not the watch's runs) and check-ins. */
export async function tripDeletionCounts(db: Kysely<DB>, tripId: string): Promise<DeletionCounts> {
  const [forecasts, checkIns] = await Promise.all([
    db
      .selectFrom('forecasts')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trip_id', '=', tripId)
      .where('kind', '=', 'plan')
      .executeTakeFirst(),
    db
      .selectFrom('check_ins')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trip_id', '=', tripId)
      .executeTakeFirst(),
  ]);
  return { forecasts: count(forecasts), checkIns: count(checkIns) };
}

/** A row deleted before the restore window is gone as far as anyone can tell (the purge is on its way). */
function past(deletedAt: string | null, what: string): void {
  if (deletedAt !== null && deletedAt < purgeBefore(Date.now())) {
    throw new HttpError('not_found', `This ${what} was deleted more than 30 days ago and can no longer be restored.`);
  }
}

/** Brings a deleted rig back (with everything it held); a rig in use answers as it is. */
export async function restoreRig(db: Kysely<DB>, rig: { id: string; deleted_at: string | null }): Promise<RigDto> {
  past(rig.deleted_at, 'rig');
  const rigId = rig.id;
  await db
    .updateTable('rigs')
    .set((eb) => ({ deleted_at: null, deleted_by: null, version: eb('version', '+', 1) }))
    .where('id', '=', rigId)
    .where('deleted_at', 'is not', null)
    .execute();
  const row = await db.selectFrom('rigs').selectAll().where('id', '=', rigId).executeTakeFirstOrThrow();
  return toRigDto(row, true, true);
}

/** Brings a deleted trip back; a trip whose rig is deleted too waits for the rig (409 naming it). */
export async function restoreTrip(
  db: Kysely<DB>,
  trip: { id: string; deleted_at: string | null },
  rig: { name: string; deleted_at: string | null },
): Promise<TripDto> {
  past(trip.deleted_at, 'trip');
  const tripId = trip.id;
  if (rig.deleted_at !== null) {
    throw new HttpError('conflict', `This trip was on the rig “${rig.name}”, which is deleted too: restore the rig first, then the trip.`, [
      { path: 'rigId', message: 'the trip’s rig is deleted' },
    ]);
  }
  await db
    .updateTable('trips')
    .set((eb) => ({ deleted_at: null, deleted_by: null, version: eb('version', '+', 1) }))
    .where('id', '=', tripId)
    .where('deleted_at', 'is not', null)
    .execute();
  const row = await db.selectFrom('trips').selectAll().where('id', '=', tripId).executeTakeFirstOrThrow();
  return toTripDto(row, true, true);
}

/** The rigs and trips deleted in the crews the user owns, still restorable, most recent first. */
export async function listRecentlyDeleted(db: Kysely<DB>, userId: string, nowMs = Date.now()): Promise<DeletedItem[]> {
  const since = purgeBefore(nowMs);
  const rigs = await db
    .selectFrom('rigs')
    .innerJoin('crew_members', (j) =>
      j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', userId).on('crew_members.role', '=', 'owner'),
    )
    .leftJoin('user', 'user.id', 'rigs.deleted_by')
    .select(['rigs.id', 'rigs.name', 'rigs.crew_id', 'rigs.deleted_at', 'user.name as deleter'])
    .where('rigs.deleted_at', 'is not', null)
    .where('rigs.deleted_at', '>=', since)
    .execute();
  const trips = await db
    .selectFrom('trips')
    .innerJoin('rigs', 'rigs.id', 'trips.rig_id')
    .innerJoin('crew_members', (j) =>
      j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', userId).on('crew_members.role', '=', 'owner'),
    )
    .leftJoin('user', 'user.id', 'trips.deleted_by')
    .select([
      'trips.id',
      'trips.name',
      'rigs.crew_id',
      'trips.deleted_at',
      'user.name as deleter',
      'rigs.id as rig_id',
      'rigs.name as rig_name',
      'rigs.deleted_at as rig_deleted_at',
    ])
    .where('trips.deleted_at', 'is not', null)
    .where('trips.deleted_at', '>=', since)
    .execute();
  const items: DeletedItem[] = [
    ...rigs.map((r) => ({
      kind: 'rig' as const,
      id: r.id,
      name: r.name,
      crewId: r.crew_id,
      deletedAt: r.deleted_at!,
      deletedBy: r.deleter ?? null,
      daysLeft: daysLeft(r.deleted_at!, nowMs),
    })),
    ...trips.map((t) => ({
      kind: 'trip' as const,
      id: t.id,
      name: t.name,
      crewId: t.crew_id,
      deletedAt: t.deleted_at!,
      deletedBy: t.deleter ?? null,
      daysLeft: daysLeft(t.deleted_at!, nowMs),
      rigId: t.rig_id,
      rigName: t.rig_name,
      rigDeleted: t.rig_deleted_at !== null,
    })),
  ];
  return items.sort((a, b) => b.deletedAt.localeCompare(a.deletedAt) || a.id.localeCompare(b.id));
}
