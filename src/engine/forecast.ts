// The contract's forecast JSON (forecast-engine.md, "Contract") and the engine's entry points.
import { zodIssuesToEnvelope, type InvalidPlanEnvelope } from './errors';
import { prepareTrip, type PreparedTrip } from './prepare';
import { planSchema, type ResolvedPlan } from './schema';
import { simulatePrepared, type SimResult, type Variant } from './simulate';

/** One hour of the forecast: watts are hour averages, `socPct` and `volts` are at the hour's end. */
export interface HourlyRow {
  time: string;
  socPct: number;
  volts: number;
  solarWatts: number;
  chargeWatts: number;
  loadWatts: number;
  unmetWatts: number;
  curtailedWatts: number;
  ambientC: number;
  sunAltitudeDeg: number;
  poaWm2: number;
  /** Added: index into `stops` of the stop that owns the hour. */
  stop: number;
  /** Added: the hour is a drive hour (alternator charging). */
  driving: boolean;
  /** Added: the generator runs this hour. */
  generatorOn: boolean;
  /** Added: the bank is disconnected for some or all of the hour. */
  disconnected: boolean;
  /** Added: battery temperature, °C (Revision 2: with thermal lag). */
  batteryC: number;
  /** Revision 2: usable charge at the hour's end, % of rated (cold strands the bottom of the bank). */
  usablePct: number;
  /** Revision 2: the hour's lowest terminal volts, its biggest appliance's surge included. */
  minVolts: number;
  /** Added (Revision 2): the cabin's temperature, °C. */
  cabinC: number;
  /** Added (optional: snapshots saved before it lack it): the part of `curtailedWatts` refused because the bank was too cold (a warm bank would have taken it). */
  curtailedColdWatts?: number;
  /** Added: the part of `curtailedWatts` refused because the bank was (nearly) full (its taper). */
  curtailedFullWatts?: number;
  /** Added: the part of `curtailedWatts` above the bank's maximum charge current, with room left. */
  curtailedLimitWatts?: number;
}

/** One local day; Wh are sums of its hours, minimums use end-of-hour SOC. */
export interface DayRow {
  date: string;
  loadWh: number;
  solarWh: number;
  chargeWh: number;
  netWh: number;
  minSocPct: number;
  endSocPct: number;
  /** Added. */
  unmetWh: number;
  /** Added. */
  curtailedWh: number;
  /** Added: curtailedWh by cause (too cold, full, charge-current limit), sums of the hours' parts. */
  curtailedColdWh?: number;
  curtailedFullWh?: number;
  curtailedLimitWh?: number;
}

/** Whole-trip figures. */
export interface ForecastSummary {
  minSocPct: number;
  minSocAt: string;
  firstCutoffAt: string | null;
  unmetWh: number;
  solarWh: number;
  curtailedWh: number;
  generatorHours: number;
  generatorLitres: number;
  endSocPct: number;
  hoursSimulated: number;
  /** Added. */
  startSocPct: number;
  /** Added: the bank's floor (the reserve the chart shades). */
  floorSocPct: number;
  /** Added. */
  loadWh: number;
  /** Added. */
  chargeWh: number;
  /** Added: hours in which the cold lockout refused charge. */
  coldBlockedHours: number;
  /** Revision 2: the trip's lowest terminal volts and the row where it happens. */
  minVolts: number;
  minVoltsAt: string;
  /** Added (Revision 2): the lowest end-of-hour usable charge, %. */
  minUsablePct: number;
  /** Added: curtailedWh by cause (too cold, full, charge-current limit). */
  curtailedColdWh?: number;
  curtailedFullWh?: number;
  curtailedLimitWh?: number;
}

/** The engine revision whose rules made a forecast (forecast-engine.md, "Revision 2"). */
export const ENGINE_REVISION = 2;

/** A plain-English warning at a row's `time`. */
export interface ForecastWarning {
  code: string;
  at: string;
  message: string;
}

/** The forecast JSON of the contract. */
export interface Forecast {
  hourly: HourlyRow[];
  days: DayRow[];
  summary: ForecastSummary;
  warnings: ForecastWarning[];
  /** Added: the stops `hourly[].stop` points into. */
  stops: { name: string; timeZone: string }[];
  /** The engine revision that made this forecast (2). */
  engineRevision: number;
}

// Rounding per the contract: watts whole, SOC 0.1, volts 0.01. `+ 0` turns −0 into 0 and a
// non-finite value (which the engine should never produce) becomes 0 rather than NaN in JSON.
export function r0(x: number): number {
  return Number.isFinite(x) ? Math.round(x) + 0 : 0;
}
export function r1(x: number): number {
  return Number.isFinite(x) ? Math.round(x * 10) / 10 + 0 : 0;
}
export function r2(x: number): number {
  return Number.isFinite(x) ? Math.round(x * 100) / 100 + 0 : 0;
}

const WARNING_ORDER: Record<string, number> = {
  'weather-ignored': 0,
  'weather-assumed': 1,
  'floor-cutoff': 2,
  'voltage-cutoff': 3,
  'surge-cutoff': 3,
  'voltage-collapse': 3,
  'cold-charge-blocked': 4,
  'inverter-overload': 5,
};

/** Builds the contract's JSON from a prepared trip and one simulation of it. */
export function toForecast(prepared: PreparedTrip, sim: SimResult): Forecast {
  const { n, grid } = prepared;
  const hourly: HourlyRow[] = new Array<HourlyRow>(n);
  for (let r = 0; r < n; r++) {
    hourly[r] = {
      time: grid.time[r]!,
      socPct: r1(sim.socEndPct[r]!),
      volts: r2(sim.volts[r]!),
      solarWatts: r0(sim.solarW[r]!),
      chargeWatts: r0(sim.chargeW[r]!),
      loadWatts: r0(sim.loadW[r]!),
      unmetWatts: r0(sim.unmetW[r]!),
      curtailedWatts: r0(sim.curtailedW[r]!),
      ambientC: r1(prepared.ambientC[r]!),
      sunAltitudeDeg: r1(prepared.sunAltitudeDeg[r]!),
      poaWm2: r0(prepared.poaWm2[r]!),
      stop: grid.stop[r]!,
      driving: grid.driving[r]! === 1,
      generatorOn: sim.generatorOn[r]! === 1,
      disconnected: sim.disconnected[r]! === 1,
      batteryC: r1(sim.batteryC[r]!),
      usablePct: r1(sim.usablePct[r]!),
      minVolts: r2(sim.minVolts[r]!),
      cabinC: r1(sim.cabinC[r]!),
      curtailedColdWatts: r0(sim.curtailedColdW[r]!),
      curtailedFullWatts: r0(sim.curtailedFullW[r]!),
      curtailedLimitWatts: r0(sim.curtailedLimitW[r]!),
    };
  }

  return { hourly, ...forecastTotals(prepared, sim) };
}

/** Everything of the forecast but its hours: days, summary, warnings, stops and the revision. */
export function forecastTotals(prepared: PreparedTrip, sim: SimResult): Omit<Forecast, 'hourly'> {
  const { n, grid } = prepared;
  // Day sums come from unrounded values.
  const nd = prepared.days.length;
  const acc = prepared.days.map(() => ({ load: 0, solar: 0, charge: 0, unmet: 0, curtailed: 0, cold: 0, full: 0, limit: 0, min: Infinity, end: 0, seen: false }));
  for (let r = 0; r < n; r++) {
    const d = acc[prepared.dayIndex[r]!]!;
    d.load += sim.loadW[r]!;
    d.solar += sim.solarW[r]!;
    d.charge += sim.chargeW[r]!;
    d.unmet += sim.unmetW[r]!;
    d.curtailed += sim.curtailedW[r]!;
    d.cold += sim.curtailedColdW[r]!;
    d.full += sim.curtailedFullW[r]!;
    d.limit += sim.curtailedLimitW[r]!;
    if (sim.socEndPct[r]! < d.min) d.min = sim.socEndPct[r]!;
    d.end = sim.socEndPct[r]!;
    d.seen = true;
  }
  const days: DayRow[] = [];
  for (let i = 0; i < nd; i++) {
    const d = acc[i]!;
    if (!d.seen) continue;
    days.push({
      date: prepared.days[i]!,
      loadWh: r0(d.load),
      solarWh: r0(d.solar),
      chargeWh: r0(d.charge),
      netWh: r0(d.solar + d.charge - d.load),
      minSocPct: r1(d.min),
      endSocPct: r1(d.end),
      unmetWh: r0(d.unmet),
      curtailedWh: r0(d.curtailed),
      curtailedColdWh: r0(d.cold),
      curtailedFullWh: r0(d.full),
      curtailedLimitWh: r0(d.limit),
    });
  }

  const s = sim.summary;
  const summary: ForecastSummary = {
    minSocPct: r1(s.minSocPct),
    minSocAt: grid.time[s.minSocRow] ?? grid.time[0] ?? '',
    firstCutoffAt: s.firstCutoffRow === null ? null : (grid.time[s.firstCutoffRow] ?? null),
    unmetWh: r0(s.unmetWh),
    solarWh: r0(s.solarWh),
    curtailedWh: r0(s.curtailedWh),
    generatorHours: s.generatorHours,
    generatorLitres: r2(s.generatorLitres),
    endSocPct: r1(s.endSocPct),
    hoursSimulated: n,
    startSocPct: r1(s.startSocPct),
    floorSocPct: r1(sim.bank.floorSocPct),
    loadWh: r0(s.loadWh),
    chargeWh: r0(s.chargeWh),
    coldBlockedHours: s.coldBlockedHours,
    minVolts: r2(s.minVolts),
    minVoltsAt: grid.time[s.minVoltsRow] ?? grid.time[0] ?? '',
    minUsablePct: r1(s.minUsablePct),
    curtailedColdWh: r0(s.curtailedColdWh),
    curtailedFullWh: r0(s.curtailedFullWh),
    curtailedLimitWh: r0(s.curtailedLimitWh),
  };

  const all = [...prepared.warnings, ...sim.warnings];
  all.sort((a, b) => a.row - b.row || (WARNING_ORDER[a.code] ?? 9) - (WARNING_ORDER[b.code] ?? 9));
  const warnings = all.map((w) => ({ code: w.code, at: grid.time[w.row] ?? '', message: w.message }));

  return {
    days,
    summary,
    warnings,
    stops: prepared.plan.stops.map((st) => ({ name: st.name, timeZone: st.timeZone })),
    engineRevision: ENGINE_REVISION,
  };
}

/** Outcome of validating an untrusted plan. */
export type ValidationResult = { ok: true; plan: ResolvedPlan } | { ok: false; envelope: InvalidPlanEnvelope };

/** Validates an untrusted plan (parsed JSON) and applies every default, or returns the 400 envelope. */
export function validatePlan(input: unknown): ValidationResult {
  const parsed = planSchema.safeParse(input);
  if (parsed.success) return { ok: true, plan: parsed.data };
  return { ok: false, envelope: zodIssuesToEnvelope(parsed.error.issues) };
}

/** Forecast of a validated plan (defaults applied), optionally for a variant of it. */
export function forecast(plan: ResolvedPlan, variant?: Variant): Forecast {
  const prepared = prepareTrip(plan);
  return toForecast(prepared, simulatePrepared(prepared, variant));
}

/** Outcome of a forecast of an untrusted plan. */
export type RunResult = { ok: true; forecast: Forecast } | { ok: false; envelope: InvalidPlanEnvelope };

/** Validates an untrusted plan and forecasts it: the one call an API route needs. */
export function runForecast(input: unknown): RunResult {
  const v = validatePlan(input);
  if (!v.ok) return v;
  return { ok: true, forecast: forecast(v.plan) };
}
