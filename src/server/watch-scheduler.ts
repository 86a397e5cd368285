// Trip watch, the timer (issue #20): started with the server in the one process that runs background
// work (SUNRECKON_BACKGROUND unset or 1, like the outbox), never with WATCH=off and never in the
// test environment, where the tests drive ticks through POST /api/dev/watch/tick with their own clock.
// It looks every few minutes for trips due a run; which trips are due, and that only one instance
// runs them, is decided in the database (watch-run.ts).
import { db } from './db';
import { env } from './env';
import { runWatchTick } from './watch-run';

/** How often the timer looks for due trips: every 5 minutes, or the interval when that is shorter. */
export function pollMs(intervalMinutes = env.WATCH_INTERVAL_MINUTES): number {
  return Math.min(intervalMinutes, 5) * 60_000;
}

/** Where the e-mail's links point from a background tick (no request to take the origin from). */
export function backgroundOrigin(): string {
  if (env.authUrl) return new URL(env.authUrl).origin;
  return `http://${process.env.HOST ?? '127.0.0.1'}:${process.env.PORT ?? '4321'}`;
}

let timer: ReturnType<typeof setInterval> | null = null;
let running = false;

async function tick(): Promise<void> {
  if (running) return;
  running = true;
  try {
    const r = await runWatchTick(db, { origin: backgroundOrigin() });
    if (r.ran > 0) console.log(`[sunreckon] trip watch: ${r.ran} trips re-run, ${r.changed} changed, ${r.mailed} e-mails`);
  } catch (err) {
    console.error('[sunreckon] trip watch tick failed', err);
  } finally {
    running = false;
  }
}

/** Starts the watch timer (idempotent); unref'd, so it never keeps a process alive. */
export function startWatchScheduler(): boolean {
  if (timer || env.WATCH === 'off' || env.SUNRECKON_ENV === 'test') return false;
  timer = setInterval(() => void tick(), pollMs());
  timer.unref();
  console.log(`[sunreckon] trip watch on: trips re-run every ${env.WATCH_INTERVAL_MINUTES} minutes, due trips looked for every ${pollMs() / 60_000} minutes`);
  // The first look soon after start, not a whole poll later.
  setTimeout(() => void tick(), 20_000).unref();
  return true;
}

if (import.meta.env?.SSR && process.env.SUNRECKON_BACKGROUND !== '0') startWatchScheduler();
