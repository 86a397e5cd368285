// Saved forecasts are named by when they were made, in the local time of the trip's first stop (the
// camper thinks in camp time, not UTC): "Forecast of Sat 12 Dec, 10:08 (local time at Mesa camp)".
// The zone is explicit, so the server and the browser print the same words.
import type { ResolvedPlan } from '../../engine';
import { formatInstant, isTimeZone } from '../../lib/clock';

/** Names the server gave before names used camp time: "Forecast of 2026-12-12 15:08 UTC". */
const OLD_DEFAULT = /^Forecast of \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC$/;

type FirstStop = Pick<ResolvedPlan['stops'][number], 'name' | 'timeZone'>;

/** An instant in the first stop's zone and where that clock is: { time: "Sat 12 Dec, 10:08", where: "local time at Mesa camp" }. */
export function snapshotClock(createdAt: string, plan: { stops: FirstStop[] }): { time: string; where: string } {
  const stop = plan.stops[0];
  if (!stop || !isTimeZone(stop.timeZone)) return { time: formatInstant(createdAt, 'UTC'), where: 'UTC' };
  return { time: formatInstant(createdAt, stop.timeZone), where: `local time at ${stop.name}` };
}

/** "Sat 12 Dec, 10:08 (local time at Mesa camp)": an instant in the first stop's zone, named in plain words. */
export function snapshotTime(createdAt: string, plan: { stops: FirstStop[] }): string {
  const c = snapshotClock(createdAt, plan);
  return `${c.time} (${c.where})`;
}

/** The name a forecast gets when nobody names it. */
export function defaultSnapshotName(createdAt: string, plan: { stops: FirstStop[] }): string {
  return `Forecast of ${snapshotTime(createdAt, plan)}`;
}

/** How a saved forecast is called on the page: its own name, or, for an old UTC default name, the camp-time one. */
export function snapshotLabel(name: string, createdAt: string, plan: { stops: FirstStop[] }): string {
  return OLD_DEFAULT.test(name) ? defaultSnapshotName(createdAt, plan) : name;
}

/**
 * Two names a reader can tell apart: two forecasts saved in the same minute (or given the same
 * name) get "(first)" and "(second)" in the order they were picked.
 */
export function distinctNames(a: string, b: string): [string, string] {
  return a === b ? [`${a} (first)`, `${b} (second)`] : [a, b];
}
