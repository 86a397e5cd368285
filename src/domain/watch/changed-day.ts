// Trip watch: which stop-day's weather moved the answer (issue #20) — the day whose sunlight changed
// the most between the weather the crew's last answer used and the new run's. Pure.
import { dayNumber } from '../../engine/light';

/** The little of a plan this reads: each stop's name, dates and weather days. */
export interface PlanWeather {
  stops: { name?: string; arrive: string; nights: number; weather: { date: string; cloudOktas: number; hourly?: { ghiWm2?: number }[] }[] }[];
}

/**
 * Daily sunlight of a stop-day's weather for ranking days against each other: Wh/m² summed from its
 * hours, or, for a typed day without hours, 600 per okta of clear sky (a ranking figure, not an estimate).
 */
function daySun(w: { cloudOktas: number; hourly?: { ghiWm2?: number }[] }): number {
  if (w.hourly?.some((h) => h.ghiWm2 !== undefined)) return w.hourly.reduce((t, h) => t + (h.ghiWm2 ?? 0), 0);
  return (8 - w.cloudOktas) * 600;
}

/**
 * The stop-day whose sunlight moved the most between two plans' weather, or null: among the days
 * the stop is camped (arrival to the last night) and, when the new answer cuts off, up to that day
 * (later weather cannot have moved it).
 */
export function changedDay(before: PlanWeather | null, after: PlanWeather, cutoffDate: string | null = null): { date: string; stop: string } | null {
  if (!before) return null;
  let best: { date: string; stop: string; delta: number } | null = null;
  after.stops.forEach((s, i) => {
    const old = before.stops[i];
    if (!old) return;
    const first = dayNumber(s.arrive);
    const last = first + s.nights - 1;
    for (const w of s.weather) {
      const d = dayNumber(w.date);
      if (d < first || d > last || (cutoffDate !== null && w.date > cutoffDate)) continue;
      const o = old.weather.find((x) => x.date === w.date);
      if (!o) continue;
      const delta = Math.abs(daySun(w) - daySun(o));
      if (delta > 0 && (!best || delta > best.delta)) best = { date: w.date, stop: s.name || `Stop ${i + 1}`, delta };
    }
  });
  const b = best as { date: string; stop: string; delta: number } | null;
  return b ? { date: b.date, stop: b.stop } : null;
}
