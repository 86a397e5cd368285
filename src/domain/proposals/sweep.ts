// The upgrade sweep: every combination of the installer's candidates (bank, added panels, DC-DC
// charger, generator hours) rerun through the engine against a saved forecast's plan, priced from
// the installer's list. Ranked by cost when something makes the trip, by how close each comes when
// nothing does; when the rig already makes it, the options are what buys margin. An option that
// changes nothing is said to, never ranked as an upgrade; a part the rig already has is never
// offered. Generators follow the one rule of generator-rule.ts (start at the line + a margin). Pure: the engine prepares the trip once per panel
// geometry (sun, weather and irradiance do not change between variants) and simulates each
// combination on it.
import {
  arraySchema,
  forecast as runEngine,
  prepareTrip,
  resolveBank,
  simulatePrepared,
  type Forecast,
  type PreparedTrip,
  type ResolvedArray,
  type ResolvedBank,
  type ResolvedCharger,
  type ResolvedPlan,
  type SimResult,
  type Variant,
} from '../../engine';
import { bankSchema, CHEMISTRY_DEFAULTS } from '../../engine';
import type { BankCandidate, Candidates, Changes, Mounting, PanelCandidate, PriceList } from './proposals.schema';
import { DEFAULT_GENERATOR_MARGIN_PTS, DEFAULT_GENERATOR_STOP_PCT, generatorRule, type GeneratorRule } from '../advice/generator-rule';
import { bankWeight, type BankWeight } from './sweep-weight';

/** One priced line of an option. */
export interface CostItem {
  /** What it is: "300 Ah LiFePO4 bank". */
  name: string;
  quantity: number;
  unit: string;
  unitPrice: number;
  amount: number;
  /** One-off purchase and fitting, or running cost over this trip. */
  kind: 'one-off' | 'running';
}

/** How the bank fares through the trip, unrounded. */
export interface Outcome {
  passes: boolean;
  /** The line the trip is judged against: the trip's reserve, else this bank's floor. */
  reservePct: number;
  minSocPct: number;
  minSocAt: string;
  firstCutoffAt: string | null;
  unmetWh: number;
  solarWh: number;
  chargeWh: number;
  generatorHours: number;
  endSocPct: number;
  /** Lowest end-of-hour usable charge, % (what the line is judged on). */
  minUsablePct: number;
  /** Lowest usable charge − the line, points (negative: below it). */
  marginPts: number;
  /** Hours in which some load went unpowered. */
  hoursShort: number;
}

/** One combination, priced and simulated. */
export interface SweepOption extends Outcome {
  /** Stable within one request: bank, panel, charger and generator indices ("b2.p0.d1.g0", 0 = no change). */
  key: string;
  label: string;
  changes: Changes;
  items: CostItem[];
  oneOff: number;
  running: number;
  total: number;
  /** Energy from panels and chargers beyond the saved forecast's, Wh. */
  extraHarvestWh: number;
  /** Same unmet Wh and lowest usable charge as the rig as it is (within tolerance): not an upgrade. */
  changesNothing: boolean;
  /** The generator's start and stop levels, when the option runs one. */
  generator: GeneratorRule | null;
  /** A bank option's weight and space check. */
  weight: BankWeight | null;
  /** A cheaper option with the same outcome (within tolerance), when there is one: this one adds nothing over it. */
  noBetterThan: string | null;
}

/** A candidate the sweep did not try, and why. */
export interface Skipped {
  what: string;
  why: string;
}

/** The sweep's answer. */
export interface SweepResult {
  currency: string;
  base: Outcome & { running: number; items: CostItem[] };
  /**
   * How the options are ordered: `margin` when the rig already makes the trip (cheapest first, the
   * margin each buys beside it), `cost` when some option makes it, `closeness` when none does
   * (least unmet Wh, then fewest hours short). Options that change nothing come last in every order.
   */
  ranking: 'margin' | 'cost' | 'closeness';
  options: SweepOption[];
  /** The cheapest option that makes a trip the rig does not make as it is (never one over the rig's stated payload or space); null when none does or the rig already makes it. */
  cheapestPassing: string | null;
  /** When the rig already makes it: the cheapest option that adds at least a point of margin. */
  cheapestMoreMargin: string | null;
  /** The generator rule of the rig's own bank (each bank option's line follows its own floor). */
  generatorRule: GeneratorRule;
  /** Candidates not tried: what the rig already has, or smaller than it. */
  skipped: Skipped[];
  combinations: number;
  /** Engine preparations: one for the plan plus one per new panel geometry. */
  prepared: number;
}

export const CHEM_LABEL = { lifepo4: 'LiFePO4', agm: 'AGM', flooded: 'flooded lead-acid', gel: 'gel' } as const;
export const MOUNT_LABEL: Record<Mounting, string> = { flat: 'flat on the roof', tilted: 'tilted', portable: 'portable, aimed at the sun' };

/** The bank a candidate makes: its chemistry's defaults (its floor too, unless the installer sets one), keeping what the old bank set when the chemistry stays the same. */
export function bankFrom(old: ResolvedBank, c: BankCandidate): ResolvedBank {
  const same = old.chemistry === c.chemistry;
  // Another chemistry keeps the system's 12/24/48 V class at its own nominal (12 V flooded → 12.8 V LiFePO4).
  const volts = CHEMISTRY_DEFAULTS[c.chemistry].nominalVolts * Math.max(1, Math.round(old.nominalVolts / 12));
  return resolveBank(
    bankSchema.parse({
      chemistry: c.chemistry,
      capacityAh: c.capacityAh,
      initialSocPct: old.initialSocPct,
      insideHeatedSpace: old.insideHeatedSpace,
      // The new bank sits where the old one did, in a box that warms and cools alike.
      location: old.location,
      thermalHours: old.thermalHours,
      ...(same
        ? {
            nominalVolts: old.nominalVolts,
            floorSocPct: old.floorSocPct,
            cutoffVolts: old.cutoffVolts,
            // The charge limit scales with the bank and the resistance falls as cells are added in
            // parallel; both stay inside the engine's limits so an extreme step cannot fail the sweep.
            maxChargeAmps: Math.min(10_000, (old.maxChargeAmps / old.capacityAh) * c.capacityAh),
            peukertExponent: old.peukertExponent,
            chargeEfficiencyPct: old.chargeEfficiencyPct,
            internalResistanceMilliohm: Math.min(1000, (old.internalResistanceMilliohm * old.capacityAh) / c.capacityAh),
            selfHeating: old.selfHeating,
          }
        : { nominalVolts: volts }),
      ...(c.floorSocPct !== undefined ? { floorSocPct: c.floorSocPct } : {}),
    }),
  );
}

/**
 * The line an option is judged against: the trip's reserve or the option bank's own floor,
 * whichever is higher — except that a reserve no higher than the rig's own floor is that bank's
 * floor, not a wish of the camper's: a 50 % reserve on a 50 % AGM floor judges a LiFePO4 swap at
 * LiFePO4's 10 %, while a 20 % reserve on a 10 % LiFePO4 floor stays 20 % for any bank above it.
 */
export function lineFor(old: ResolvedBank, bank: ResolvedBank, reserveSocPct: number | null): number {
  if (reserveSocPct === null || reserveSocPct <= old.floorSocPct + 1e-9) return bank === old ? Math.max(old.floorSocPct, reserveSocPct ?? 0) : bank.floorSocPct;
  return Math.max(bank.floorSocPct, reserveSocPct);
}

/** The generator rule of an option: its line + the installer's margin, stopping at the installer's level. */
export function ruleFor(old: ResolvedBank, bank: ResolvedBank, reserveSocPct: number | null, c: Partial<Pick<Changes, 'generatorMarginPts' | 'generatorStopPct'>>, strandedPts = 0): GeneratorRule {
  return generatorRule({ floorSocPct: lineFor(old, bank, reserveSocPct), marginPts: c.generatorMarginPts ?? DEFAULT_GENERATOR_MARGIN_PTS, stopSocPct: c.generatorStopPct ?? DEFAULT_GENERATOR_STOP_PCT, strandedPts });
}

/** The most charge the cold strands in any hour of a simulation, points (see GeneratorRule.strandedPts). */
export function strandedOf(r: Pick<SimResult, 'n' | 'socEndPct' | 'usablePct'>): number {
  let worst = 0;
  for (let i = 0; i < r.n; i++) worst = Math.max(worst, (r.socEndPct[i] ?? 0) - (r.usablePct[i] ?? 0));
  return worst;
}

/** Amps of the rig's DC-DC (alternator) charging now. */
export function dcdcNow(plan: ResolvedPlan): number {
  return plan.chargers.filter((c) => c.kind === 'alternator').reduce((t, c) => t + c.amps, 0);
}

/** Whether a bank candidate is the rig's bank as it is (same chemistry, size and floor). */
function sameBank(old: ResolvedBank, c: BankCandidate): boolean {
  return old.chemistry === c.chemistry && Math.abs(old.capacityAh - c.capacityAh) < 0.5 && (c.floorSocPct === undefined || Math.abs(c.floorSocPct - old.floorSocPct) < 0.05);
}

/** The array a panel candidate adds, facing the equator unless the installer says otherwise. */
export function arrayFrom(plan: ResolvedPlan, p: PanelCandidate, watts = p.watts): ResolvedArray {
  const equator = (plan.stops[0]?.lat ?? 0) >= 0 ? 180 : 0;
  const geometry =
    p.mounting === 'flat'
      ? { tiltDeg: 0, azimuthDeg: 180, aim: 'fixed' as const }
      : p.mounting === 'tilted'
        ? { tiltDeg: p.tiltDeg ?? 30, azimuthDeg: p.azimuthDeg ?? equator, aim: 'fixed' as const }
        : { tiltDeg: p.tiltDeg ?? 35, azimuthDeg: p.azimuthDeg ?? equator, aim: 'follow' as const };
  const a = arraySchema.parse({ ratedWatts: watts, controller: 'mppt', ...geometry });
  return { ...a, name: `Added ${p.mounting} array` };
}

function geometryKey(plan: ResolvedPlan, p: PanelCandidate): string {
  const a = arrayFrom(plan, p, 1);
  return `${a.aim}|${a.tiltDeg}|${a.azimuthDeg}`;
}

/**
 * The charger list an option makes: a DC-DC charger replaces the alternator chargers; generator
 * hours add a generator where there is none, and any generator of the option follows `rule`.
 */
export function chargersFrom(plan: ResolvedPlan, c: Pick<Changes, 'dcdcAmps' | 'generatorHours' | 'generatorAmps'>, rule: GeneratorRule = generatorRule({ floorSocPct: plan.bank.floorSocPct })): ResolvedCharger[] | null {
  let list = plan.chargers;
  let changed = false;
  if (c.dcdcAmps !== null) {
    list = [...list.filter((x) => x.kind !== 'alternator'), { kind: 'alternator', amps: c.dcdcAmps, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 }];
    changed = true;
  }
  if (c.generatorHours !== null) {
    const levels = { startSocPct: rule.startSocPct, stopSocPct: rule.stopSocPct };
    list = list.some((x) => x.kind === 'generator')
      ? list.map((x) => (x.kind === 'generator' ? { ...x, ...levels } : x))
      : [...list, { kind: 'generator', amps: c.generatorAmps, ...levels, fuelLitresPerHour: 0.6 }];
    changed = true;
  }
  return changed ? list : null;
}

/** The plan after an option: what a proposal stores and forecasts as "after" (the trip's reserve sets the generator's line). */
export function applyChanges(plan: ResolvedPlan, c: Changes, reserveSocPct: number | null = null): ResolvedPlan {
  const bank = c.bank ? bankFrom(plan.bank, c.bank) : plan.bank;
  // The generator's start allows for the charge the cold strands in the same plan without the
  // generator's hours, as the sweep measures it.
  const stranded = c.generatorHours !== null ? strandedOf(simulatePrepared(prepareTrip(applyChanges(plan, { ...c, generatorHours: null }, reserveSocPct)))) : 0;
  const chargers = chargersFrom(plan, c, ruleFor(plan.bank, bank, reserveSocPct, c, stranded));
  const window: [number, number] | null = c.generatorHours !== null ? [c.generatorStartHour, c.generatorStartHour + c.generatorHours] : null;
  return {
    ...plan,
    bank,
    arrays: c.panel ? [...plan.arrays, arrayFrom(plan, c.panel)] : plan.arrays,
    chargers: chargers ?? plan.chargers,
    stops: window ? plan.stops.map((s) => (s.hookup === 'none' ? { ...s, generatorHours: window } : s)) : plan.stops,
  };
}

/** The one-off lines of an option, priced from the list. */
export function oneOffItems(plan: ResolvedPlan, c: Changes, prices: PriceList): CostItem[] {
  const items: CostItem[] = [];
  const line = (name: string, quantity: number, unit: string, unitPrice: number) => items.push({ name, quantity, unit, unitPrice, amount: quantity * unitPrice, kind: 'one-off' });
  if (c.bank) {
    line(`${c.bank.capacityAh} Ah ${CHEM_LABEL[c.bank.chemistry]} bank`, c.bank.capacityAh, 'Ah', prices.bankPerAh[c.bank.chemistry]);
    line('Bank installation', 1, '', prices.bankInstall);
    line(`Removal of the old ${Math.round(plan.bank.capacityAh)} Ah ${CHEM_LABEL[plan.bank.chemistry]} bank (in the installation)`, 1, '', 0);
  }
  if (c.panel) {
    line(`Panels, ${c.panel.watts} W`, c.panel.watts, 'W', prices.panelPerWatt);
    line(`Mounting, MPPT controller and wiring (${MOUNT_LABEL[c.panel.mounting]})`, 1, '', prices.arrayInstall[c.panel.mounting]);
  }
  if (c.dcdcAmps !== null) {
    const now = dcdcNow(plan);
    line(`DC-DC charger, ${c.dcdcAmps} A${now > 0 ? ` (replaces the rig’s ${now} A)` : ''}`, c.dcdcAmps, 'A', prices.dcdcPerAmp);
    line('DC-DC charger installation', 1, '', prices.dcdcInstall);
    if (now > 0) line(`Removal of the old ${now} A DC-DC charger (in the installation)`, 1, '', 0);
  }
  if (c.generatorHours !== null && !plan.chargers.some((x) => x.kind === 'generator')) {
    line(`Generator with a ${c.generatorAmps} A converter/charger`, 1, '', prices.generator);
  }
  return items.filter((i) => i.quantity > 0);
}

/** Generator running over the trip, from the simulated hours. */
function runningItems(hours: number, prices: PriceList): CostItem[] {
  if (!(hours > 0) || !(prices.generatorPerHour > 0)) return [];
  return [{ name: 'Generator running on this trip (fuel and wear)', quantity: hours, unit: 'h', unitPrice: prices.generatorPerHour, amount: hours * prices.generatorPerHour, kind: 'running' }];
}

/** A short name for an option. */
export function labelOf(c: Changes, plan: ResolvedPlan): string {
  const parts: string[] = [];
  if (c.bank) parts.push(`${c.bank.capacityAh} Ah ${CHEM_LABEL[c.bank.chemistry]}`);
  if (c.panel) parts.push(`+${c.panel.watts} W ${c.panel.mounting} panels`);
  if (c.dcdcAmps !== null) parts.push(`${c.dcdcAmps} A DC-DC charger${dcdcNow(plan) > 0 ? ` instead of the ${dcdcNow(plan)} A` : ''}`);
  if (c.generatorHours !== null) {
    const added = plan.chargers.some((x) => x.kind === 'generator') ? '' : 'a generator, ';
    parts.push(`${added}up to ${c.generatorHours} h a day from ${String(c.generatorStartHour).padStart(2, '0')}:00`);
  }
  return parts.join(' · ') || 'As it is';
}

/**
 * Judges a simulation against a line (the option's, see lineFor): passes with no cutoff and usable
 * charge never below it (engine revision 2 judges the floor on usable charge; charge the cold
 * strands is no reserve).
 */
export function outcomeOf(prepared: PreparedTrip, r: SimResult, linePct: number): Outcome {
  const s = r.summary;
  const passes = s.firstCutoffRow === null && s.minUsablePct >= linePct - 1e-9;
  let hoursShort = 0;
  for (let i = 0; i < r.n; i++) if ((r.unmetW[i] ?? 0) > 0) hoursShort++;
  return {
    passes,
    reservePct: linePct,
    minSocPct: s.minSocPct,
    minSocAt: prepared.grid.time[s.minSocRow] ?? '',
    firstCutoffAt: s.firstCutoffRow === null ? null : (prepared.grid.time[s.firstCutoffRow] ?? null),
    unmetWh: s.unmetWh,
    solarWh: s.solarWh,
    chargeWh: s.chargeWh,
    generatorHours: s.generatorHours,
    endSocPct: s.endSocPct,
    minUsablePct: s.minUsablePct,
    marginPts: s.minUsablePct - linePct,
    hoursShort,
  };
}

/** Unmet Wh within this of the rig as it is counts as the same. */
export const SAME_UNMET_WH = 1;
/** Lowest usable charge within this of the rig as it is counts as the same, points. */
export const SAME_LOWEST_PTS = 0.5;

/** Whether an option's outcome is the rig's own, within tolerance: it changes nothing. */
export function sameOutcome(a: Outcome, base: Outcome): boolean {
  return a.passes === base.passes && Math.abs(a.unmetWh - base.unmetWh) < SAME_UNMET_WH && Math.abs(a.minUsablePct - base.minUsablePct) < SAME_LOWEST_PTS;
}

/** 0 for a useful option, 1 for one no better than a cheaper one, 2 for one that changes nothing. */
const rest = (o: Pick<SweepOption, 'changesNothing' | 'noBetterThan'>) => (o.changesNothing ? 2 : o.noBetterThan !== null ? 1 : 0);
const byKey = (a: SweepOption, b: SweepOption) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0);

/** Cheapest first; at equal cost, passing first, then the higher lowest SOC, then the key. Options that change nothing last. */
export function compareOptions(a: SweepOption, b: SweepOption): number {
  return rest(a) - rest(b) || a.total - b.total || Number(b.passes) - Number(a.passes) || b.minSocPct - a.minSocPct || byKey(a, b);
}

/** When nothing passes: the closest first — least unmet Wh, then fewest hours short, then the higher lowest usable charge, then cost. */
export function compareCloseness(a: SweepOption, b: SweepOption): number {
  return rest(a) - rest(b) || a.unmetWh - b.unmetWh || a.hoursShort - b.hoursShort || b.minUsablePct - a.minUsablePct || a.total - b.total || byKey(a, b);
}

/** Drops candidates the rig already has (or smaller DC-DC chargers than its own), saying why. */
export function usableCandidates(plan: ResolvedPlan, cand: Candidates): { banks: BankCandidate[]; dcdcAmps: number[]; skipped: Skipped[] } {
  const skipped: Skipped[] = [];
  const banks = cand.banks.filter((b) => {
    if (!sameBank(plan.bank, b)) return true;
    skipped.push({ what: `${b.capacityAh} Ah ${CHEM_LABEL[b.chemistry]} bank`, why: 'the rig already has this bank' });
    return false;
  });
  const now = dcdcNow(plan);
  const dcdcAmps = [...new Set(cand.dcdcAmps)].filter((a) => {
    if (now <= 0 || a > now) return true;
    skipped.push({ what: `${a} A DC-DC charger`, why: a === now ? `the rig already has a ${now} A DC-DC charger: try a larger one as a replacement` : `smaller than the rig’s ${now} A DC-DC charger` });
    return false;
  });
  return { banks, dcdcAmps, skipped };
}

/** Runs every combination of the candidates against the plan and ranks them (see SweepResult.ranking). */
export function runSweep(input: { plan: ResolvedPlan; reserveSocPct: number | null; candidates: Candidates; prices: PriceList }): SweepResult {
  const { plan, reserveSocPct, candidates: cand, prices } = input;
  const base = prepareTrip(plan);
  const baseRun = simulatePrepared(base);
  const baseSim = baseRun.summary;
  const baseOutcome = outcomeOf(base, baseRun, lineFor(plan.bank, plan.bank, reserveSocPct));
  const baseRunning = runningItems(baseSim.generatorHours, prices);
  const { banks: bankCands, dcdcAmps: dcdcCands, skipped } = usableCandidates(plan, cand);
  const levels = { generatorMarginPts: cand.generatorMarginPts, generatorStopPct: cand.generatorStopPct };
  const limits = { payloadKg: cand.payloadKg, batterySpaceL: cand.batterySpaceL };

  // One preparation per distinct new geometry: the added array's output per rated watt is cached
  // there, so any wattage of it is only a different `arrayWatts` in the variant.
  const byGeometry = new Map<string, PreparedTrip>();
  for (const p of cand.panels) {
    const key = geometryKey(plan, p);
    if (!byGeometry.has(key)) byGeometry.set(key, prepareTrip({ ...plan, arrays: [...plan.arrays, arrayFrom(plan, p, 1)] }));
  }
  const existingWatts = plan.arrays.map((a) => a.ratedWatts);

  const banks: (BankCandidate | null)[] = [null, ...bankCands];
  const panels: (PanelCandidate | null)[] = [null, ...cand.panels];
  const dcdcs: (number | null)[] = [null, ...dcdcCands];
  const gens: (number | null)[] = [null, ...cand.generatorHours];

  const options: SweepOption[] = [];
  for (const [bi, bank] of banks.entries()) {
    const bankPlan = bank ? bankFrom(plan.bank, bank) : plan.bank;
    const linePct = lineFor(plan.bank, bankPlan, reserveSocPct);
    const weight = bank ? bankWeight(bankPlan, plan.bank, limits) : null;
    for (const [pi, panel] of panels.entries()) {
      const prepared = panel ? byGeometry.get(geometryKey(plan, panel))! : base;
      for (const [di, dcdcAmps] of dcdcs.entries()) {
        // The same combination without a generator runs first (gi = 0; the plan itself for the
        // first): the charge its cold strands raises the generator's start (GeneratorRule.strandedPts).
        let rule = ruleFor(plan.bank, bankPlan, reserveSocPct, levels, bi === 0 && pi === 0 && di === 0 ? strandedOf(baseRun) : 0);
        for (const [gi, generatorHours] of gens.entries()) {
          if (bi === 0 && pi === 0 && di === 0 && gi === 0) continue;
          const changes: Changes = {
            bank,
            panel,
            dcdcAmps,
            generatorHours,
            generatorStartHour: cand.generatorStartHour,
            generatorAmps: cand.generatorAmps,
            ...levels,
          };
          const variant: Variant = {};
          if (changes.bank) variant.bank = bankPlan;
          if (panel) variant.arrayWatts = [...existingWatts, panel.watts];
          const chargers = chargersFrom(plan, changes, rule);
          if (chargers) variant.chargers = chargers;
          if (changes.generatorHours !== null) variant.generatorHours = [cand.generatorStartHour, cand.generatorStartHour + changes.generatorHours];
          const sim = simulatePrepared(prepared, variant);
          if (gi === 0) rule = ruleFor(plan.bank, bankPlan, reserveSocPct, levels, strandedOf(sim));
          const s = sim.summary;
          const outcome = outcomeOf(prepared, sim, linePct);
          const items = [...oneOffItems(plan, changes, prices), ...runningItems(s.generatorHours, prices)];
          const oneOff = items.filter((i) => i.kind === 'one-off').reduce((t, i) => t + i.amount, 0);
          const running = items.filter((i) => i.kind === 'running').reduce((t, i) => t + i.amount, 0);
          options.push({
            key: `b${bi}.p${pi}.d${di}.g${gi}`,
            label: labelOf(changes, plan),
            changes,
            items,
            oneOff,
            running,
            total: oneOff + running,
            ...outcome,
            extraHarvestWh: s.solarWh + s.chargeWh - (baseSim.solarWh + baseSim.chargeWh),
            changesNothing: sameOutcome(outcome, baseOutcome),
            generator: changes.generatorHours !== null ? rule : null,
            weight,
            noBetterThan: null,
          });
        }
      }
    }
  }
  // An option no better than a cheaper one (a generator that never starts beside panels, a larger
  // DC-DC charger on a trip that is full when it drives) is named so and ranked after the useful ones.
  const byCost = [...options].sort((a, b) => a.total - b.total || byKey(a, b));
  for (const [i, o] of byCost.entries()) {
    if (o.changesNothing) continue;
    const twin = byCost.slice(0, i).find((c) => !c.changesNothing && c.noBetterThan === null && c.total <= o.total && sameOutcome(o, c));
    if (twin) o.noBetterThan = twin.key;
  }
  const anyPasses = options.some((o) => o.passes && !o.changesNothing);
  const ranking: SweepResult['ranking'] = baseOutcome.passes ? 'margin' : anyPasses ? 'cost' : 'closeness';
  options.sort(ranking === 'closeness' ? compareCloseness : compareOptions);
  return {
    currency: prices.currency,
    base: { ...baseOutcome, running: baseRunning.reduce((t, i) => t + i.amount, 0), items: baseRunning },
    ranking,
    options,
    cheapestPassing: ranking === 'cost' ? (options.find((o) => o.passes && rest(o) === 0 && !o.weight?.flagged)?.key ?? null) : null,
    cheapestMoreMargin: ranking === 'margin' ? (options.find((o) => rest(o) === 0 && o.passes && !o.weight?.flagged && o.marginPts >= baseOutcome.marginPts + 1)?.key ?? null) : null,
    generatorRule: ruleFor(plan.bank, plan.bank, reserveSocPct, levels, strandedOf(baseRun)),
    skipped,
    combinations: options.length,
    prepared: 1 + byGeometry.size,
  };
}

/** The forecast after an option, from the plan it makes (what a proposal keeps as "after"). */
export function forecastAfter(plan: ResolvedPlan, c: Changes, reserveSocPct: number | null = null): { plan: ResolvedPlan; forecast: Forecast } {
  const after = applyChanges(plan, c, reserveSocPct);
  return { plan: after, forecast: runEngine(after) };
}
