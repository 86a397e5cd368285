// Trip watch, server side (issue #20). For now: the signed unsubscribe token a watch e-mail carries, so a
// crew member can stop one trip's watch mail without signing in. The secret is passed in (the app's auth
// secret), which keeps this testable without the server's environment.
import { createHmac, timingSafeEqual } from 'node:crypto';
import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';

export interface UnsubscribeClaim {
  tripId: string;
  userId: string;
}

function mac(secret: string, body: string): Buffer {
  return createHmac('sha256', `watch-unsubscribe:${secret}`).update(body).digest();
}

/** A URL-safe token naming one person and one trip, signed with the app's secret. */
export function signUnsubscribe(secret: string, claim: UnsubscribeClaim): string {
  const body = Buffer.from(JSON.stringify([claim.tripId, claim.userId]), 'utf8').toString('base64url');
  return `${body}.${mac(secret, body).toString('base64url')}`;
}

/** The person and trip a token names, or null when it is malformed or not signed with this secret. */
export function readUnsubscribe(secret: string, token: string): UnsubscribeClaim | null {
  if (typeof token !== 'string' || token.length > 600) return null;
  const parts = token.split('.');
  if (parts.length !== 2 || !parts[0] || !parts[1]) return null;
  const [body, sig] = parts as [string, string];
  const given = Buffer.from(sig, 'base64url');
  const want = mac(secret, body);
  if (given.length !== want.length || !timingSafeEqual(given, want)) return null;
  try {
    const value: unknown = JSON.parse(Buffer.from(body, 'base64url').toString('utf8'));
    if (!Array.isArray(value) || value.length !== 2) return null;
    const [tripId, userId] = value as unknown[];
    if (typeof tripId !== 'string' || typeof userId !== 'string' || !tripId || !userId) return null;
    return { tripId, userId };
  } catch {
    return null;
  }
}

/**
 * Claims the lease `name` for `holder` until `nowMs + leaseMs` when it is free, expired or already
 * held by `holder`; true when this holder now has it. One conditional statement each way, plain SQL
 * that runs the same on SQLite and PostgreSQL, so two instances racing never both win.
 */
export async function claimLease(db: Kysely<DB>, name: string, holder: string, nowMs: number, leaseMs: number): Promise<boolean> {
  const until = nowMs + leaseMs;
  await db
    .insertInto('watch_leases')
    .values({ name, holder: '', expires_at: 0 })
    .onConflict((oc) => oc.column('name').doNothing())
    .execute();
  const res = await db
    .updateTable('watch_leases')
    .set({ holder, expires_at: until })
    .where('name', '=', name)
    .where((eb) => eb.or([eb('expires_at', '<=', nowMs), eb('holder', '=', holder)]))
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** Gives the lease back early (only when `holder` still has it). */
export async function releaseLease(db: Kysely<DB>, name: string, holder: string): Promise<void> {
  await db.updateTable('watch_leases').set({ expires_at: 0 }).where('name', '=', name).where('holder', '=', holder).execute();
}
