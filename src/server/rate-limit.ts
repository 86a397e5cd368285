import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible';
import type { APIContext } from 'astro';
import { HttpError } from './errors';

const limiters = new Map<string, RateLimiterMemory>();

/** The client's socket address (Astro's), never a client-sent header. */
export function clientKey(ctx: APIContext): string {
  try {
    return ctx.clientAddress || 'unknown';
  } catch {
    return 'unknown';
  }
}

/**
 * Counts one request of this client against `perMinute` for `name`; past it, throws a 429 with
 * Retry-After. `perMinute` 0 turns the limit off.
 */
export async function limit(ctx: APIContext, name: string, perMinute: number): Promise<void> {
  if (perMinute <= 0) return;
  const id = `${name}:${perMinute}`;
  let limiter = limiters.get(id);
  if (!limiter) {
    limiter = new RateLimiterMemory({ points: perMinute, duration: 60, keyPrefix: name });
    limiters.set(id, limiter);
  }
  try {
    await limiter.consume(clientKey(ctx));
  } catch (res) {
    if (!(res instanceof RateLimiterRes)) throw res;
    const retry = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    throw new HttpError('rate_limited', `Too many requests. Try again in ${retry} s.`, [], {}, { 'Retry-After': String(retry) });
  }
}
