// A load's draw entered in amps or watts: amps at the bank's nominal volts for a DC load, at the
// AC outlet's volts (120 or 230 V, the camper picks) for a load through the inverter. The app
// stores watts; this module converts both ways so forms and the load table can show both. Pure,
// no zod (the load table imports it).

/** How a draw is typed in the load form. */
export const DRAW_UNITS = ['W', 'A'] as const;
export type DrawUnit = (typeof DRAW_UNITS)[number];

/** AC outlet voltages a camper can pick: North American and European/Australian rigs. */
export const AC_VOLTS = [120, 230] as const;
export type AcVolts = (typeof AC_VOLTS)[number];

/** The volts that turn a load's amps into watts: the bank's nominal volts (DC) or the outlet's (AC). */
export function drawVolts(supply: 'dc' | 'ac' | undefined, nominalVolts: number, acVolts: AcVolts): number {
  return supply === 'ac' ? acVolts : nominalVolts;
}

/** Watts from amps: P = V × I at the load's own volts. */
export function ampsToWatts(amps: number, supply: 'dc' | 'ac' | undefined, nominalVolts: number, acVolts: AcVolts): number {
  return amps * drawVolts(supply, nominalVolts, acVolts);
}

/** Amps from watts at the load's own volts (0 when the volts are not positive). */
export function wattsToAmps(watts: number, supply: 'dc' | 'ac' | undefined, nominalVolts: number, acVolts: AcVolts): number {
  const v = drawVolts(supply, nominalVolts, acVolts);
  return v > 0 ? watts / v : 0;
}

/**
 * Amps an AC load takes from the bank at its nominal volts: its watts through the inverter's
 * efficiency (what a camper sees on the battery monitor while it runs; an estimate).
 */
export function bankAmpsOfAc(watts: number, nominalVolts: number, inverterEfficiencyPct: number): number {
  if (!(nominalVolts > 0) || !(inverterEfficiencyPct > 0)) return 0;
  return watts / (inverterEfficiencyPct / 100) / nominalVolts;
}

/** Watts rounded for storage: a tenth of a watt is finer than any label. */
export function roundWatts(w: number): number {
  return Math.round(w * 10) / 10;
}
