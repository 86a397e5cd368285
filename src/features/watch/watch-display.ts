// What the trip watch panel says, as pure functions: the verdicts' words and marks, times in an
// explicit zone (lib/clock.ts: app events such as runs in the user's zone, trip events such as the
// cutoff in the stop's own offset, a ZoneClock from the server so the server's and the browser's
// renders agree), where "now" stands against the watch window, and the band's narrowing in a sentence.
import { formatInstant as clockInstant, zoneOffset, zonePlainName, type ZoneClock } from '../../lib/clock';
import { formatDay, formatOffset, formatRowTime, localParts, pct } from '../../lib/format';
import type { TripWatch, WatchRun, WatchVerdict } from './watch.api';

/** Words first; the mark and colour only support them (the same marks as the forecast's verdict). */
export const VERDICT_LOOK: Record<WatchVerdict, { label: string; mark: string; dot: string; box: string }> = {
  'makes-it': { label: 'Makes it', mark: '✓', dot: 'bg-moss-deep text-white', box: 'border-moss bg-[#eef5ef]' },
  'below-reserve': { label: 'Dips below reserve', mark: '!', dot: 'bg-[#7a5a12] text-white', box: 'border-sun bg-[#fdf3dc]' },
  'runs-out': { label: 'Runs out', mark: '✕', dot: 'bg-alert text-white', box: 'border-ember bg-[#fbebe2]' },
};

const RANK: Record<WatchVerdict, number> = { 'makes-it': 0, 'below-reserve': 1, 'runs-out': 2 };

/** Whether `next` is a worse answer than `prev` (runs out is worse than below reserve, worse than makes it). */
export function isWorse(prev: WatchVerdict | null, next: WatchVerdict): boolean {
  return prev !== null && RANK[next] > RANK[prev];
}

const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

/** The instant (ms) of an ISO instant, or of local midnight UTC of a bare date. */
export function msOf(isoOrDate: string): number {
  return DATE_ONLY.test(isoOrDate) ? Date.parse(`${isoOrDate}T00:00:00Z`) : Date.parse(isoOrDate);
}

/** The calendar date (YYYY-MM-DD) of an instant in a zone; a bare date stays itself. */
export function dateIn(isoOrDate: string, timeZone: string | ZoneClock): string {
  if (DATE_ONLY.test(isoOrDate)) return isoOrDate;
  return clockInstant(isoOrDate, timeZone, 'dayKey');
}

/** "Sat 5 Dec, 09:12": an instant in an explicit zone. */
export function formatInstant(iso: string, timeZone: string | ZoneClock): string {
  return clockInstant(iso, timeZone, 'dayTime');
}

/** "Sat 5 Dec, 09:12 Berlin time (UTC+01:00)": an instant with its zone named. */
export function formatInstantNamed(iso: string, timeZone: string | ZoneClock): string {
  const name = zonePlainName(typeof timeZone === 'string' ? timeZone : timeZone.zone, iso);
  const offset = zoneOffset(iso, timeZone);
  return name === 'UTC' || name.startsWith('UTC')
    ? `${formatInstant(iso, timeZone)} ${name}`
    : `${formatInstant(iso, timeZone)} ${name} (${offset})`;
}

/**
 * A cutoff in the stop's own local time, read from the row time's wall clock and offset (the stop
 * may lie in another zone than the trip's first): "Thu 10 Dec, 03:00 (UTC−07:00)"; the server's
 * words when the row time is missing.
 */
export function formatCutoff(run: Pick<WatchRun, 'firstCutoffLocal' | 'firstCutoffAt'>): string | null {
  if (run.firstCutoffAt && localParts(run.firstCutoffAt)) return `${formatRowTime(run.firstCutoffAt)} (${formatOffset(run.firstCutoffAt)})`;
  return run.firstCutoffLocal;
}

export type WindowState = 'before' | 'during' | 'after';

/** Where `nowMs` stands against the watch window. */
export function windowState(w: TripWatch['window'], nowMs: number): WindowState {
  if (nowMs < msOf(w.from)) return 'before';
  if (nowMs >= msOf(w.to)) return 'after';
  return 'during';
}

/** "The watch starts 16 days before you arrive: on Thu 3 Dec." */
export function startsSentence(w: TripWatch['window'], timeZone: string | ZoneClock): string {
  return `The watch starts 16 days before you arrive: on ${formatDay(dateIn(w.from, timeZone))}.`;
}

/** One run in words, for the timeline's list and its screen-reader text. */
export function runSentence(run: WatchRun, timeZone: string | ZoneClock): string {
  const cutoff = formatCutoff(run);
  const what =
    run.verdict === 'runs-out' && cutoff ? `Runs out ${cutoff}` : `${VERDICT_LOOK[run.verdict].label}, lowest ${pct(run.minSocPct)}`;
  return `${formatInstant(run.ranAt, timeZone)}: ${what}${run.changed ? ' (changed)' : ''}`;
}

/**
 * The band's narrowing in a sentence: the first and latest run's low–high state of charge, and
 * whether the spread has narrowed. Null when no run has a band.
 */
export function bandSentence(runs: WatchRun[]): string | null {
  const banded = runs.filter((r) => r.band !== null);
  const first = banded[0];
  const last = banded[banded.length - 1];
  if (!first?.band || !last?.band) return null;
  const span = (b: { lowSocPct: number; highSocPct: number }) => `${pct(b.lowSocPct)} and ${pct(b.highSocPct)}`;
  if (banded.length === 1) return `The lowest state of charge lies between ${span(first.band)} on the one run so far.`;
  const before = first.band.highSocPct - first.band.lowSocPct;
  const now = last.band.highSocPct - last.band.lowSocPct;
  const trend =
    Math.round(now) < Math.round(before)
      ? `narrowed from ${Math.round(before)} to ${Math.round(now)} points`
      : Math.round(now) > Math.round(before)
        ? `widened from ${Math.round(before)} to ${Math.round(now)} points`
        : `held at ${Math.round(now)} points`;
  return `The lowest state of charge lay between ${span(first.band)} at the first run and between ${span(last.band)} at the latest: the band ${trend} over ${banded.length} runs.`;
}
