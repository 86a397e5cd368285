// Schedule windows as people type them ("18-23; 6-8", "22-6" wrapping past midnight, "all day",
// "none") and as the engine stores them ([[18, 23], [6, 8]]). The ONE reading of a schedule: the
// load form and the loads CSV both use parseWindows, so a schedule means the same in a file and on
// screen (they used to disagree: "none" came back from the form as all day). Pure, unit-tested.
import { formatHour } from '../../lib/format';

export type HourWindow = [number, number];

export const ALL_DAY: HourWindow[] = [[0, 24]];

// Empty is all day: the same as leaving the schedule out (the engine's default).
const ALL_DAY_WORDS = new Set(['', 'all day', 'allday', 'always', '24h', '24 h', 'all']);
// A load with no window never runs (a spare outlet, a load kept on the list for later).
const NO_WINDOW_WORDS = new Set(['none', 'never', 'no window']);
// The engine's LIMITS.maxWindowsPerLoad, written here so light islands need not load the schema library.
const MAX_WINDOWS = 24;

/** How a window is written, for messages. */
const HOW = 'write whole hours from-to, e.g. 18-23;6-8 (22-6 runs past midnight, 0-24 is all day, none is no window)';

/**
 * Reads a schedule: windows of whole hours `18-23;6-8` (also `18:00-23:00`, `–` or `to`, and commas
 * between windows), `all day` or empty for every hour, `none` for no window at all. `h-h` is an
 * empty window, as the engine reads it. Hours go from 0 to 24.
 */
export function parseWindows(text: string): { ok: true; windows: HourWindow[] } | { ok: false; message: string } {
  const t = text.trim().toLowerCase().replace(/\s+/g, ' ');
  if (ALL_DAY_WORDS.has(t)) return { ok: true, windows: [[0, 24]] };
  if (NO_WINDOW_WORDS.has(t)) return { ok: true, windows: [] };
  const parts = t.split(/[;,]/).map((p) => p.trim()).filter(Boolean);
  if (parts.length > MAX_WINDOWS) return { ok: false, message: `Use at most ${MAX_WINDOWS} windows.` };
  const windows: HourWindow[] = [];
  for (const part of parts) {
    const shown = part.slice(0, 20);
    const m = /^(\d{1,2})(?::00)?\s*(?:-|–|—|to)\s*(\d{1,2})(?::00)?$/.exec(part);
    if (!m) return { ok: false, message: `“${shown}” is not a window: ${HOW}.` };
    const from = Number(m[1]);
    const to = Number(m[2]);
    if (from > 24 || to > 24) return { ok: false, message: `“${shown}”: hours go from 0 to 24; ${HOW}.` };
    windows.push([from, to]);
  }
  return { ok: true, windows };
}

/** Hour pairs back to the text people type: "18-23; 6-8", "all day", or "none" for no window. */
export function windowsToText(windows: readonly (readonly [number, number])[]): string {
  if (windows.length === 0) return 'none';
  if (isAllDay(windows)) return 'all day';
  return windows.map(([a, b]) => `${a}-${b}`).join('; ');
}

/** Hour pairs as a CSV cell: `18-23;6-8`, or `none` for no window (read back by parseWindows). */
export function windowsToCell(windows: readonly (readonly [number, number])[]): string {
  return windows.length === 0 ? 'none' : windows.map(([a, b]) => `${a}-${b}`).join(';');
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
