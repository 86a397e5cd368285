// Schedule windows as people type them ("18-23; 6-8", "22-6" wrapping past midnight, "all day")
// and as the engine stores them ([[18, 23], [6, 8]]). Pure, unit-tested.
import { formatHour } from '../../lib/format';

export type HourWindow = [number, number];

export const ALL_DAY: HourWindow[] = [[0, 24]];

const ALL_DAY_WORDS = new Set(['', 'all day', 'allday', 'always', '24h', '24 h', 'all']);

/** Reads "18-23; 6-8" (also "18:00–23:00", commas) into hour pairs; "all day" or empty is [[0, 24]]. */
export function parseWindows(text: string): { ok: true; windows: HourWindow[] } | { ok: false; message: string } {
  const t = text.trim().toLowerCase();
  if (ALL_DAY_WORDS.has(t)) return { ok: true, windows: [[0, 24]] };
  const parts = t.split(/[;,]/).map((p) => p.trim()).filter(Boolean);
  if (parts.length > 24) return { ok: false, message: 'Use at most 24 windows.' };
  const windows: HourWindow[] = [];
  for (const part of parts) {
    const m = /^(\d{1,2})(?::00)?\s*(?:-|–|—|to)\s*(\d{1,2})(?::00)?$/.exec(part);
    if (!m) return { ok: false, message: `“${part}” is not a window: write whole hours like 18-23, separated by “;” (22-6 runs past midnight).` };
    const from = Number(m[1]);
    const to = Number(m[2]);
    if (from > 24 || to > 24) return { ok: false, message: `“${part}”: hours go from 0 to 24.` };
    if (from === to || (from === 24 && to === 0) || (from === 0 && to === 0)) return { ok: false, message: `“${part}” is an empty window: give different start and end hours (0-24 for all day).` };
    windows.push([from, to]);
  }
  return { ok: true, windows };
}

/** Hour pairs back to the text people type: "18-23; 6-8", or "all day". */
export function windowsToText(windows: readonly (readonly [number, number])[]): string {
  if (isAllDay(windows)) return 'all day';
  return windows.map(([a, b]) => `${a}-${b}`).join('; ');
}

/** "18:00–23:00, 22:00–06:00" for reading; "all day" when the windows cover every hour. */
export function describeWindows(windows: readonly (readonly [number, number])[]): string {
  if (isAllDay(windows)) return 'all day';
  if (windows.length === 0) return 'never';
  return windows.map(([a, b]) => `${formatHour(a)}–${formatHour(b === 24 ? 24 : b)}`).join(', ');
}

/** The set of clock hours (0–23) the windows cover; overlapping windows count an hour once. */
export function coveredHours(windows: readonly (readonly [number, number])[]): boolean[] {
  const on = new Array<boolean>(24).fill(false);
  for (const [from, to] of windows) {
    if (from === to) continue;
    if (from < to) for (let h = from; h < to; h++) on[h] = true;
    else {
      for (let h = from; h < 24; h++) on[h] = true;
      for (let h = 0; h < to; h++) on[h] = true;
    }
  }
  return on;
}

/** How many hours a day the windows cover. */
export function hoursInWindows(windows: readonly (readonly [number, number])[]): number {
  return coveredHours(windows).filter(Boolean).length;
}

/** True when the windows cover all 24 hours. */
export function isAllDay(windows: readonly (readonly [number, number])[]): boolean {
  return hoursInWindows(windows) === 24;
}
