// Pure helpers that turn a forecast into what the charts draw and what their text summaries say.
// The x axis is hours since the forecast's start (rows are exactly one hour apart, whatever the
// zones), so a move between zones or a DST change never bends the line.
import type { Forecast, HourlyRow, ResolvedPlan } from '../../engine';
import { formatDay, formatRowTime, formatWh, localParts, pct } from '../../lib/format';
import { reserveOf, stopNameAt } from '../../domain/forecasts/verdict';
import { dayEnergy, type DayEnergy } from './day-energy';

/** Colours of ux.md ("Charts"). */
export const COLORS = {
  soc: '#2F3E55',
  night: '#2F3E55',
  reserveFill: '#E6D8C1',
  reserveEdge: '#8A7552',
  cutoff: '#D9642E',
  cutoffText: '#A4341B',
  usable: '#55708F',
  loads: '#55708F',
  solar: '#F2B73F',
  charging: '#4F7F58',
  compare: '#D9642E',
  grid: '#E6D8C1',
  axis: '#4A6280',
} as const;

/** One point of the SOC line: `x` hours after the start; `row` is the hour that ends there (−1 for the start). */
export interface SocPoint {
  x: number;
  soc: number;
  row: number;
}

/** The SOC line: the starting SOC at x = 0, then each hour's end-of-hour SOC at x = i + 1. */
export function socSeries(f: Forecast): SocPoint[] {
  const out: SocPoint[] = [{ x: 0, soc: f.summary.startSocPct, row: -1 }];
  f.hourly.forEach((r, i) => out.push({ x: i + 1, soc: r.socPct, row: i }));
  return out;
}

/**
 * Usable charge (engine revision 2) under the SOC line, at each hour's end, when the cold strands
 * at least a point of charge somewhere in the trip; null otherwise (and for snapshots made before
 * revision 2, which carry no usable charge), so a warm trip's chart stays one line.
 */
export function usableSeries(f: Forecast): SocPoint[] | null {
  let stranded = false;
  for (const r of f.hourly) {
    if (r.usablePct === undefined) return null;
    if (r.socPct - r.usablePct >= 1) stranded = true;
  }
  if (!stranded) return null;
  return f.hourly.map((r, i) => ({ x: i + 1, soc: r.usablePct, row: i }));
}

export type VoltageCutoffKind = 'voltage' | 'surge' | 'collapse';

/** A voltage, surge or collapse cutoff: marked at the start of its hour (`x` = row index). */
export interface VoltageMark {
  x: number;
  kind: VoltageCutoffKind;
  time: string;
}

const MARK_KIND: Record<string, VoltageCutoffKind> = { 'voltage-cutoff': 'voltage', 'surge-cutoff': 'surge', 'voltage-collapse': 'collapse' };
const MARK_RANK: Record<VoltageCutoffKind, number> = { voltage: 0, surge: 1, collapse: 2 };

/** Hours in which the bank's volts cut it off (plain, by a surge, or by collapsing), one mark per hour, the most specific kind. */
export function voltageMarks(f: Forecast): VoltageMark[] {
  const byRow = new Map<number, VoltageMark>();
  const rowOf = new Map(f.hourly.map((r, i) => [r.time, i]));
  for (const w of f.warnings) {
    const kind = MARK_KIND[w.code];
    const x = rowOf.get(w.at);
    if (!kind || x === undefined) continue;
    const had = byRow.get(x);
    if (!had || MARK_RANK[kind] > MARK_RANK[had.kind]) byRow.set(x, { x, kind, time: w.at });
  }
  return [...byRow.values()].sort((a, b) => a.x - b.x);
}

/** Words for a voltage mark, as the key and the summary say them. */
export const VOLTAGE_MARK_WORDS: Record<VoltageCutoffKind, string> = { voltage: 'low-voltage cutoff', surge: 'surge cutoff', collapse: 'voltage collapse' };

/** Dark hours (sun at or below the horizon at the hour's midpoint), merged into bands [x1, x2]. */
export function nightBands(f: Forecast): { x1: number; x2: number }[] {
  const bands: { x1: number; x2: number }[] = [];
  f.hourly.forEach((r, i) => {
    if (r.sunAltitudeDeg > 0) return;
    const last = bands[bands.length - 1];
    if (last && last.x2 === i) last.x2 = i + 1;
    else bands.push({ x1: i, x2: i + 1 });
  });
  return bands;
}

/** The stretch of hours each stop owns, in order (a stop may own none). */
export function stopSegments(f: Forecast, plan: ResolvedPlan): { name: string; x1: number; x2: number }[] {
  const segs: { name: string; x1: number; x2: number; stop: number }[] = [];
  f.hourly.forEach((r, i) => {
    const last = segs[segs.length - 1];
    if (last && last.stop === r.stop) last.x2 = i + 1;
    else segs.push({ name: stopNameAt(f, plan, i), x1: i, x2: i + 1, stop: r.stop });
  });
  return segs.map(({ name, x1, x2 }) => ({ name, x1, x2 }));
}

/** Ticks at local midnights ("Fri 22"), thinned to at most `maxTicks`. */
export function dayTicks(f: Forecast, maxTicks = 8): { x: number; label: string }[] {
  const all: { x: number; label: string }[] = [];
  f.hourly.forEach((r, i) => {
    const p = localParts(r.time);
    if (p && p.hour === 0) all.push({ x: i, label: `${formatDay(p.date).split(' ').slice(0, 2).join(' ')}` });
  });
  const firstHour = f.hourly[0];
  if (all.length === 0 && firstHour) {
    const p = localParts(firstHour.time);
    if (p) all.push({ x: 0, label: formatDay(p.date).split(' ').slice(0, 2).join(' ') });
  }
  const step = Math.max(1, Math.ceil(all.length / Math.max(1, maxTicks)));
  return all.filter((_, i) => i % step === 0);
}

/** Where the cutoff marker goes: the start of the hour in which the bank first disconnects. */
export function cutoffX(f: Forecast): number | null {
  if (!f.summary.firstCutoffAt) return null;
  const i = f.hourly.findIndex((r) => r.time === f.summary.firstCutoffAt);
  return i < 0 ? null : i;
}

/** The one-paragraph text summary of the SOC chart (its accessible description). */
export function socSummaryText(f: Forecast, plan: ResolvedPlan, reserveSocPct?: number | null): string {
  const s = f.summary;
  const reserve = reserveOf(f, plan, reserveSocPct);
  const first = f.hourly[0];
  const last = f.hourly[f.hourly.length - 1];
  const span = first && last ? `from ${formatRowTime(first.time)} to ${formatRowTime(last.time)}` : '';
  const usable = usableSeries(f);
  const marks = voltageMarks(f);
  const parts = [
    `State of charge ${span}: starts at ${pct(s.startSocPct)}, lowest ${pct(s.minSocPct)} on ${formatRowTime(s.minSocAt)}, ends at ${pct(s.endSocPct)}.`,
    ...(usable && s.minUsablePct !== undefined ? [`The cold strands some charge: usable charge is lowest at ${pct(s.minUsablePct)}.`] : []),
    `Reserve band up to ${pct(reserve)}.`,
    s.firstCutoffAt
      ? `First cutoff on ${formatRowTime(s.firstCutoffAt)} at ${stopNameAt(f, plan, Math.max(0, f.hourly.findIndex((r) => r.time === s.firstCutoffAt)))}.`
      : 'No cutoff.',
    ...marks.map((m) => `A ${VOLTAGE_MARK_WORDS[m.kind]} on ${formatRowTime(m.time)}.`),
  ];
  return parts.join(' ');
}

/** Text summary of the daily energy chart: demand (served and not served) against charging. */
export function daysSummaryText(f: Forecast): string {
  if (f.days.length === 0) return 'No days to show.';
  // Partial first and last days would look easy or hard only for being short: judge whole days.
  const hours = new Map<string, number>();
  for (const r of f.hourly) {
    const d = localParts(r.time)?.date ?? '';
    hours.set(d, (hours.get(d) ?? 0) + 1);
  }
  const energy = dayEnergy(f);
  const whole = energy.filter((d) => (hours.get(d.date) ?? 0) >= 23);
  const pool = whole.length > 0 ? whole : energy;
  // A day's balance against what the loads asked for, so a day spent cut off counts as hard as it is.
  const balance = (d: DayEnergy) => d.netWh - d.unmetWh;
  const worst = pool.reduce((a, b) => (balance(b) < balance(a) ? b : a));
  const wb = balance(worst);
  const net =
    wb < 0
      ? `${formatWh(-wb)} more ${worst.unmetWh >= 1 ? 'asked for' : 'used'} than charged${worst.unmetWh >= 1 ? ` (${formatWh(worst.unmetWh)} of it not served)` : ''}`
      : `${formatWh(wb)} more charged than used`;
  const unmet = energy.reduce((s, d) => s + d.unmetWh, 0);
  const loads = unmet >= 1 ? `the loads ask for ${formatWh(f.summary.loadWh + unmet)} and get ${formatWh(f.summary.loadWh)}` : `the loads use ${formatWh(f.summary.loadWh)}`;
  return `Over ${f.days.length} days ${loads}; solar delivers ${formatWh(f.summary.solarWh)} and other charging ${formatWh(f.summary.chargeWh)}. The hardest ${whole.length > 0 ? 'whole ' : ''}day is ${formatDay(worst.date)}: ${net}.`;
}

/** Rows of one local day (by the row's own local date). */
export function rowsOfDay(f: Forecast, date: string): { row: HourlyRow; index: number }[] {
  const out: { row: HourlyRow; index: number }[] = [];
  f.hourly.forEach((row, index) => {
    if (localParts(row.time)?.date === date) out.push({ row, index });
  });
  return out;
}

/** The day to open the hourly flow chart on: the day of the first cutoff, else of the lowest SOC. */
export function defaultDay(f: Forecast): string {
  const at = f.summary.firstCutoffAt ?? f.summary.minSocAt;
  return localParts(at)?.date ?? f.days[0]?.date ?? '';
}
