import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import { purgeBefore } from '../domain/shared/deletion';
import { db as appDb } from './db';

// The purge of rigs and trips deleted more than 30 days ago (soft deletion, migration 0010). It runs once
// when the server starts and then every few hours, only in the process that keeps the background loops
// (SUNRECKON_BACKGROUND, as the outbox's timer). Deleting the same rows twice is harmless, so two
// instances purging at once need no lease.

const EVERY_MS = 6 * 3_600_000;

/**
 * Removes for good the rigs and trips deleted before the restore window; the database's cascades take their
 * loads, trips, saved forecasts, check-ins and logs. Two deletes on the indexed `deleted_at`: cheap when
 * there is nothing to purge.
 */
export async function purgeDeleted(db: Kysely<DB>, nowMs = Date.now()): Promise<{ rigs: number; trips: number }> {
  const before = purgeBefore(nowMs);
  const trips = await db.deleteFrom('trips').where('deleted_at', 'is not', null).where('deleted_at', '<', before).executeTakeFirst();
  const rigs = await db.deleteFrom('rigs').where('deleted_at', 'is not', null).where('deleted_at', '<', before).executeTakeFirst();
  return { rigs: Number(rigs.numDeletedRows), trips: Number(trips.numDeletedRows) };
}

let timer: ReturnType<typeof setInterval> | null = null;

async function pass(): Promise<void> {
  try {
    const done = await purgeDeleted(appDb);
    if (done.rigs || done.trips)
      console.log(`[sunreckon] purged ${done.rigs} rig(s) and ${done.trips} trip(s) deleted more than 30 days ago`);
  } catch (err) {
    console.error('[sunreckon] purge of deleted rigs and trips failed', err);
  }
}

/** Purges now and then every 6 hours (idempotent); the timer is unref'd so it never keeps a process alive. */
export function startPurge(): void {
  if (timer) return;
  timer = setInterval(() => void pass(), EVERY_MS);
  timer.unref();
  setImmediate(() => void pass());
}

// Only inside the built or dev server (not in scripts that import server modules), and only in the
// process that runs the background loops.
if (import.meta.env?.SSR && process.env.SUNRECKON_BACKGROUND !== '0') startPurge();
