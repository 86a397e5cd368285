import { ocvVolts } from '../../engine/light';
import type { Chemistry } from '../../engine';

// A resting voltage turned into a state of charge through the chemistry's open-circuit table —
// the engine's own table (forecast-engine.md, "Precise rules"), read backwards, so a check-in and
// a forecast never disagree about what a voltage means. Pure.

export type OcvResult =
  | {
      ok: true;
      socPct: number;
      /** The SOC range a ±0.02 V meter error spans: wide where the curve is flat (LiFePO4). */
      rangePct: [number, number];
      note: string | null;
    }
  | { ok: false; message: string };

/** How far off a good handheld meter or monitor can be, volts (common practice). */
export const METER_TOLERANCE_V = 0.02;

/** SOC (%) at a resting voltage: the table read backwards by bisection, clamped to 0–100. */
export function socAtVolts(chem: Chemistry, nominalVolts: number, volts: number): number {
  const lo = ocvVolts(chem, 0, nominalVolts);
  const hi = ocvVolts(chem, 1, nominalVolts);
  if (volts <= lo) return 0;
  if (volts >= hi) return 100;
  let a = 0;
  let b = 1;
  for (let i = 0; i < 40; i++) {
    const m = (a + b) / 2;
    if (ocvVolts(chem, m, nominalVolts) < volts) a = m;
    else b = m;
  }
  return ((a + b) / 2) * 100;
}

const round1 = (x: number) => Math.round(x * 10) / 10 + 0;

/** The SOC a resting voltage means for this bank, or why the reading cannot be one of this bank. */
export function socFromRestingVolts(chem: Chemistry, nominalVolts: number, volts: number): OcvResult {
  if (!Number.isFinite(volts)) return { ok: false, message: 'Enter the resting voltage in volts, e.g. 12.6.' };
  const [min, max] = [0.6 * nominalVolts, 1.3 * nominalVolts];
  if (volts < min || volts > max) {
    return { ok: false, message: `${volts} V cannot be the resting voltage of this ${round1(nominalVolts)} V bank; a reading between ${round1(min)} and ${round1(max)} V is expected.` };
  }
  const empty = ocvVolts(chem, 0, nominalVolts);
  const full = ocvVolts(chem, 1, nominalVolts);
  const soc = socAtVolts(chem, nominalVolts, volts);
  const range: [number, number] = [round1(socAtVolts(chem, nominalVolts, volts - METER_TOLERANCE_V)), round1(socAtVolts(chem, nominalVolts, volts + METER_TOLERANCE_V))];
  let note: string | null = null;
  if (volts > full) note = `Above ${full.toFixed(2)} V, the table’s full charge: the bank may still hold surface charge from charging. Let it rest idle for a few hours, then read it again.`;
  else if (volts < empty) note = `Below ${empty.toFixed(2)} V, the table’s empty: the bank reads as 0 %. Check the reading with the loads off.`;
  else if (range[1] - range[0] >= 8) note = `The voltage is flat here: ±${METER_TOLERANCE_V.toFixed(2)} V means anything from ${range[0]} % to ${range[1]} %. A battery monitor’s SOC is better than a voltage for this bank.`;
  return { ok: true, socPct: round1(soc), rangePct: range, note };
}

/** What the form says about taking a resting reading, by chemistry. */
export function restingAdvice(chem: Chemistry): string {
  return chem === 'lifepo4'
    ? 'LiFePO4 voltage stays almost flat between about 20 % and 90 %, so a voltage says little: use the SOC your battery monitor or BMS shows when you can. A voltage reading needs the bank idle (no charging, loads off) for at least 30 minutes.'
    : 'A resting voltage needs the bank idle — no charging and the loads off — for a few hours (4 or more for lead-acid); a reading under load or right after charging reads wrong.';
}
