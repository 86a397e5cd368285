// What a proposal adds to the chosen option: default cable runs for the parts it adds, their
// checks, the parts list and its total, and the cautions. Pure; the server and the islands share it.
import type { ResolvedPlan } from '../../engine';
import { CAUTIONS } from '../advice/cautions';
import { CABLE_CAUTIONS, checkCable, defaultLowestVolts, type CableResult, type SizeSystem } from './cable';
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

const r1 = (x: number) => Math.round(x * 10) / 10;
const fmt = (x: number) => (Math.round(x * 10) / 10).toLocaleString('en-US');

/** Amps a solar array's controller puts into the bank at most: its rating, else watts ÷ bank volts (MPPT, common practice). */
function arrayAmps(a: { ratedWatts: number; controllerMaxAmps: number | null }, volts: number): number {
  return a.controllerMaxAmps ?? a.ratedWatts / volts;
}

/**
 * The current the main battery feed can really carry, and why: the larger of what flows in (the
 * chargers together: DC-DC/alternator, solar controllers, and one converter/charger — shore and
 * generator feed the same one, so the larger of the two counts) and what flows out (the inverter's
 * continuous input at the bank's lowest voltage: its rated continuous watts, else the AC loads
 * together, ÷ efficiency ÷ volts).
 */
export function mainFeedCurrent(after: ResolvedPlan): { amps: number; side: 'charging' | 'inverter'; basis: string; inverter: { watts: number; lowestVolts: number } | null } {
  const v = after.bank.nominalVolts;
  const alt = after.chargers.filter((c) => c.kind === 'alternator').reduce((t, c) => t + c.amps, 0);
  const converter = Math.max(0, ...after.chargers.filter((c) => c.kind !== 'alternator').map((c) => c.amps));
  const solar = after.arrays.reduce((t, a) => t + arrayAmps(a, v), 0);
  const charging = alt + converter + solar;
  const parts = [alt > 0 ? `DC-DC ${fmt(alt)} A` : '', solar > 0 ? `solar ${fmt(solar)} A` : '', converter > 0 ? `converter/charger ${fmt(converter)} A` : ''].filter(Boolean);
  const chargingText = `the chargers together (${parts.length ? parts.join(' + ') : 'none'}) = ${fmt(charging)} A`;
  const acWatts = after.loads.filter((l) => l.supply === 'ac').reduce((t, l) => t + l.watts * l.quantity, 0);
  const invWatts = after.inverter.continuousWatts ?? acWatts;
  const lowest = after.bank.cutoffVolts ?? defaultLowestVolts(v);
  const inverterA = invWatts > 0 ? invWatts / (after.inverter.efficiencyPct / 100) / lowest : 0;
  const invWhat = after.inverter.continuousWatts !== null ? `${fmt(invWatts)} W rated continuous` : `${fmt(invWatts)} W of AC loads together`;
  const inverterText = invWatts > 0 ? `the inverter's continuous input at ${fmt(lowest)} V (${invWhat} ÷ ${after.inverter.efficiencyPct} % ÷ ${fmt(lowest)} V) = ${fmt(inverterA)} A` : 'no inverter load';
  if (inverterA > charging) {
    return { amps: inverterA, side: 'inverter', basis: `Sized for ${inverterText}, the larger of the two; charging brings ${fmt(charging)} A.`, inverter: { watts: Math.round(invWatts), lowestVolts: Math.round(lowest * 100) / 100 } };
  }
  return { amps: charging, side: 'charging', basis: `Sized for ${chargingText}, the larger of the two; ${inverterText}.`, inverter: null };
}

/**
 * Cable runs for the parts an option adds, with lengths to measure and edit: the main battery feed
 * when the bank changes (sized by the current that can really flow on it, see mainFeedCurrent), the
 * controller-to-bank run of added panels, the DC-DC charger's output, and a generator's
 * converter/charger. Charging and main feeds are critical circuits (3 %). Each run says why it
 * carries its current.
 */
export function defaultCables(after: ResolvedPlan, c: Changes, sizes: SizeSystem = 'awg'): CableRow[] {
  const v = after.bank.nominalVolts;
  const rows: CableRow[] = [];
  const base = { circuit: 'critical' as const, table: 'abyc-105c' as const, chosenAwg: null, method: 'abyc-20c' as const, sizes };
  if (c.bank) {
    const feed = mainFeedCurrent(after);
    rows.push(
      feed.inverter
        ? { ...base, label: 'Main battery feed (bank to inverter and DC panel)', source: { kind: 'inverter', watts: feed.inverter.watts, efficiencyPct: after.inverter.efficiencyPct, lowestVolts: feed.inverter.lowestVolts }, oneWayM: 1.5, basis: feed.basis }
        : { ...base, label: 'Main battery feed (bank to bus bar)', source: { kind: 'current', amps: Math.max(0.1, r1(feed.amps)) }, oneWayM: 1.5, basis: feed.basis },
    );
  }
  if (c.panel) {
    const amps = Math.ceil(c.panel.watts / v);
    rows.push({ ...base, label: `Added panels: MPPT controller to bank (${c.panel.watts} W)`, source: { kind: 'current', amps }, oneWayM: 3, basis: `The controller's most output: ${c.panel.watts} W ÷ ${v} V = ${amps} A (rounded up).` });
  }
  if (c.dcdcAmps !== null) {
    rows.push({ ...base, label: `DC-DC charger output to bank (${c.dcdcAmps} A)`, source: { kind: 'charger', amps: c.dcdcAmps }, oneWayM: 1, basis: `The charger's rated output, ${c.dcdcAmps} A.` });
  }
  if (c.generatorHours !== null) {
    const gen = after.chargers.find((x) => x.kind === 'generator');
    if (gen) rows.push({ ...base, label: `Converter/charger to bank (${gen.amps} A)`, source: { kind: 'charger', amps: gen.amps }, oneWayM: 2, basis: `The converter/charger's rated output, ${gen.amps} A.` });
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
