// Chemistry presets and the small pieces of arithmetic the rig editor offers. Pure and
// unit-tested. Values are common practice (forecast-engine.md defaults table and the trade notes):
// typical figures to start from, each one the user's to check against the battery's label.
import { CHEMISTRY_DEFAULTS, type Chemistry } from '../../engine/light';

export interface ChemistryPreset {
  nominalVolts: number;
  floorSocPct: number;
  /** Low-voltage cutoff for a bank of the preset's nominal volts; scaled with the bank's volts. */
  cutoffVolts: number;
  peukertExponent: number;
  chargeEfficiencyPct: number;
  /** Max charge current as a fraction of capacity (C-rate). */
  maxChargeC: number;
  internalResistanceMilliohm: number;
  why: string;
}

/**
 * Cutoffs: a LiFePO4 BMS disconnects near 2.5 V per cell (10.0 V on a 12.8 V bank); lead-acid rigs
 * usually stop at the inverter's 10.5 V default, where furnace and fridge boards also drop out.
 */
export const CHEMISTRY_PRESETS: Record<Chemistry, ChemistryPreset> = {
  lifepo4: { ...CHEMISTRY_DEFAULTS.lifepo4, cutoffVolts: 10.0, why: 'Can run near empty (the BMS protects it); must not be charged below freezing.' },
  agm: { ...CHEMISTRY_DEFAULTS.agm, cutoffVolts: 10.5, why: 'Plan on half the rated Ah; the last 20 % charges slowly.' },
  flooded: { ...CHEMISTRY_DEFAULTS.flooded, cutoffVolts: 10.5, why: 'Plan on half the rated Ah; check water levels; charges least efficiently.' },
  gel: { ...CHEMISTRY_DEFAULTS.gel, cutoffVolts: 10.5, why: 'Plan on half the rated Ah; charge gently (lower charge current).' },
};

function round(n: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(n * f) / f;
}

/** The typical bank values of a chemistry, for a bank of `capacityAh` at `nominalVolts`. */
export function presetBank(chemistry: Chemistry, opts: { capacityAh?: number; nominalVolts?: number } = {}) {
  const p = CHEMISTRY_PRESETS[chemistry];
  const volts = opts.nominalVolts && opts.nominalVolts > 0 ? opts.nominalVolts : p.nominalVolts;
  const cap = opts.capacityAh && opts.capacityAh > 0 ? opts.capacityAh : undefined;
  return {
    nominalVolts: volts,
    floorSocPct: p.floorSocPct,
    cutoffVolts: round((p.cutoffVolts * volts) / p.nominalVolts, 1),
    peukertExponent: p.peukertExponent,
    chargeEfficiencyPct: p.chargeEfficiencyPct,
    internalResistanceMilliohm: p.internalResistanceMilliohm,
    maxChargeAmps: cap === undefined ? undefined : maxChargeAmpsFor(chemistry, cap),
  };
}

/** Typical max charge current: the chemistry's C-rate times capacity, whole amps. */
export function maxChargeAmpsFor(chemistry: Chemistry, capacityAh: number): number {
  return Math.max(1, Math.round(CHEMISTRY_PRESETS[chemistry].maxChargeC * capacityAh));
}

export interface SeriesParallelInput {
  batteryVolts: number;
  batteryAh: number;
  inSeries: number;
  parallelStrings: number;
}

/**
 * Batteries in series add volts; strings in parallel add amp-hours. Two 6 V 225 Ah in series make
 * 12 V 225 Ah; two such strings in parallel make 12 V 450 Ah. Returns null on input that makes no bank.
 */
export function seriesParallel(i: SeriesParallelInput): { nominalVolts: number; capacityAh: number; batteries: number } | null {
  const ok = (n: number) => Number.isFinite(n) && n > 0;
  if (!ok(i.batteryVolts) || !ok(i.batteryAh) || !Number.isInteger(i.inSeries) || !Number.isInteger(i.parallelStrings) || i.inSeries < 1 || i.parallelStrings < 1) {
    return null;
  }
  return {
    nominalVolts: round(i.batteryVolts * i.inSeries, 2),
    capacityAh: round(i.batteryAh * i.parallelStrings, 2),
    batteries: i.inSeries * i.parallelStrings,
  };
}

export type Mounting = 'flat' | 'tilted' | 'portable';

export const MOUNTINGS: { value: Mounting; label: string; hint: string }[] = [
  { value: 'flat', label: 'Flat on the roof', hint: 'Lies flat (tilt 0°). The common roof mount.' },
  { value: 'tilted', label: 'Tilted, fixed', hint: 'Propped at an angle toward one direction.' },
  { value: 'portable', label: 'Portable, re-aimed at the sun', hint: 'You turn it to face the sun through the day.' },
];

/** The mounting a stored array describes. */
export function mountingOf(a: { tiltDeg?: number; aim?: 'fixed' | 'follow' }): Mounting {
  if (a.aim === 'follow') return 'portable';
  return (a.tiltDeg ?? 0) > 0 ? 'tilted' : 'flat';
}

/** The tilt, facing and aim that a mounting choice sets (keeping a tilt the user already gave). */
export function applyMounting(m: Mounting, current: { tiltDeg?: number; azimuthDeg?: number }): { tiltDeg: number; azimuthDeg: number; aim: 'fixed' | 'follow' } {
  const tilt = current.tiltDeg && current.tiltDeg > 0 ? current.tiltDeg : 30;
  switch (m) {
    case 'flat':
      return { tiltDeg: 0, azimuthDeg: 180, aim: 'fixed' };
    case 'tilted':
      return { tiltDeg: tilt, azimuthDeg: current.azimuthDeg ?? 180, aim: 'fixed' };
    case 'portable':
      return { tiltDeg: tilt, azimuthDeg: current.azimuthDeg ?? 180, aim: 'follow' };
  }
}

export const COMPASS = [
  { label: 'North', deg: 0 },
  { label: 'North-east', deg: 45 },
  { label: 'East', deg: 90 },
  { label: 'South-east', deg: 135 },
  { label: 'South', deg: 180 },
  { label: 'South-west', deg: 225 },
  { label: 'West', deg: 270 },
  { label: 'North-west', deg: 315 },
] as const;

/** Keeps the bank's voltage class when the chemistry changes: a 25.6 V LiFePO4 bank becomes a 24 V AGM bank. */
export function nominalForChemistry(chemistry: Chemistry, currentNominal?: number): number {
  const base = CHEMISTRY_PRESETS[chemistry].nominalVolts;
  if (!currentNominal || !Number.isFinite(currentNominal) || currentNominal <= 0) return base;
  const voltageClass = Math.max(1, Math.round(currentNominal / 12));
  return round(base * voltageClass, 2);
}
