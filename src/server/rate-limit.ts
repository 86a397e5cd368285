import cluster from 'node:cluster';
import { RateLimiterCluster, RateLimiterMemory, RateLimiterPostgres, RateLimiterRes, type RateLimiterAbstract } from 'rate-limiter-flexible';
import type { APIContext } from 'astro';
import { database } from './db';
import { env } from './env';
import { HttpError } from './errors';

/**
 * A limiter counting in this process's memory (one instance on SQLite; with several worker
 * processes, in the primary's memory through cluster messages), or in the shared
 * PostgreSQL table `rate_limits` (migration 0018) so that several instances count together.
 */
function makeLimiter(opts: { points: number; duration: number; keyPrefix: string }): RateLimiterAbstract {
  if (database.pool) {
    return new RateLimiterPostgres({ ...opts, storeClient: database.pool, storeType: 'pool', tableName: 'rate_limits', tableCreated: true, clearExpiredByTimeout: true });
  }
  // Several worker processes (server.mjs, WEB_CONCURRENCY > 1): counted in the primary's memory for all.
  if (cluster.isWorker) return new RateLimiterCluster({ ...opts, timeoutMs: 2000 });
  return new RateLimiterMemory(opts);
}

const limiters = new Map<string, RateLimiterAbstract>();

/**
 * The key a client's requests are counted under. Astro's clientAddress takes the first
 * X-Forwarded-For value, which the client writes itself; so without a trusted proxy every request
 * that sends the header shares one bucket (a made-up address never buys a fresh allowance), and
 * behind one (SUNRECKON_TRUST_PROXY=1) the last hop — the one our proxy appended — counts.
 */
export function clientKey(ctx: APIContext): string {
  let address = 'unknown';
  try {
    address = ctx.clientAddress || 'unknown';
  } catch {
    // no address known
  }
  return clientKeyOf(ctx.request.headers.get('x-forwarded-for'), address);
}

/** `clientKey` from the X-Forwarded-For header (or null) and the connection's address. */
export function clientKeyOf(forwarded: string | null, address: string): string {
  if (forwarded !== null) {
    if (env.SUNRECKON_TRUST_PROXY !== '1') return 'forwarded-untrusted';
    const hops = forwarded.split(',').map((h) => h.trim()).filter(Boolean);
    return hops.at(-1) ?? 'forwarded-empty';
  }
  return address;
}

/**
 * Counts one request of this client against `perMinute` for `name`; past it, throws a 429 with
 * Retry-After. `perMinute` 0 turns the limit off.
 */
export async function limit(ctx: APIContext, name: string, perMinute: number): Promise<void> {
  return limitClient(clientKey(ctx), name, perMinute);
}

/** `limit` for a client key already known (the preview's direct path in server.mjs has no APIContext). */
export async function limitClient(client: string, name: string, perMinute: number): Promise<void> {
  if (perMinute <= 0) return;
  const id = `${name}:${perMinute}`;
  let limiter = limiters.get(id);
  if (!limiter) {
    limiter = makeLimiter({ points: perMinute, duration: 60, keyPrefix: name });
    limiters.set(id, limiter);
  }
  try {
    await limiter.consume(client);
  } catch (res) {
    if (!(res instanceof RateLimiterRes)) throw res;
    const retry = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    throw new HttpError('rate_limited', `Too many requests. Try again in ${retry} s.`, [], {}, { 'Retry-After': String(retry) });
  }
}

const keyedLimiters = new Map<string, RateLimiterAbstract>();

/**
 * Counts one action against `points` per `seconds` for `key` (a crew, an address, a user) under
 * `name`; past it, throws a 429 with Retry-After and `message`. `points` 0 turns the limit off.
 */
export async function limitKey(name: string, key: string, points: number, seconds: number, message: string, field?: string): Promise<void> {
  if (points <= 0) return;
  const id = `${name}:${points}:${seconds}`;
  let limiter = keyedLimiters.get(id);
  if (!limiter) {
    limiter = makeLimiter({ points, duration: seconds, keyPrefix: id });
    keyedLimiters.set(id, limiter);
  }
  try {
    await limiter.consume(key);
  } catch (res) {
    if (!(res instanceof RateLimiterRes)) throw res;
    const retry = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    const minutes = Math.ceil(retry / 60);
    throw new HttpError('rate_limited', `${message} Try again in ${retry < 120 ? `${retry} s` : `${minutes} minutes`}.`, field ? [{ path: field, message: 'too many for now' }] : [], {}, { 'Retry-After': String(retry) });
  }
}
