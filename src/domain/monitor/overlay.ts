import type { Forecast } from '../../engine';

// Measured state of charge against a saved forecast, hour by hour: the reading nearest each
// forecast row's end (where the forecast's SOC is), within a tolerance. Pure.

export interface SocReading {
  t: number;
  socPct: number | null;
}

export interface Overlay {
  /** Index 0 is the forecast's start, index i + 1 the end of row i (as the SOC chart's x); null without a reading. */
  measured: (number | null)[];
  matched: number;
  /** Mean of measured − forecast over the matched hours (negative: the bank ran lower than forecast). */
  meanDiffPct: number | null;
  /** The largest shortfall (forecast − measured) and the row it ends. */
  worst: { row: number; diffPct: number } | null;
  /** The lowest measured SOC and the row it ends. */
  measuredMin: { row: number; socPct: number } | null;
}

/** Start instant of a forecast's first row (its `time` carries the stop's offset). */
export function forecastStartMs(f: Forecast): number {
  const first = f.hourly[0];
  return first ? Date.parse(first.time) : NaN;
}

/** Aligns measured SOC with a forecast's rows; `readings` sorted by time. */
export function overlaySoc(f: Forecast, readings: SocReading[], toleranceMs = 30 * 60_000): Overlay {
  const start = forecastStartMs(f);
  const pts = readings.filter((r) => r.socPct !== null);
  const n = f.hourly.length;
  const measured: (number | null)[] = new Array(n + 1).fill(null);
  let j = 0;
  for (let x = 0; x <= n; x++) {
    const at = start + x * 3_600_000;
    for (let next = pts[j + 1]; next && next.t <= at; next = pts[j + 1]) j++;
    let best: SocReading | null = null;
    for (const k of [j, j + 1]) {
      const p = pts[k];
      if (p && Math.abs(p.t - at) <= toleranceMs && (!best || Math.abs(p.t - at) < Math.abs(best.t - at))) best = p;
    }
    measured[x] = best ? (best.socPct as number) : null;
  }
  let sum = 0;
  let matched = 0;
  let worst: Overlay['worst'] = null;
  let measuredMin: Overlay['measuredMin'] = null;
  for (let x = 1; x <= n; x++) {
    const m = measured[x];
    const row = f.hourly[x - 1];
    if (m === null || m === undefined || !row) continue;
    const fc = row.socPct;
    sum += m - fc;
    matched++;
    if (!worst || fc - m > worst.diffPct) worst = { row: x - 1, diffPct: Math.round((fc - m) * 10) / 10 };
    if (!measuredMin || m < measuredMin.socPct) measuredMin = { row: x - 1, socPct: m };
  }
  return { measured, matched, meanDiffPct: matched ? Math.round((sum / matched) * 10) / 10 : null, worst: matched ? worst : null, measuredMin };
}
