// Daily energy of a load list, as the loads table shows it: an ESTIMATE before temperature
// response (a fridge's cooling duty rises in heat, a furnace blower's heating duty with cold, and
// only the forecast knows the hour's temperature). Pure and unit-tested.
import { coveredHours, hoursInWindows } from './windows';

export interface EnergyLoad {
  watts: number;
  quantity?: number;
  supply?: 'dc' | 'ac';
  windows?: readonly (readonly [number, number])[];
  dutyPct?: number;
  days?: 'all' | 'camp' | 'drive';
}

export interface EnergyRig {
  nominalVolts: number;
  inverter: { efficiencyPct?: number; idleWatts?: number; alwaysOn?: boolean } | null;
}

/** Inverter efficiency the engine assumes when a rig has none set (forecast-engine.md defaults). */
export const DEFAULT_INVERTER_EFFICIENCY_PCT = 90;

const n = (v: number | undefined, d: number) => (typeof v === 'number' && Number.isFinite(v) ? v : d);

/**
 * Wh a load takes from the bank on a day it runs: watts × quantity × hours in its windows × duty,
 * AC loads divided by the inverter's efficiency.
 */
export function loadWhPerDay(load: EnergyLoad, rig: Pick<EnergyRig, 'inverter'>): number {
  const hours = hoursInWindows(load.windows ?? [[0, 24]]);
  const wh = n(load.watts, 0) * n(load.quantity, 1) * hours * (n(load.dutyPct, 100) / 100);
  if (load.supply !== 'ac') return wh;
  const eff = n(rig.inverter?.efficiencyPct, DEFAULT_INVERTER_EFFICIENCY_PCT) / 100;
  return eff > 0 ? wh / eff : wh;
}

/** Wh → Ah at the bank's nominal volts. */
export function whToAh(wh: number, nominalVolts: number): number {
  return nominalVolts > 0 ? wh / nominalVolts : 0;
}

const runsOn = (l: EnergyLoad, day: 'camp' | 'drive') => (l.days ?? 'all') === 'all' || l.days === day;

/**
 * The inverter's own idle draw on a day: its idle watts in every hour some AC load is scheduled
 * (or all day when it is left on).
 */
export function inverterIdleWhPerDay(loads: readonly EnergyLoad[], rig: EnergyRig, day: 'camp' | 'drive' = 'camp'): number {
  if (!rig.inverter) return 0;
  const idle = n(rig.inverter.idleWatts, 12);
  if (rig.inverter.alwaysOn) return idle * 24;
  const on = new Array<boolean>(24).fill(false);
  for (const l of loads) {
    if (l.supply !== 'ac' || !runsOn(l, day) || n(l.watts, 0) * n(l.quantity, 1) * n(l.dutyPct, 100) <= 0) continue;
    coveredHours(l.windows ?? [[0, 24]]).forEach((v, h) => {
      if (v) on[h] = true;
    });
  }
  return idle * on.filter(Boolean).length;
}

export interface DayTotal {
  loadsWh: number;
  inverterIdleWh: number;
  wh: number;
  ah: number;
}

/** Totals of a camp day and a drive day: the loads that run on that kind of day plus the inverter's idle draw. */
export function dailyTotals(loads: readonly EnergyLoad[], rig: EnergyRig): { camp: DayTotal; drive: DayTotal } {
  const total = (day: 'camp' | 'drive'): DayTotal => {
    const loadsWh = loads.filter((l) => runsOn(l, day)).reduce((s, l) => s + loadWhPerDay(l, rig), 0);
    const inverterIdleWh = inverterIdleWhPerDay(loads, rig, day);
    const wh = loadsWh + inverterIdleWh;
    return { loadsWh, inverterIdleWh, wh, ah: whToAh(wh, rig.nominalVolts) };
  };
  return { camp: total('camp'), drive: total('drive') };
}
