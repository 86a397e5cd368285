// What a proposal adds to the chosen option: default cable runs for the parts it adds, their
// checks, the parts list and its total, and the cautions. Pure; the server and the islands share it.
import type { ResolvedPlan } from '../../engine';
import { CAUTIONS } from '../advice/cautions';
import { CABLE_CAUTIONS, checkCable, defaultLowestVolts, type CableResult } from './cable';
import type { CableRow, Changes, Part } from './proposals.schema';

/** A cable run as a proposal keeps it: what the installer entered and what the check gave. */
export interface CheckedCable {
  input: CableRow;
  result: CableResult;
}

/** Amounts in a currency, rounded to cents as invoices are. */
export function cents(x: number): number {
  return Math.round(x * 100) / 100;
}

/** A line's amount: quantity × unit price, to the cent. */
export function lineAmount(p: Pick<Part, 'quantity' | 'unitPrice'>): number {
  return cents(p.quantity * p.unitPrice);
}

/** The parts list's total. */
export function partsTotal(parts: Pick<Part, 'quantity' | 'unitPrice'>[]): number {
  return cents(parts.reduce((t, p) => t + lineAmount(p), 0));
}

/**
 * Cable runs for the parts an option adds, with lengths to measure and edit: the main battery feed
 * when the bank changes, the controller-to-bank run of added panels, the DC-DC charger's output,
 * and a generator's converter/charger. Charging and main feeds are critical circuits (3 %).
 */
export function defaultCables(after: ResolvedPlan, c: Changes): CableRow[] {
  const v = after.bank.nominalVolts;
  const rows: CableRow[] = [];
  if (c.bank) {
    // The main feed carries the larger of the AC loads through the inverter at its lowest voltage and the bank's charge limit.
    const acWatts = after.loads.filter((l) => l.supply === 'ac').reduce((t, l) => t + l.watts * l.quantity, 0);
    const lowest = after.bank.cutoffVolts ?? defaultLowestVolts(v);
    const inverterA = acWatts > 0 ? acWatts / (after.inverter.efficiencyPct / 100) / lowest : 0;
    rows.push(
      inverterA >= after.bank.maxChargeAmps
        ? { label: 'Main battery feed (bank to inverter and DC panel)', source: { kind: 'inverter', watts: Math.round(acWatts), efficiencyPct: after.inverter.efficiencyPct, lowestVolts: Math.round(lowest * 100) / 100 }, oneWayM: 1.5, circuit: 'critical', table: 'abyc-105c', chosenAwg: null }
        : { label: 'Main battery feed (bank to bus bar)', source: { kind: 'current', amps: Math.round(after.bank.maxChargeAmps) }, oneWayM: 1.5, circuit: 'critical', table: 'abyc-105c', chosenAwg: null },
    );
  }
  if (c.panel) {
    rows.push({ label: `Added panels: MPPT controller to bank (${c.panel.watts} W)`, source: { kind: 'current', amps: Math.ceil(c.panel.watts / v) }, oneWayM: 3, circuit: 'critical', table: 'abyc-105c', chosenAwg: null });
  }
  if (c.dcdcAmps !== null) {
    rows.push({ label: `DC-DC charger output to bank (${c.dcdcAmps} A)`, source: { kind: 'charger', amps: c.dcdcAmps }, oneWayM: 1, circuit: 'critical', table: 'abyc-105c', chosenAwg: null });
  }
  if (c.generatorHours !== null) {
    const gen = after.chargers.find((x) => x.kind === 'generator');
    if (gen) rows.push({ label: `Converter/charger to bank (${gen.amps} A)`, source: { kind: 'charger', amps: gen.amps }, oneWayM: 2, circuit: 'critical', table: 'abyc-105c', chosenAwg: null });
  }
  return rows;
}

/** Checks every run against the bank the proposal leaves behind. */
export function checkCables(rows: CableRow[], after: ResolvedPlan): CheckedCable[] {
  return rows.map((input) => ({ input, result: checkCable({ ...input, nominalVolts: after.bank.nominalVolts }) }));
}

/** The cautions a proposal shows: wiring always; generators and cold charging when they apply; estimates always. */
export function proposalCautions(after: ResolvedPlan, c: Changes): string[] {
  const out = [...CABLE_CAUTIONS];
  if (c.generatorHours !== null || after.chargers.some((x) => x.kind === 'generator')) out.push(CAUTIONS.generator);
  if (after.bank.chemistry === 'lifepo4' && !after.bank.selfHeating) out.push(CAUTIONS.cold);
  out.push(CAUTIONS.estimate);
  return out;
}
