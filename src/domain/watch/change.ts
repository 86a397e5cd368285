// Trip watch: the pure rules of when a re-run forecast is worth telling the crew about, when a
// person may be mailed again, and when a trip is watched at all (issue #20).

/** The few figures of a saved forecast that the watch compares. */
export interface WatchAnswer {
  /** 'makes-it' | 'below-reserve' | 'runs-out' (other verdict states compare as themselves). */
  status: string;
  /** Instant (ms since epoch) of the first cutoff, or null when the bank never cuts off. */
  cutoffAtMs: number | null;
  /** Lowest state of charge over the trip, in percent. */
  lowestPct: number;
}

export type WatchChangeReason = 'verdict' | 'cutoff-moved' | 'cutoff-appeared' | 'cutoff-gone' | 'lowest-moved';

/** The cutoff must move at least this many hours to count as a change. */
export const CUTOFF_SHIFT_HOURS = 3;
/** The lowest state of charge must move at least this many points to count as a change. */
export const LOWEST_SHIFT_POINTS = 10;
/** At most one watch e-mail per person per this many hours. */
export const MAIL_GAP_HOURS = 12;
/** Watching starts this many days before the first arrival (the forecast horizon). */
export const WATCH_LEAD_DAYS = 16;
/** A trip starting within this many days is watched unless someone turns it off. */
export const DEFAULT_ON_DAYS = 21;

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

/**
 * The reasons a new answer differs from the one the crew last saw in a way that matters; empty when it
 * does not. With nothing seen yet there is nothing to compare, so nothing to tell.
 */
export function watchChanges(seen: WatchAnswer | null, next: WatchAnswer): WatchChangeReason[] {
  if (!seen) return [];
  if (!Number.isFinite(next.lowestPct) || !Number.isFinite(seen.lowestPct)) return [];
  const reasons: WatchChangeReason[] = [];
  if (seen.status !== next.status) reasons.push('verdict');
  if (seen.cutoffAtMs === null && next.cutoffAtMs !== null) reasons.push('cutoff-appeared');
  else if (seen.cutoffAtMs !== null && next.cutoffAtMs === null) reasons.push('cutoff-gone');
  else if (
    seen.cutoffAtMs !== null &&
    next.cutoffAtMs !== null &&
    Math.abs(next.cutoffAtMs - seen.cutoffAtMs) >= CUTOFF_SHIFT_HOURS * HOUR_MS
  ) {
    reasons.push('cutoff-moved');
  }
  if (Math.abs(next.lowestPct - seen.lowestPct) >= LOWEST_SHIFT_POINTS) reasons.push('lowest-moved');
  return reasons;
}

/** Whether a person last mailed at `lastMailedMs` (null: never) may be mailed at `nowMs`. */
export function mayMail(lastMailedMs: number | null, nowMs: number): boolean {
  return lastMailedMs === null || nowMs - lastMailedMs >= MAIL_GAP_HOURS * HOUR_MS;
}

/** Whether the watch re-runs a trip at `nowMs`: from 16 days before the first arrival until the trip ends. */
export function inWatchWindow(firstArrivalMs: number, tripEndMs: number, nowMs: number): boolean {
  return nowMs >= firstArrivalMs - WATCH_LEAD_DAYS * DAY_MS && nowMs < tripEndMs;
}

/** Whether a trip with no choice made yet is watched: it starts within 21 days and has not ended. */
export function watchedByDefault(firstArrivalMs: number, tripEndMs: number, nowMs: number): boolean {
  return firstArrivalMs - nowMs <= DEFAULT_ON_DAYS * DAY_MS && nowMs < tripEndMs;
}

/** Whether a trip is due another run: never run, or the interval has passed since the last run. */
export function dueForRun(lastRunMs: number | null, nowMs: number, intervalMinutes: number): boolean {
  return lastRunMs === null || nowMs - lastRunMs >= intervalMinutes * 60_000;
}
