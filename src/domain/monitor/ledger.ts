import type { DayAh } from './baseline';

// The log's day ledger: each local day's energy into and out of the bank (the measured amp-hours
// at the bank's nominal volts), beside what a saved forecast of the same dates expected. Pure.

export interface LedgerDay {
  date: string;
  inWh: number;
  outWh: number;
  /** in − out. */
  netWh: number;
  hoursCovered: number;
  /** The forecast's energy in and out that day (in = its net + its load), when a forecast covers the day. */
  forecast: { inWh: number; outWh: number } | null;
}

/** A forecast day as the ledger needs it (the engine's DayRow has these). */
export interface ForecastDay {
  date: string;
  loadWh: number;
  netWh: number;
}

const r0 = (x: number) => Math.round(x);

export function dayLedger(days: DayAh[], nominalVolts: number, forecastDays: ForecastDay[] | null): { days: LedgerDay[]; maxWh: number } {
  const byDate = new Map((forecastDays ?? []).map((d) => [d.date, d]));
  const out = days.map((d) => {
    const f = byDate.get(d.date);
    return {
      date: d.date,
      inWh: r0(d.chargedAh * nominalVolts),
      outWh: r0(d.consumedAh * nominalVolts),
      netWh: r0((d.chargedAh - d.consumedAh) * nominalVolts),
      hoursCovered: d.hoursCovered,
      forecast: f ? { inWh: r0(f.netWh + f.loadWh), outWh: r0(f.loadWh) } : null,
    };
  });
  const maxWh = Math.max(1, ...out.flatMap((d) => [d.inWh, d.outWh, d.forecast?.inWh ?? 0, d.forecast?.outWh ?? 0]));
  return { days: out, maxWh };
}
