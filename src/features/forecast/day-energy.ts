// What the daily energy chart draws: each day's demand (loads served plus loads the bank could not
// serve) against its charging, so a day the bank spends cut off looks as bad as it is.
import type { Forecast } from '../../engine';
import { localParts } from '../../lib/format';

/** One day's bars, in Wh. */
export interface DayEnergy {
  date: string;
  /** What the loads drew from the bank and chargers (`loadWh`). */
  servedWh: number;
  /** What the loads wanted but did not get while the bank was disconnected. */
  unmetWh: number;
  /** servedWh + unmetWh: what the plan asked of the rig that day. */
  demandWh: number;
  solarWh: number;
  chargeWh: number;
  /** The day's net against what was served (`netWh`: solar + charging − served), from unrounded sums. */
  netWh: number;
}

/**
 * Each day's served, unmet and total demand. The engine's day rows carry `unmetWh` (summed from
 * unrounded hours); a snapshot saved before that field existed gets it summed from its hours'
 * `unmetWatts` (each row is one hour, so its watts are its Wh), by the row's own local date.
 */
export function dayEnergy(f: Forecast): DayEnergy[] {
  let fromHours: Map<string, number> | null = null;
  if (f.days.some((d) => typeof d.unmetWh !== 'number')) {
    fromHours = new Map();
    for (const r of f.hourly) {
      const date = localParts(r.time)?.date;
      if (!date) continue;
      fromHours.set(date, (fromHours.get(date) ?? 0) + (r.unmetWatts ?? 0));
    }
  }
  return f.days.map((d) => {
    const unmet = typeof d.unmetWh === 'number' ? d.unmetWh : (fromHours?.get(d.date) ?? 0);
    return {
      date: d.date,
      servedWh: d.loadWh,
      unmetWh: unmet,
      demandWh: d.loadWh + unmet,
      solarWh: d.solarWh,
      chargeWh: d.chargeWh,
      netWh: d.netWh,
    };
  });
}

/** Days with any unmet load, for the chart's words: "Fri 22 Oct: 2,310 Wh not served". */
export function unmetDays(f: Forecast): DayEnergy[] {
  return dayEnergy(f).filter((d) => d.unmetWh >= 1);
}
