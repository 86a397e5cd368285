// The battery bank (forecast-engine.md step 13, "Chargers and battery" and "Revision 2"): charge
// Q in Ah conserved, usable charge in the cold, Peukert on discharge, charge efficiency and
// acceptance with taper (exact inside a sub-step), cold acceptance for lead-acid, the LiFePO4 cold
// lockout, open-circuit voltage tables, current from power at terminal volts, thermal lag.
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
  // exp((k − 1)·ln(I/I20)) = (I/I20)^(k−1), a few times faster than Math.pow in the sub-step loop.
  return Math.exp((k - 1) * Math.log(currentA / i20));
}

/** Ah removed from the bank by `currentA` flowing for `hours`, Peukert-adjusted. */
export function peukertAh(currentA: number, capacityAh: number, k: number, hours = 1): number {
  return currentA * peukertFactor(currentA, capacityAh, k) * hours;
}

/**
 * Cold capacity factor f (Revision 2: the bottom C·(1 − f) Ah cannot be drawn; first model: SOC moved by Ah/(C·f)), f = max(0.3, 1 − k·max(0, 25 − T)), k = 0.008
 * LiFePO4, 0.012 lead-acid (common practice: ~80 % at 0 °C LiFePO4, ~40 % near −18 °C lead-acid).
 */
export function capacityFactor(chem: Chemistry, batteryC: number): number {
  const k = isLeadAcid(chem) ? 0.012 : 0.008;
  return Math.max(0.3, 1 - k * Math.max(0, 25 - batteryC));
}

/** SOC (fraction) where the charge taper starts: 95 % LiFePO4, 80 % lead-acid (common practice). */
export function taperKnee(chem: Chemistry): number {
  return isLeadAcid(chem) ? 0.8 : 0.95;
}

/**
 * Charge-acceptance taper (common practice): full up to 95 % SOC (LiFePO4) or 80 % (lead-acid),
 * then linear to zero at 100 %. `soc` is a fraction 0..1 (Revision 2: at each sub-step's SOC).
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

/**
 * One bank's open-circuit curve against SOC as a fraction (the same table and scaling as
 * `ocvVolts`): breakpoints pre-scaled, slopes pre-computed, for `ocvAtSoc` in the hour loop.
 */
export interface OcvCurve {
  xs: Float64Array;
  vs: Float64Array;
  slopes: Float64Array;
}

export function ocvCurve(chem: Chemistry, nominalVolts: number): OcvCurve {
  const t = OCV[chem];
  const k = nominalVolts / t.base;
  const xs = Float64Array.from(t.soc, (p) => p / 100);
  const vs = Float64Array.from(t.v, (v) => v * k);
  const slopes = xs.slice(1).map((x, i) => ((vs[i + 1] ?? 0) - (vs[i] ?? 0)) / (x - (xs[i] ?? 0)));
  return { xs, vs, slopes };
}

/** Open-circuit volts at `soc` (fraction) on a bank's curve. A plain function, so the hour loop inlines it. */
export function ocvAtSoc(c: OcvCurve, soc: number): number {
  const { xs, vs, slopes } = c;
  const m = xs.length;
  const x = soc < 0 ? 0 : soc > 1 ? 1 : soc;
  let i = 1;
  while (i < m - 1 && x > (xs[i] ?? 1)) i++;
  return (vs[i - 1] ?? 0) + (slopes[i - 1] ?? 0) * (x - (xs[i - 1] ?? 0));
}

/** The open-circuit table of one bank, scaled and in charge units, for a segment-tracking lookup. */
export interface OcvTable {
  /** Breakpoints in Ah, ascending (0 … C). */
  qs: Float64Array;
  /** Volts at the breakpoints. */
  vs: Float64Array;
  /** Volts per Ah of each segment. */
  slopes: Float64Array;
}

/** Builds the OCV table of a bank (the same table and scaling as `ocvVolts`) in Ah. */
export function ocvTable(chem: Chemistry, nominalVolts: number, capacityAh: number): OcvTable {
  const t = OCV[chem];
  const k = nominalVolts / t.base;
  const qs = Float64Array.from(t.soc, (p) => (p / 100) * capacityAh);
  const vs = Float64Array.from(t.v, (v) => v * k);
  const slopes = new Float64Array(qs.length - 1);
  for (let i = 0; i < slopes.length; i++) slopes[i] = (vs[i + 1]! - vs[i]!) / (qs[i + 1]! - qs[i]!);
  return { qs, vs, slopes };
}

/** Open-circuit volts at `soc` (fraction), linear between table points, scaled by nominal/12.8 or nominal/12. */
export function ocvVolts(chem: Chemistry, soc: number, nominalVolts: number): number {
  const t = OCV[chem];
  const pct = Math.min(100, Math.max(0, soc * 100));
  let i = 1;
  while (i < t.soc.length - 1 && pct > (t.soc[i] ?? 100)) i++;
  const s0 = t.soc[i - 1] ?? 0;
  const s1 = t.soc[i] ?? 100;
  const v0 = t.v[i - 1] ?? 0;
  const v1 = t.v[i] ?? 0;
  const v = v0 + ((v1 - v0) * (pct - s0)) / (s1 - s0);
  return (v * nominalVolts) / t.base;
}

/** Terminal volts: OCV(SOC) + I·R, with I the hour's average net current (positive charging). */
export function terminalVolts(chem: Chemistry, soc: number, nominalVolts: number, netCurrentA: number, internalResistanceMilliohm: number): number {
  return ocvVolts(chem, soc, nominalVolts) + (netCurrentA * internalResistanceMilliohm) / 1000;
}

/** Internal resistance of a bank in ohms from milliohms per 100 Ah: R = R100 × 100 / C (Revision 2). */
export function bankResistanceOhms(milliohmPer100Ah: number, capacityAh: number): number {
  return (milliohmPer100Ah / 1000) * (100 / capacityAh);
}

/** Ah at the bottom of a bank that the cold keeps from being drawn: C·(1 − f(Tb)) (Revision 2). */
export function strandedAh(chem: Chemistry, capacityAh: number, batteryC: number): number {
  return capacityAh * (1 - capacityFactor(chem, batteryC));
}

/** Usable charge, % of rated: 100·max(0, Q − C·(1 − f(Tb)))/C (Revision 2). */
export function usablePct(chem: Chemistry, chargeAh: number, capacityAh: number, batteryC: number): number {
  return (100 * Math.max(0, chargeAh - strandedAh(chem, capacityAh, batteryC))) / capacityAh;
}

/**
 * Bank current (A, positive discharging) on a bus with loads minus MPPT solar `netPowerW`
 * (= Pload − Pmppt) and current sources `sourceA` (chargers, PWM), solving
 * (I + Isrc)·(OCV − I·R) = Pload − Pmppt (Revision 2). Null when no real I exists (voltage collapse).
 * With Isrc = 0: discharge I = (OCV − √(OCV² − 4RP))/(2R), charge I = −(√(OCV² + 4RP) − OCV)/(2R).
 */
export function busCurrent(ocv: number, ohms: number, sourceA: number, netPowerW: number): number | null {
  const i = busCurrentOrNaN(ocv, ohms, sourceA, netPowerW);
  return Number.isNaN(i) ? null : i;
}

/** `busCurrent` with NaN for a voltage collapse (no allocation in the sub-step loop). */
export function busCurrentOrNaN(ocv: number, ohms: number, sourceA: number, netPowerW: number): number {
  // R·I² − b·I + c = 0 with b = OCV − Isrc·R, c = D − Isrc·OCV; the root near D/OCV − Isrc, in the
  // form 2c/(b + √(b² − 4Rc)) that stays exact as R → 0.
  const b = ocv - sourceA * ohms;
  const c = netPowerW - sourceA * ocv;
  const disc = b * b - 4 * ohms * c;
  if (disc < 0) return NaN;
  const den = b + Math.sqrt(disc);
  if (!(den > 0)) return NaN;
  return (2 * c) / den;
}

/** Discharge current for `watts` at the terminals: (OCV − √(OCV² − 4RP))/(2R); null on collapse (Revision 2). */
export function dischargeCurrent(ocv: number, ohms: number, watts: number): number | null {
  return busCurrent(ocv, ohms, 0, watts);
}

/** Charge current for `watts` into the terminals: (√(OCV² + 4RP) − OCV)/(2R) (Revision 2). */
export function chargeCurrent(ocv: number, ohms: number, watts: number): number {
  return -(busCurrent(ocv, ohms, 0, -watts) ?? 0);
}

/**
 * Charge after charging for `hours` at the acceptance limit (the source is strong enough
 * throughout): dQ/dt = η·Imax·g(Q), g = 1 below the knee and (1 − Q/C)/(1 − knee) above, solved
 * exactly — linear to the knee, then 1 − Q/C = (1 − Q₀/C)·exp(−t·Imax·η/(C·(1 − knee))) (Revision 2).
 */
export function taperedChargeAh(chargeAh: number, capacityAh: number, maxAmps: number, eta: number, knee: number, hours: number): number {
  if (!(maxAmps > 0) || !(hours > 0)) return chargeAh;
  const kneeAh = knee * capacityAh;
  let q = chargeAh;
  let t = hours;
  if (q < kneeAh) {
    const toKnee = (kneeAh - q) / (eta * maxAmps);
    if (toKnee >= t) return q + eta * maxAmps * t;
    q = kneeAh;
    t -= toKnee;
  }
  if (knee >= 1) return Math.min(q, capacityAh);
  const rate = (eta * maxAmps) / (capacityAh * (1 - knee));
  return capacityAh - (capacityAh - q) * Math.exp(-t * rate);
}

/** Charge acceptance in amps at `soc`: max amps × taper, × f(Tb) for lead-acid, 0 when the LiFePO4 lockout applies (Revision 2). */
export function acceptanceAmps(chem: Chemistry, soc: number, maxChargeAmps: number, batteryC: number, selfHeating: boolean): number {
  if (coldChargeBlocked(chem, batteryC, selfHeating)) return 0;
  const cold = isLeadAcid(chem) ? capacityFactor(chem, batteryC) : 1;
  return maxChargeAmps * taperFactor(chem, soc) * cold;
}

/** Battery temperature after an hour: Tb + (Tsur − Tb)·(1 − e^(−1/τ)); τ = 0 follows at once (Revision 2). */
export function thermalStep(batteryC: number, surroundingsC: number, thermalHours: number): number {
  const alpha = thermalHours > 0 ? 1 - Math.exp(-1 / thermalHours) : 1;
  return batteryC + (surroundingsC - batteryC) * alpha;
}
