import { env } from '../env';
import { HttpError } from '../errors';
import { limitKey } from '../rate-limit';

// Limits on pooled work per user: how many may run at once and how many may start per minute, so
// one account (two free sign-ups make an installer with a grant) cannot fill the pool for everyone.

/** Sweeps one installer may have running (or waiting for a thread) at once. */
export const SWEEPS_PER_USER = 2;

const running = new Map<string, number>();

/** Runs `fn` when the user has fewer than SWEEPS_PER_USER running; else a 429 asking to wait. */
export async function oneAtATime<T>(userId: string, fn: () => Promise<T>): Promise<T> {
  const now = running.get(userId) ?? 0;
  if (now >= SWEEPS_PER_USER) {
    throw new HttpError(
      'rate_limited',
      `You already have ${SWEEPS_PER_USER} sweeps running; wait for one to finish.`,
      [],
      {},
      { 'Retry-After': '5' },
    );
  }
  running.set(userId, now + 1);
  try {
    return await fn();
  } finally {
    const left = (running.get(userId) ?? 1) - 1;
    if (left > 0) running.set(userId, left);
    else running.delete(userId);
  }
}

/** Counts one sweep against SWEEP_RATE_LIMIT per user per minute; 429 with Retry-After past it. */
export function limitSweeps(userId: string): Promise<void> {
  return limitKey('sweep-user', userId, env.SWEEP_RATE_LIMIT, 60, `At most ${env.SWEEP_RATE_LIMIT} sweeps a minute.`);
}
