import cluster from 'node:cluster';
import { createHash } from 'node:crypto';

/**
 * The session lookup of a signed-in request (better-auth: a cookie signature check and a database
 * read), kept in this process for SESSION_CACHE_MS (default 5000, or 0 with DATABASE_URL; 0 turns it off) under the
 * SHA-256 of the session cookie's value — one person's cookie, never shared between people.
 *
 * What ends it at once, in every worker process (server.mjs's primary passes the word on):
 *   - any write (POST, PUT, PATCH, DELETE) carrying that session cookie — sign-out, a settings or
 *     profile change, a password change — before the write runs and again after it has answered;
 *   - any write to /api/auth/* or /sign-out (a password reset revokes sessions without a cookie):
 *     every kept session of every worker.
 * A lookup that began before such a drop is not kept. What a cached session can miss is a change
 * made to it by someone else outside those routes, for at most SESSION_CACHE_MS.
 */
// Off by default on PostgreSQL (DATABASE_URL): that is how several server instances share one database, and
// an instance is not told of a sign-out another one served.
const TTL_MS = Math.max(0, Number(process.env.SESSION_CACHE_MS ?? (process.env.DATABASE_URL ? 0 : 5000)));
const MAX_ENTRIES = 5000;
const MESSAGE = 'sunreckon:session-drop';

type Entry<T> = { value: T; until: number };
const kept = new Map<string, Entry<unknown>>();
/** Counts drops: a lookup is kept only when no drop happened while it ran. */
let drops = 0;

const SESSION_TOKEN = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_token=([^;]*)/;

/** The key of a request's session cookie (a hash of its value), or null without one. */
export function sessionKey(cookie: string | null): string | null {
  if (!cookie) return null;
  const m = SESSION_TOKEN.exec(cookie);
  if (!m || !m[1]) return null;
  return createHash('sha256').update(m[1]).digest('base64url');
}

function dropHere(key: string | null): void {
  drops += 1;
  if (key === null) kept.clear();
  else kept.delete(key);
}

/** Ends one kept session (or every one, with null) in this process and in the other workers. */
export function dropSession(key: string | null): void {
  dropHere(key);
  if (cluster.isWorker && process.send) process.send({ type: MESSAGE, key });
}

if (cluster.isWorker) {
  process.on('message', (msg: unknown) => {
    if (msg && typeof msg === 'object' && (msg as { type?: unknown }).type === MESSAGE) {
      const key = (msg as { key?: unknown }).key;
      dropHere(typeof key === 'string' ? key : null);
    }
  });
}

/**
 * The session for `key`: the kept one while fresh, else `lookup()`'s (kept when it found one and
 * nothing was dropped meanwhile). Without a key or with the cache off, just `lookup()`.
 */
export async function cachedSession<T>(key: string | null, lookup: () => Promise<T | null>): Promise<T | null> {
  if (key === null || TTL_MS === 0) return lookup();
  const now = Date.now();
  const hit = kept.get(key);
  if (hit && hit.until > now) return hit.value as T;
  const before = drops;
  const value = await lookup();
  if (value !== null && drops === before) {
    if (kept.size >= MAX_ENTRIES) {
      for (const [k, e] of kept) if (e.until <= now) kept.delete(k);
      if (kept.size >= MAX_ENTRIES) kept.clear();
    }
    kept.set(key, { value, until: now + TTL_MS });
  }
  return value;
}

/** How many sessions this process keeps (tests). */
export function keptSessions(): number {
  return kept.size;
}
