// What GET /api/trips/:id/watch answers (issue #20): the trip watch's state, its runs and its notice.
// One description for the server that builds it and the page that reads it.

export type WatchVerdict = 'makes-it' | 'below-reserve' | 'runs-out';

export interface WatchRun {
  /** The saved forecast this run made (marked "watch"). */
  forecastId: string;
  /** Instant of the run, ISO. */
  ranAt: string;
  verdict: WatchVerdict;
  minSocPct: number;
  /** The first cutoff as a row time in the stop's own offset ("2026-12-11T03:00-07:00"), or null. */
  firstCutoffAt: string | null;
  /** The same cutoff in words, in the stop's local time ("Fri 11 Dec, 03:00"), or null. */
  firstCutoffLocal: string | null;
  /** Whether this run's answer changed enough from the one the crew saw to tell them. */
  changed: boolean;
  /** Why it changed (or why the run stands as it is), in words. */
  reason: string | null;
  /** The lowest state of charge across the band's runs ("how sure"), or null without a band. */
  band: { lowSocPct: number; highSocPct: number } | null;
}

export interface WatchNotice {
  at: string;
  verdict: WatchVerdict;
  previousVerdict: WatchVerdict | null;
  summary: string;
  forecastId: string;
}

export interface TripWatch {
  enabled: boolean;
  defaultOn: boolean;
  /** Owner and editors turn the watch on or off; viewers follow it by e-mail. */
  canToggle: boolean;
  following: boolean;
  /** From 16 days before the first arrival until the trip ends (ISO instants). */
  window: { from: string; to: string };
  nextRunAt: string | null;
  lastError: string | null;
  notice: WatchNotice | null;
  /** Oldest to newest, the last 20. */
  runs: WatchRun[];
}
