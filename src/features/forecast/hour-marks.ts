// Which hours the charts mark (drive hours, hours the bank is cut off) and why solar went unused,
// in the words the charts and cards use.
import type { Forecast, HourlyRow } from '../../engine';
import { formatWh } from '../../lib/format';

/** A stretch of hours [x1, x2) in the positions of the rows given. */
export interface HourBand {
  x1: number;
  x2: number;
}

/** Consecutive rows for which `pick` holds, merged into bands of row positions. */
export function hourBands(rows: HourlyRow[], pick: (r: HourlyRow) => boolean): HourBand[] {
  const bands: HourBand[] = [];
  rows.forEach((r, i) => {
    if (!pick(r)) return;
    const last = bands[bands.length - 1];
    if (last && last.x2 === i) last.x2 = i + 1;
    else bands.push({ x1: i, x2: i + 1 });
  });
  return bands;
}

export const isDriving = (r: HourlyRow): boolean => r.driving === true;
export const isCutOff = (r: HourlyRow): boolean => r.disconnected === true;

/** The whole trip's drive hours and cut-off hours, as bands of row positions (the SOC chart's strips). */
export function tripBands(f: Forecast): { drives: HourBand[]; cutOff: HourBand[] } {
  return { drives: hourBands(f.hourly, isDriving), cutOff: hourBands(f.hourly, isCutOff) };
}

/** Strips along the bottom of the SOC chart, in SOC % from the axis: drive hours lowest, cut-off hours above them. */
export const STRIPS = { drive: [0, 3], cutOff: [3, 6] } as const;

/** Why solar went unused, in Wh: the bank was (nearly) full, too cold to charge, or at its charge-current limit. */
export interface UnusedSolar {
  full: number;
  cold: number;
  limit: number;
}

/** A row's unused solar by cause, or null for a snapshot whose rows do not say why (made before the engine did). */
export function unusedSolarOf(r: HourlyRow): UnusedSolar | null {
  if (r.curtailedColdWatts === undefined || r.curtailedFullWatts === undefined || r.curtailedLimitWatts === undefined) return null;
  return { full: r.curtailedFullWatts, cold: r.curtailedColdWatts, limit: r.curtailedLimitWatts };
}

/** Plain names of the causes, as the chart key and the cards say them. */
export const UNUSED_WORDS: Record<keyof UnusedSolar, string> = {
  full: 'bank full',
  cold: 'battery too cold to charge',
  limit: 'above the bank’s charge-current limit',
};

/** The summary's unused solar by cause, or null for a snapshot that does not say why. */
function summaryParts(f: Forecast): UnusedSolar | null {
  const s = f.summary;
  if (s.curtailedColdWh === undefined || s.curtailedFullWh === undefined || s.curtailedLimitWh === undefined) return null;
  return { full: s.curtailedFullWh, cold: s.curtailedColdWh, limit: s.curtailedLimitWh };
}

/** For a table cell: "48 Wh (bank full)", "300 Wh (200 Wh bank full, 100 Wh battery too cold to charge)", "0 Wh". */
export function unusedSolarShort(f: Forecast): string {
  const s = f.summary;
  if (!(s.curtailedWh >= 1)) return '0 Wh';
  const parts = summaryParts(f);
  if (!parts) return `${formatWh(s.curtailedWh)} (bank full or too cold)`;
  const kinds = (['full', 'cold', 'limit'] as const).filter((k) => parts[k] >= 1);
  if (kinds.length === 1) return `${formatWh(s.curtailedWh)} (${UNUSED_WORDS[kinds[0]!]})`;
  return `${formatWh(s.curtailedWh)} (${kinds.map((k) => `${formatWh(parts[k])} ${UNUSED_WORDS[k]}`).join(', ')})`;
}

/** The solar card's line: "1,234 Wh left unused: 1,000 Wh bank full, 234 Wh battery too cold to charge". */
export function unusedSolarSentence(f: Forecast): string {
  const s = f.summary;
  if (!(s.curtailedWh >= 1)) return 'None left unused';
  const parts = summaryParts(f);
  if (!parts) return `${formatWh(s.curtailedWh)} left unused (bank full or too cold: this saved forecast does not say which)`;
  const named = (['full', 'cold', 'limit'] as const).filter((k) => parts[k] >= 1).map((k) => `${formatWh(parts[k])} ${UNUSED_WORDS[k]}`);
  return `${formatWh(s.curtailedWh)} left unused: ${named.join(', ')}`;
}
