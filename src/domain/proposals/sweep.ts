// The upgrade sweep: every combination of the installer's candidates (bank, added panels, DC-DC
// charger, generator hours) rerun through the engine against a saved forecast's plan, priced from
// the installer's list and ranked by cost. Pure: the engine prepares the trip once per panel
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
  type SimSummary,
  type Variant,
} from '../../engine';
import { bankSchema, CHEMISTRY_DEFAULTS } from '../../engine';
import type { BankCandidate, Candidates, Changes, Mounting, PanelCandidate, PriceList } from './proposals.schema';

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
}

/** The sweep's answer. */
export interface SweepResult {
  currency: string;
  base: Outcome & { running: number; items: CostItem[] };
  /** Cheapest first; equal costs: passing first, then the higher lowest SOC. */
  options: SweepOption[];
  /** The cheapest option that passes, or null when none does. */
  cheapestPassing: string | null;
  combinations: number;
  /** Engine preparations: one for the plan plus one per new panel geometry. */
  prepared: number;
}

const CHEM_LABEL = { lifepo4: 'LiFePO4', agm: 'AGM', flooded: 'flooded lead-acid', gel: 'gel' } as const;
const MOUNT_LABEL: Record<Mounting, string> = { flat: 'flat on the roof', tilted: 'tilted', portable: 'portable, aimed at the sun' };

/** The bank a candidate makes: its chemistry's defaults, keeping what the old bank set when the chemistry stays the same. */
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
    }),
  );
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

/** The charger list an option makes: a DC-DC charger replaces the alternator chargers; a generator is added when there is none. */
export function chargersFrom(plan: ResolvedPlan, c: Pick<Changes, 'dcdcAmps' | 'generatorHours' | 'generatorAmps'>): ResolvedCharger[] | null {
  let list = plan.chargers;
  let changed = false;
  if (c.dcdcAmps !== null) {
    list = [...list.filter((x) => x.kind !== 'alternator'), { kind: 'alternator', amps: c.dcdcAmps, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 }];
    changed = true;
  }
  if (c.generatorHours !== null && !list.some((x) => x.kind === 'generator')) {
    list = [...list, { kind: 'generator', amps: c.generatorAmps, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 }];
    changed = true;
  }
  return changed ? list : null;
}

/** The plan after an option: what a proposal stores and forecasts as "after". */
export function applyChanges(plan: ResolvedPlan, c: Changes): ResolvedPlan {
  const chargers = chargersFrom(plan, c);
  const window: [number, number] | null = c.generatorHours !== null ? [c.generatorStartHour, c.generatorStartHour + c.generatorHours] : null;
  return {
    ...plan,
    bank: c.bank ? bankFrom(plan.bank, c.bank) : plan.bank,
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
  }
  if (c.panel) {
    line(`Panels, ${c.panel.watts} W`, c.panel.watts, 'W', prices.panelPerWatt);
    line(`Mounting, MPPT controller and wiring (${MOUNT_LABEL[c.panel.mounting]})`, 1, '', prices.arrayInstall[c.panel.mounting]);
  }
  if (c.dcdcAmps !== null) {
    line(`DC-DC charger, ${c.dcdcAmps} A`, c.dcdcAmps, 'A', prices.dcdcPerAmp);
    line('DC-DC charger installation', 1, '', prices.dcdcInstall);
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
  if (c.dcdcAmps !== null) parts.push(`${c.dcdcAmps} A DC-DC charger`);
  if (c.generatorHours !== null) {
    const added = plan.chargers.some((x) => x.kind === 'generator') ? '' : 'a generator, ';
    parts.push(`${added}${c.generatorHours} h a day from ${String(c.generatorStartHour).padStart(2, '0')}:00`);
  }
  return parts.join(' · ') || 'As it is';
}

/**
 * Judges a simulation against the trip's reserve (else the bank's floor): passes with no cutoff and
 * usable charge never below it (engine revision 2 judges the floor on usable charge; charge the
 * cold strands is no reserve).
 */
export function outcomeOf(prepared: PreparedTrip, s: SimSummary, bank: ResolvedBank, reserveSocPct: number | null): Outcome {
  const reservePct = reserveSocPct ?? bank.floorSocPct;
  const passes = s.firstCutoffRow === null && s.minUsablePct >= reservePct - 1e-9;
  return {
    passes,
    reservePct,
    minSocPct: s.minSocPct,
    minSocAt: prepared.grid.time[s.minSocRow] ?? '',
    firstCutoffAt: s.firstCutoffRow === null ? null : (prepared.grid.time[s.firstCutoffRow] ?? null),
    unmetWh: s.unmetWh,
    solarWh: s.solarWh,
    chargeWh: s.chargeWh,
    generatorHours: s.generatorHours,
    endSocPct: s.endSocPct,
  };
}

/** Cheapest first; at equal cost, passing first, then the higher lowest SOC, then the key. */
export function compareOptions(a: SweepOption, b: SweepOption): number {
  return a.total - b.total || Number(b.passes) - Number(a.passes) || b.minSocPct - a.minSocPct || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0);
}

/** Runs every combination of the candidates against the plan and ranks them by cost. */
export function runSweep(input: { plan: ResolvedPlan; reserveSocPct: number | null; candidates: Candidates; prices: PriceList }): SweepResult {
  const { plan, reserveSocPct, candidates: cand, prices } = input;
  const base = prepareTrip(plan);
  const baseSim = simulatePrepared(base).summary;
  const baseOutcome = outcomeOf(base, baseSim, plan.bank, reserveSocPct);
  const baseRunning = runningItems(baseSim.generatorHours, prices);

  // One preparation per distinct new geometry: the added array's output per rated watt is cached
  // there, so any wattage of it is only a different `arrayWatts` in the variant.
  const byGeometry = new Map<string, PreparedTrip>();
  for (const p of cand.panels) {
    const key = geometryKey(plan, p);
    if (!byGeometry.has(key)) byGeometry.set(key, prepareTrip({ ...plan, arrays: [...plan.arrays, arrayFrom(plan, p, 1)] }));
  }
  const existingWatts = plan.arrays.map((a) => a.ratedWatts);

  const banks: (BankCandidate | null)[] = [null, ...cand.banks];
  const panels: (PanelCandidate | null)[] = [null, ...cand.panels];
  const dcdcs: (number | null)[] = [null, ...cand.dcdcAmps];
  const gens: (number | null)[] = [null, ...cand.generatorHours];

  const options: SweepOption[] = [];
  for (const [bi, bank] of banks.entries()) {
    const bankPlan = bank ? bankFrom(plan.bank, bank) : plan.bank;
    for (const [pi, panel] of panels.entries()) {
      const prepared = panel ? byGeometry.get(geometryKey(plan, panel))! : base;
      for (const [di, dcdcAmps] of dcdcs.entries()) {
        for (const [gi, generatorHours] of gens.entries()) {
          if (bi === 0 && pi === 0 && di === 0 && gi === 0) continue;
          const changes: Changes = {
            bank,
            panel,
            dcdcAmps,
            generatorHours,
            generatorStartHour: cand.generatorStartHour,
            generatorAmps: cand.generatorAmps,
          };
          const variant: Variant = {};
          if (changes.bank) variant.bank = bankPlan;
          if (panel) variant.arrayWatts = [...existingWatts, panel.watts];
          const chargers = chargersFrom(plan, changes);
          if (chargers) variant.chargers = chargers;
          if (changes.generatorHours !== null) variant.generatorHours = [cand.generatorStartHour, cand.generatorStartHour + changes.generatorHours];
          const s = simulatePrepared(prepared, variant).summary;
          const outcome = outcomeOf(prepared, s, bankPlan, reserveSocPct);
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
          });
        }
      }
    }
  }
  options.sort(compareOptions);
  return {
    currency: prices.currency,
    base: { ...baseOutcome, running: baseRunning.reduce((t, i) => t + i.amount, 0), items: baseRunning },
    options,
    cheapestPassing: options.find((o) => o.passes)?.key ?? null,
    combinations: options.length,
    prepared: 1 + byGeometry.size,
  };
}

/** The forecast after an option, from the plan it makes (what a proposal keeps as "after"). */
export function forecastAfter(plan: ResolvedPlan, c: Changes): { plan: ResolvedPlan; forecast: Forecast } {
  const after = applyChanges(plan, c);
  return { plan: after, forecast: runEngine(after) };
}
