// Advice: the two or three changes that matter most, each with its effect measured by running the
// engine again on a changed plan (the engine is pure and fast, so advice is never guessed). The
// measuring is here; the sentences shared by several rules (effects, warnings) are built from
// the measured figures in advice-text.ts.
import {
  forecast as runEngine,
  inverterDcWatts,
  loadWattsAt,
  prepareTrip,
  simulatePrepared,
  toForecast,
  validatePlan,
  windowMask,
  type Forecast,
  type PreparedTrip,
  type ResolvedCharger,
  type ResolvedPlan,
} from '../../engine';
import { formatDay, formatLitres, formatRowTime, localParts, pct } from '../../lib/format';
import { reserveOf } from '../forecasts/verdict';
import { coldAloneText, effectText, joinAnd, notEnough, warningsOf, type Effect } from './advice-text';
import { CAUTIONS, coldCaution } from './cautions';
import { DEFAULT_GENERATOR_MARGIN_PTS, DEFAULT_GENERATOR_STOP_PCT, GENERATOR_MARGIN_STEP_PTS, generatorRule, generatorRuleText, worstStrandedPts, type GeneratorRule } from './generator-rule';
import { at } from '../../lib/invariant';
import { formatTemp, formatTempDelta, type Units } from '../../lib/units';


/** Converter/charger amps assumed for generator advice when the plan names none (common practice: 30 A is a usual RV converter). */
export const ASSUMED_CONVERTER_AMPS = 30;
/** Fuel assumed for a small inverter generator at light load, L/h (trade notes: ~0.4–1 L/h; the engine's default). */
export const ASSUMED_FUEL_LPH = 0.6;

/** One load's share of the daily energy. */
export interface LoadUse {
  name: string;
  /** Estimated Wh per day drawn from the DC system (inverter losses included for AC loads). */
  whPerDay: number;
  /** Share of all loads' energy, %. */
  sharePct: number;
}

export type ChangeKind = 'generator' | 'no-generator' | 'shade' | 'tilt' | 'drive';

/** A change to the plan and what it does to the forecast. */
export interface AdviceChange {
  kind: ChangeKind;
  /** What to do, in a few words. */
  title: string;
  /** What it changes, in hours or % (from an engine run). */
  effect: string;
  /** How it was worked out. */
  detail: string;
  /** The safety caution that goes with it, if any. */
  caution?: string;
  /** True when the change keeps the whole trip above the floor and reserve. */
  fixes: boolean;
  /** Ranking weight (larger matters more). */
  score: number;
}

/** A forecast warning in plain words, with its caution. */
export interface AdviceWarning {
  code: string;
  title: string;
  message: string;
  caution?: string;
}

/** The fixes that matter in the cold (Revision 2). */
export type ColdFixKind = 'bank-cabin' | 'self-heating' | 'more-capacity' | 'more-solar' | 'setpoint';

/** One cold-weather fix, measured by running the whole forecast again with only that change. */
export interface ColdFix {
  kind: ColdFixKind;
  title: string;
  /** The change as a noun phrase for the "alone" sentence ("the bank in the heated cabin"). */
  short: string;
  /** What it changes, in hours or % (from the engine run). */
  effect: string;
  /** The lowest usable charge before → after, and how the change was made. */
  detail: string;
  caution?: string;
  /** True when this change alone keeps the whole trip above the floor and reserve. */
  fixes: boolean;
  score: number;
  /** Lowest usable charge of the trip with the change, %. */
  minUsablePct: number;
  /** The changed plan's forecast: what the effect was measured on. */
  forecast: Forecast;
}

/** The cold-weather fixes of a cold trip, and which one alone makes it. */
export interface ColdAdvice {
  /** Every fix that applies to this rig, most effective first. */
  fixes: ColdFix[];
  /** Which fixes alone make the trip, in one sentence. */
  alone: string;
  /** Lowest usable charge of the plan as given, %. */
  baseMinUsablePct: number;
}

/** Everything the advice panel shows. */
export interface Advice {
  /** The three loads that use the most, largest first. */
  topLoads: LoadUse[];
  /** Estimated Wh per day of all loads. */
  totalWhPerDay: number;
  /** The two or three changes that matter most, most important first. */
  changes: AdviceChange[];
  /** The cold-weather fixes, on a trip with a night at or below `COLD_TRIP_C` (null otherwise). */
  cold: ColdAdvice | null;
  warnings: AdviceWarning[];
}

// ---------------------------------------------------------------------------------------------
// Loads

/** Estimated Wh per day of each load (and the inverter's idle draw), from the plan's hours, duty and the forecast's temperatures. */
export function loadUse(prepared: PreparedTrip): { loads: LoadUse[]; totalWhPerDay: number } {
  const { plan, grid, n } = prepared;
  const days = Math.max(n / 24, 1 / 24);
  const masks = plan.loads.map((l) => windowMask(l.windows));
  const totals = plan.loads.map(() => 0);
  let idleWh = 0;
  const eff = plan.inverter.efficiencyPct / 100;
  for (let r = 0; r < n; r++) {
    const hour = at(grid.localHour, r, 'hour of the trip');
    const driveDay = grid.driveDay[r] === 1;
    const ambientC = at(prepared.ambientC, r, 'hour of the trip');
    let ac = 0;
    plan.loads.forEach((l, i) => {
      const w = loadWattsAt(l, at(masks, i, 'load window'), hour, driveDay, ambientC);
      if (l.supply === 'ac') ac += w;
      totals[i] = at(totals, i, 'load total') + (l.supply === 'ac' ? w / eff : w);
    });
    // The inverter's idle draw counts whenever it is on (inverterDcWatts adds it to the AC share).
    idleWh += inverterDcWatts(ac, plan.inverter) - (ac > 0 ? ac / eff : 0);
  }
  const rows: LoadUse[] = plan.loads.map((l, i) => ({ name: l.name, whPerDay: at(totals, i, 'load total') / days, sharePct: 0 }));
  if (idleWh > 0) rows.push({ name: 'Inverter idle draw', whPerDay: idleWh / days, sharePct: 0 });
  const total = rows.reduce((s, r) => s + r.whPerDay, 0);
  for (const r of rows) r.sharePct = total > 0 ? (r.whPerDay / total) * 100 : 0;
  rows.sort((a, b) => b.whPerDay - a.whPerDay);
  return { loads: rows.filter((r) => r.whPerDay > 0), totalWhPerDay: total };
}

// ---------------------------------------------------------------------------------------------
// Measuring a change

function hoursShort(f: Forecast): number {
  let n = 0;
  for (const r of f.hourly) if (r.unmetWatts > 0) n++;
  return n;
}

function rowOf(f: Forecast, time: string | null): number {
  return time === null ? -1 : f.hourly.findIndex((r) => r.time === time);
}

/** First row that falls below the reserve (or cuts off); -1 when none. */
export function firstProblemRow(f: Forecast, reservePct: number): number {
  const cut = rowOf(f, f.summary.firstCutoffAt);
  const below = reservePct > f.summary.floorSocPct ? f.hourly.findIndex((r) => r.socPct < reservePct) : -1;
  if (cut < 0) return below;
  if (below < 0) return cut;
  return Math.min(cut, below);
}

function isFine(f: Forecast, reservePct: number): boolean {
  return f.summary.firstCutoffAt === null && (reservePct <= f.summary.floorSocPct || f.summary.minSocPct >= reservePct);
}

/** What a change does to the forecast, as figures (the words are made in advice-text.ts). */
export function measureEffect(base: Forecast, alt: Forecast, reservePct: number): Effect {
  const fixes = isFine(alt, reservePct);
  const lowest = { lowestPct: alt.summary.minSocPct, lowestAt: alt.summary.minSocAt };
  if (base.summary.firstCutoffAt) {
    if (!alt.summary.firstCutoffAt) return { kind: 'cutoff-gone', fixes, score: 1_000_000 + alt.summary.minSocPct, ...lowest, reservePct };
    const shortBefore = hoursShort(base);
    const shortAfter = hoursShort(alt);
    const laterBy = rowOf(alt, alt.summary.firstCutoffAt) - rowOf(base, base.summary.firstCutoffAt);
    return { kind: 'cutoff-changed', fixes, score: (shortBefore - shortAfter) * 10 + Math.max(laterBy, 0), shortBefore, shortAfter, laterBy, firstCutoffAt: alt.summary.firstCutoffAt };
  }
  const diff = alt.summary.minSocPct - base.summary.minSocPct;
  if (Math.abs(diff) < 0.5) return { kind: 'little-change', fixes, score: 0, ...lowest };
  return { kind: 'lowest-changed', fixes, score: diff, fromPct: base.summary.minSocPct, toPct: alt.summary.minSocPct };
}

/** The effect of a change, in hours or %, comparing two forecasts of the same trip. */
export function effectOf(base: Forecast, alt: Forecast, reservePct: number): { text: string; score: number; fixes: boolean } {
  const e = measureEffect(base, alt, reservePct);
  return { text: effectText(e), score: e.score, fixes: e.fixes };
}

// ---------------------------------------------------------------------------------------------
// Generator

/** The converter/charger a generator would feed: the plan's generator, else its shore charger, else an assumed one. */
function generatorCharger(plan: ResolvedPlan): { amps: number; fuel: number; source: string } {
  const gen = plan.chargers.find((c) => c.kind === 'generator');
  if (gen) return { amps: gen.amps, fuel: gen.fuelLitresPerHour, source: `the rig’s ${gen.amps} A converter/charger` };
  const shore = plan.chargers.filter((c) => c.kind === 'shore').reduce((s, c) => s + c.amps, 0);
  if (shore > 0) return { amps: shore, fuel: ASSUMED_FUEL_LPH, source: `the rig’s ${shore} A converter/charger (the one shore power uses)` };
  return { amps: ASSUMED_CONVERTER_AMPS, fuel: ASSUMED_FUEL_LPH, source: `a typical ${ASSUMED_CONVERTER_AMPS} A converter/charger (assumed: the plan names none)` };
}

/** Runs the plan with a generator in its allowed hours under the one generator rule (start and stop levels). */
function withRuleGenerator(prepared: PreparedTrip, rule: GeneratorRule, amps: number, fuel: number): Forecast {
  const gen: ResolvedCharger = { kind: 'generator', amps, startSocPct: rule.startSocPct, stopSocPct: rule.stopSocPct, fuelLitresPerHour: fuel };
  const chargers = [...prepared.plan.chargers.filter((c) => c.kind !== 'generator'), gen];
  return toForecast(prepared, simulatePrepared(prepared, { chargers }));
}

/** Rows of each local day where the plan allows a generator (its stop's hours, no hookup, not driving), by day. */
function generatorWindows(prepared: PreparedTrip, beforeRow: number): number[][] {
  const days = new Map<number, number[]>();
  for (let r = 0; r < Math.min(beforeRow, prepared.n); r++) {
    if (prepared.generatorAllowed[r] !== 1) continue;
    const d = at(prepared.grid.localDay, r, 'hour of the trip');
    const list = days.get(d) ?? [];
    list.push(r);
    days.set(d, list);
  }
  return [...days.values()];
}

/**
 * Generator advice under the one rule the sweep uses too (generator-rule.ts): the generator runs in
 * the plan's allowed hours, starting below the line + a margin and stopping at the stated level.
 * The default margin first; when that is not enough, larger margins in 10-point steps, and the
 * smallest that keeps the trip above its reserve (else at least above the floor) is the advice.
 */
function generatorAdvice(prepared: PreparedTrip, base: Forecast, reservePct: number): AdviceChange | null {
  const plan = prepared.plan;
  const problem = firstProblemRow(base, reservePct);
  if (problem < 0) {
    return {
      kind: 'no-generator',
      title: 'No generator needed',
      effect: `The bank stays above the ${pct(reservePct)} ${reservePct > base.summary.floorSocPct ? 'reserve' : 'floor'} all trip — lowest ${pct(base.summary.minSocPct)} on ${formatRowTime(base.summary.minSocAt)}.`,
      detail: 'From the forecast as planned.',
      fixes: true,
      score: 500,
    };
  }

  const own = plan.chargers.find((c) => c.kind === 'generator');
  const { amps, fuel, source } = generatorCharger(plan);
  if (generatorWindows(prepared, problem).length === 0) {
    return {
      kind: 'generator',
      title: 'A generator comes too late',
      effect: `The bank runs low on ${formatRowTime(at(base.hourly, problem, 'trouble hour').time)}, before any allowed generator hours.`,
      detail: 'Start the trip with a fuller bank, or allow generator hours earlier at this stop.',
      caution: CAUTIONS.generator,
      fixes: false,
      score: 1,
    };
  }

  const floor = base.summary.floorSocPct;
  const stopSocPct = own ? Math.max(own.stopSocPct, DEFAULT_GENERATOR_STOP_PCT) : DEFAULT_GENERATOR_STOP_PCT;
  const strandedPts = worstStrandedPts(base.hourly);
  let last: { rule: GeneratorRule; alt: Forecast } | null = null;
  for (const target of reservePct > floor ? [reservePct, floor] : [floor]) {
    for (let margin = DEFAULT_GENERATOR_MARGIN_PTS; margin === DEFAULT_GENERATOR_MARGIN_PTS || target + margin + strandedPts < stopSocPct; margin += GENERATOR_MARGIN_STEP_PTS) {
      const rule = generatorRule({ floorSocPct: target, marginPts: margin, stopSocPct, strandedPts });
      const alt = withRuleGenerator(prepared, rule, amps, fuel);
      last = { rule, alt };
      if (!isFine(alt, target)) continue;
      const e = effectOf(base, alt, reservePct);
      const under = target < reservePct;
      const lineName = target > floor ? 'reserve' : 'floor';
      const first = alt.hourly.find((r) => r.generatorOn);
      const start = Math.round(rule.startSocPct * 10) / 10;
      const title = own
        ? `Start the generator below ${start} % instead of ${Math.round(own.startSocPct)} %`
        : `Run a generator whenever the charge falls below ${start} %`;
      return {
        kind: 'generator',
        title,
        effect: `${e.text} It would run about ${alt.summary.generatorHours} h in all (${formatLitres(alt.summary.generatorLitres)} of fuel)${first ? `, first on ${formatRowTime(first.time)}` : ''}.`,
        detail: `The generator ${generatorRuleText(rule, lineName)}, in the allowed generator hours at each camp without hookup${margin > DEFAULT_GENERATOR_MARGIN_PTS ? ` (${DEFAULT_GENERATOR_MARGIN_PTS} points above the ${lineName} is not enough: the bank runs low where no generator may run)` : ''}. Through ${source}; worked out by running the forecast again with it.${under ? ` No generator hours keep the bank above your ${pct(reservePct)} reserve: it falls below it where no generator may run.` : ''}`,
        caution: CAUTIONS.generator,
        fixes: !under,
        score: e.score + 100 - alt.summary.generatorHours,
      };
    }
  }
  if (!last) return null;
  const e = effectOf(base, last.alt, reservePct);
  return notEnough(e, `Through ${source}: it ${generatorRuleText(last.rule, 'floor')}, in every allowed generator hour.`, `Even starting the generator below ${Math.round(last.rule.startSocPct)} %`);
}

// ---------------------------------------------------------------------------------------------
// Shade and drives

function shadeAdvice(plan: ResolvedPlan, base: Forecast, reservePct: number): AdviceChange | null {
  if (!plan.arrays.some((a) => a.ratedWatts > 0)) return null;
  const shaded = plan.stops.filter((s) => s.shadePct > 0);
  const arrayShade = plan.arrays.some((a) => a.shadePct > 0);
  if (shaded.length === 0 && !arrayShade) return null;
  const open: ResolvedPlan = {
    ...plan,
    stops: plan.stops.map((s) => ({ ...s, shadePct: 0 })),
    arrays: plan.arrays.map((a) => ({ ...a, shadePct: 0 })),
  };
  const alt = runEngine(open);
  const e = effectOf(base, alt, reservePct);
  if (e.score <= 0 && !e.fixes) return null;
  const where = shaded.length > 0 ? shaded.map((s) => `${Math.round(s.shadePct)} % at ${s.name}`).join(', ') : 'on the panels';
  return {
    kind: 'shade',
    title: 'Camp where the panels see open sky',
    effect: e.text,
    detail: `The plan has shade ${where}; worked out by running the forecast again with no shade.`,
    fixes: e.fixes,
    score: e.score,
  };
}

function tiltAdvice(plan: ResolvedPlan, base: Forecast, reservePct: number): AdviceChange | null {
  const flat = plan.arrays.filter((a) => a.ratedWatts > 0 && a.aim === 'fixed' && a.tiltDeg < 5);
  if (flat.length === 0) return null;
  const lat = plan.stops[0]?.lat ?? 0;
  const tiltDeg = Math.min(60, Math.max(10, Math.round(Math.abs(lat))));
  const azimuthDeg = lat >= 0 ? 180 : 0;
  const tilted: ResolvedPlan = {
    ...plan,
    arrays: plan.arrays.map((a) => (flat.includes(a) ? { ...a, tiltDeg, azimuthDeg } : a)),
  };
  const alt = runEngine(tilted);
  const e = effectOf(base, alt, reservePct);
  if (e.score <= 0 && !e.fixes) return null;
  const gain = base.summary.solarWh > 0 ? Math.round(((alt.summary.solarWh - base.summary.solarWh) / base.summary.solarWh) * 100) : 0;
  return {
    kind: 'tilt',
    title: `Tilt the flat panels about ${tiltDeg}° toward the ${lat >= 0 ? 'south' : 'north'}`,
    effect: `${e.text}${gain > 0 ? ` Solar harvest +${gain} %.` : ''}`,
    detail: `${flat.map((a) => a.name).join(', ')} lie flat; worked out by running the forecast again with the panels tilted. Tilt mounts must be secured before driving.`,
    fixes: e.fixes,
    score: e.score,
  };
}

function driveAdvice(plan: ResolvedPlan, base: Forecast, prepared: PreparedTrip, reservePct: number): AdviceChange | null {
  const alternator = plan.chargers.filter((c) => c.kind === 'alternator').reduce((s, c) => s + c.amps, 0);
  if (alternator <= 0) return null;
  const problem = firstProblemRow(base, reservePct);
  if (problem < 0) return null;
  const { grid } = prepared;
  const driveDates = new Set(plan.drives.map((d) => d.date));
  // The last 10:00 before the trouble, at a camp day with room for a two-hour drive.
  for (let r = problem - 2; r >= 0; r--) {
    if (grid.localHour[r] !== 10 || grid.driving[r] === 1 || grid.driving[r + 1] === 1) continue;
    const p = localParts(at(grid.time, r, 'hour of the trip'));
    if (!p || driveDates.has(p.date)) continue;
    const drive = { date: p.date, startHour: 10, hours: 2 };
    const v = validatePlan({ ...plan, drives: [...plan.drives, drive].sort((a, b) => a.date.localeCompare(b.date)) });
    if (!v.ok) return null;
    const alt = runEngine(v.plan);
    const e = effectOf(base, alt, reservePct);
    if (e.score <= 0 && !e.fixes) return null;
    return {
      kind: 'drive',
      title: `Drive 2 h on ${formatDay(p.date)} from 10:00`,
      effect: e.text,
      detail: `The ${alternator} A DC-DC charger charges while the engine runs (a run to town and back counts); that day also counts as a drive day for loads.`,
      fixes: e.fixes,
      score: e.score,
    };
  }
  return null;
}

// ---------------------------------------------------------------------------------------------
// The cold (Revision 2): where the bank sits, self-heating, capacity, one more panel, the furnace

/** A trip is cold when some hour's air is at or below this, °C (LiFePO4 cells near freezing: common practice). */
export const COLD_TRIP_C = 5;
/** Ah the capacity fix adds (one more 100 Ah battery in parallel). */
export const EXTRA_AH = 100;
/** Degrees the furnace fix lowers each heating load's setpoint by. */
export const SETPOINT_STEP_C = 3;
/** Largest panel the "+1 panel" fix assumes an array is made of, W (common practice: 100–200 W RV panels). */
export const ASSUMED_MAX_PANEL_W = 200;

/** The panel an array is assumed to be made of: its watts split into the fewest panels of at most 200 W. */
export function assumedPanelWatts(ratedWatts: number): { panelWatts: number; panels: number } {
  const panels = Math.max(1, Math.ceil(ratedWatts / ASSUMED_MAX_PANEL_W));
  return { panelWatts: ratedWatts / panels, panels };
}

/** Whether a trip is cold enough for the cold fixes: some hour at or below `COLD_TRIP_C`, or charge refused in the cold. */
export function isColdTrip(f: Forecast): boolean {
  return f.summary.coldBlockedHours > 0 || f.hourly.some((r) => r.ambientC <= COLD_TRIP_C);
}

interface ColdChange {
  kind: ColdFixKind;
  title: string;
  short: string;
  how: string;
  caution?: string;
  plan: ResolvedPlan;
}

/** The cold fixes that apply to this rig, each as the whole plan with only that change; temperatures in the user's units. */
export function coldChanges(plan: ResolvedPlan, units: Units = 'metric'): ColdChange[] {
  const out: ColdChange[] = [];
  const bank = plan.bank;
  const heating = plan.loads.filter((l) => l.response === 'heating');
  if (bank.location !== 'cabin') {
    out.push({
      kind: 'bank-cabin',
      title: 'Move the bank into the heated cabin',
      short: 'the bank in the heated cabin',
      how: heating.length > 0
        ? 'the bank inside, where it follows the cabin’s air while the furnace has power'
        : 'the bank inside (with no heating load in the plan the cabin follows the outdoor air)',
      caution: [CAUTIONS.wiring, bank.chemistry === 'flooded' ? CAUTIONS.ventedBox : ''].filter(Boolean).join(' '),
      plan: { ...plan, bank: { ...bank, location: 'cabin', insideHeatedSpace: true } },
    });
  }
  if (bank.chemistry === 'lifepo4' && !bank.selfHeating) {
    out.push({
      kind: 'self-heating',
      title: 'A self-heating LiFePO4 battery',
      short: 'a self-heating battery',
      how: `a bank that warms its cells and takes charge below ${formatTemp(0, units)} (its heater’s own draw is not modelled)`,
      caution: coldCaution(units),
      plan: { ...plan, bank: { ...bank, selfHeating: true } },
    });
  }
  const cap = bank.capacityAh + EXTRA_AH;
  out.push({
    kind: 'more-capacity',
    title: `Add ${EXTRA_AH} Ah to the bank`,
    short: `${EXTRA_AH} Ah more`,
    how: `a ${Math.round(cap)} Ah bank of the same chemistry, its charge limit and resistance scaled with its size, starting at the same state of charge`,
    caution: CAUTIONS.wiring,
    plan: { ...plan, bank: { ...bank, capacityAh: cap, maxChargeAmps: (bank.maxChargeAmps * cap) / bank.capacityAh } },
  });
  const biggest = plan.arrays.reduce<number>((best, a, i) => (a.ratedWatts > (plan.arrays[best]?.ratedWatts ?? 0) ? i : best), 0);
  const array = plan.arrays[biggest];
  if (array && array.ratedWatts > 0) {
    const { panelWatts, panels } = assumedPanelWatts(array.ratedWatts);
    out.push({
      kind: 'more-solar',
      title: `Add one more ${Math.round(panelWatts)} W panel to ${array.name}`,
      short: `one more ${Math.round(panelWatts)} W panel`,
      how: `${array.name} at ${Math.round(array.ratedWatts + panelWatts)} W on the same mounting and controller (its ${Math.round(array.ratedWatts)} W read as ${panels} × ${Math.round(panelWatts)} W panels)`,
      caution: CAUTIONS.wiring,
      plan: { ...plan, arrays: plan.arrays.map((a, i) => (i === biggest ? { ...a, ratedWatts: a.ratedWatts + panelWatts } : a)) },
    });
  }
  if (heating.length > 0) {
    const names = joinAnd(heating.map((l) => l.name));
    out.push({
      kind: 'setpoint',
      title: `Set the heating ${formatTempDelta(SETPOINT_STEP_C, units)} lower`,
      short: `heating ${formatTempDelta(SETPOINT_STEP_C, units)} lower`,
      how: `${names} at ${joinAnd([...new Set(heating.map((l) => formatTemp(l.setpointC - SETPOINT_STEP_C, units)))])} instead of ${joinAnd([...new Set(heating.map((l) => formatTemp(l.setpointC, units)))])}; a cabin bank then sits that much cooler too`,
      plan: { ...plan, loads: plan.loads.map((l) => (l.response === 'heating' ? { ...l, setpointC: Math.max(-30, l.setpointC - SETPOINT_STEP_C) } : l)) },
    });
  }
  return out;
}

/** The cold fixes of a cold trip, each measured by running the forecast again; null on a trip that is not cold. */
export function coldAdvice(plan: ResolvedPlan, base: Forecast, reservePct: number, units: Units = 'metric'): ColdAdvice | null {
  if (!isColdTrip(base)) return null;
  const fixes: ColdFix[] = [];
  for (const c of coldChanges(plan, units)) {
    let alt: Forecast;
    try {
      alt = runEngine(c.plan);
    } catch {
      continue; // a change the engine refuses is advice we cannot measure: left out
    }
    const e = measureEffect(base, alt, reservePct);
    // The lowest usable charge compares like with like only when the changed plan keeps the bank
    // connected: after a cutoff the furnace stops, the bank cools and strands charge either way.
    const usable = alt.summary.firstCutoffAt === null ? `Lowest usable charge ${pct(base.summary.minUsablePct)} → ${pct(alt.summary.minUsablePct)}. ` : '';
    fixes.push({
      kind: c.kind,
      title: c.title,
      short: c.short,
      effect: effectText(e),
      detail: `${usable}Worked out by running the forecast again with ${c.how}.`,
      ...(c.caution ? { caution: c.caution } : {}),
      fixes: e.fixes,
      score: e.score,
      minUsablePct: alt.summary.minUsablePct,
      forecast: alt,
    });
  }
  fixes.sort((a, b) => Number(b.fixes) - Number(a.fixes) || b.score - a.score || b.minUsablePct - a.minUsablePct);
  return { fixes, alone: coldAloneText(isFine(base, reservePct), fixes), baseMinUsablePct: base.summary.minUsablePct };
}

// ---------------------------------------------------------------------------------------------

/** The advice for a forecast: biggest loads, the two or three changes that matter most, and warnings with their cautions (temperatures in `units`). */
export function advise(plan: ResolvedPlan, forecast: Forecast, reserveSocPct?: number | null, units: Units = 'metric'): Advice {
  const reservePct = reserveOf(forecast, plan, reserveSocPct);
  const prepared = prepareTrip(plan);
  const { loads, totalWhPerDay } = loadUse(prepared);
  const candidates: AdviceChange[] = [];
  const tryAdd = (fn: () => AdviceChange | null) => {
    try {
      const c = fn();
      if (c) candidates.push(c);
    } catch {
      // A variant the engine refuses is advice we cannot measure: leave it out.
    }
  };
  tryAdd(() => generatorAdvice(prepared, forecast, reservePct));
  tryAdd(() => shadeAdvice(plan, forecast, reservePct));
  tryAdd(() => tiltAdvice(plan, forecast, reservePct));
  tryAdd(() => driveAdvice(plan, forecast, prepared, reservePct));
  candidates.sort((a, b) => b.score - a.score);
  return {
    topLoads: loads.slice(0, 3),
    totalWhPerDay,
    changes: candidates.slice(0, 3),
    cold: coldAdvice(plan, forecast, reservePct, units),
    warnings: warningsOf(forecast, units),
  };
}

