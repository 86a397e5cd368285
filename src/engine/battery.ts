// The battery bank (forecast-engine.md step 13 and "Chargers and battery"): coulomb counting
// in Ah at nominal volts, Peukert on discharge, charge efficiency and acceptance with taper,
// cold capacity, the LiFePO4 cold lockout and open-circuit voltage tables.
import type { Chemistry } from './schema';

/** True for the lead-acid family (flooded, AGM, gel). */
export function isLeadAcid(chem: Chemistry): boolean {
  return chem !== 'lifepo4';
}

/**
 * Peukert multiplier on the Ah removed at current I (Peukert 1897, Elektrotechnische Zeitschrift
 * 20:20): max(1, (I/I20)^(k−1)) with I20 = C/20, so currents below the 20-hour rate cost no more.
 */
export function peukertFactor(currentA: number, capacityAh: number, k: number): number {
  const i20 = capacityAh / 20;
  if (!(currentA > i20) || !(i20 > 0) || k === 1) return 1;
  return Math.pow(currentA / i20, k - 1);
}

/** Ah removed from the bank by `currentA` flowing for `hours`, Peukert-adjusted. */
export function peukertAh(currentA: number, capacityAh: number, k: number, hours = 1): number {
  return currentA * peukertFactor(currentA, capacityAh, k) * hours;
}

/**
 * Cold capacity factor f: SOC moves by Ah/(C·f), f = max(0.3, 1 − k·max(0, 25 − T)), k = 0.008
 * LiFePO4, 0.012 lead-acid (common practice: ~80 % at 0 °C LiFePO4, ~40 % near −18 °C lead-acid).
 */
export function capacityFactor(chem: Chemistry, batteryC: number): number {
  const k = isLeadAcid(chem) ? 0.012 : 0.008;
  return Math.max(0.3, 1 - k * Math.max(0, 25 - batteryC));
}

/**
 * Charge-acceptance taper (common practice): full up to 95 % SOC (LiFePO4) or 80 % (lead-acid),
 * then linear to zero at 100 %. `soc` is a fraction 0..1, taken at the hour's start.
 */
export function taperFactor(chem: Chemistry, soc: number): number {
  const knee = isLeadAcid(chem) ? 0.8 : 0.95;
  if (soc <= knee) return 1;
  return Math.max(0, (1 - soc) / (1 - knee));
}

/** LiFePO4 takes no charge below 0 °C unless the bank heats itself (common practice; cell datasheets). */
export function coldChargeBlocked(chem: Chemistry, batteryC: number, selfHeating: boolean): boolean {
  return chem === 'lifepo4' && batteryC < 0 && !selfHeating;
}

// Open-circuit voltage vs SOC (%), common practice, for a 12.8 V LiFePO4 or 12 V lead-acid bank.
const OCV: Record<Chemistry, { soc: number[]; v: number[]; base: number }> = {
  lifepo4: { soc: [0, 9, 14, 20, 40, 70, 90, 99, 100], v: [10.0, 12.5, 12.8, 13.0, 13.13, 13.25, 13.33, 13.45, 13.6], base: 12.8 },
  flooded: { soc: [0, 25, 50, 75, 100], v: [11.8, 12.0, 12.2, 12.4, 12.7], base: 12 },
  agm: { soc: [0, 25, 50, 75, 100], v: [11.8, 12.0, 12.3, 12.6, 12.8], base: 12 },
  gel: { soc: [0, 25, 50, 75, 100], v: [11.8, 12.0, 12.3, 12.6, 12.8], base: 12 },
};

/** Open-circuit volts at `soc` (fraction), linear between table points, scaled by nominal/12.8 or nominal/12. */
export function ocvVolts(chem: Chemistry, soc: number, nominalVolts: number): number {
  const t = OCV[chem];
  const pct = Math.min(100, Math.max(0, soc * 100));
  let i = 1;
  while (i < t.soc.length - 1 && pct > t.soc[i]) i++;
  const s0 = t.soc[i - 1];
  const s1 = t.soc[i];
  const v = t.v[i - 1] + ((t.v[i] - t.v[i - 1]) * (pct - s0)) / (s1 - s0);
  return (v * nominalVolts) / t.base;
}

/** Terminal volts: OCV(SOC) + I·R, with I the hour's average net current (positive charging). */
export function terminalVolts(chem: Chemistry, soc: number, nominalVolts: number, netCurrentA: number, internalResistanceMilliohm: number): number {
  return ocvVolts(chem, soc, nominalVolts) + (netCurrentA * internalResistanceMilliohm) / 1000;
}
