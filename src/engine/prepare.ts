// Stage one of a forecast: everything that does not depend on the bank, the arrays' rated
// watts or the chargers' amps — the grid, ownership, weather, ambient temperature, sun position
// at every sub-step, plane-of-array irradiance and DC output per rated watt for every array,
// and each hour's load demand. An upgrade sweep prepares once and simulates many variants.
import { ambientForRow } from './ambient';
import { inGeneratorWindow } from './chargers';
import { inverterDcWatts, runsOnDay, windowMask, dutyAt, windowFraction } from './loads';
import type { ResolvedArray, ResolvedPlan } from './schema';
import { cosIncidenceTrig, extraterrestrial, haurwitz, kastenCzeplak, poaIsotropicCos, splitErbs } from './sun';
import { cellTempNoct, dcPerWatt } from './pv';
import { getPosition } from 'suncalc';
import { buildGrid, type Grid } from './timeline';
import { dayOfYear, HOUR_MS, isoDate } from './tz';
import { assumedMessage, ignoredMessage, resolveStopWeather, type DayWeather } from './weather';

/** Solar sub-steps per hour: midpoints of 6 equal slices (forecast-engine.md asks for at least 6). */
export const SUBSTEPS = 6;
/** Battery sub-steps per hour (Revision 2: at least 12); each uses the solar sub-step it lies in. */
export const BATTERY_SUBSTEPS = 12;

/**
 * Midpoint altitude (apparent, degrees) below which an hour at this latitude has no sun at all,
 * so its sub-steps can be skipped. The altitude changes at most ω·cos φ (dh/dt = ω·cos φ·sin A,
 * ω ≈ 15.04°/h), so 7.55°·cos φ in half an hour; 0.6° more covers suncalc's refraction at the
 * horizon (0.48°).
 */
export function darkBelowDeg(latDeg: number): number {
  return -(7.55 * Math.cos((latDeg * Math.PI) / 180) + 0.6);
}

const RAD = Math.PI / 180;

// Offsets of one cabin state's accumulators in prepareTrip's scratch array.
const A_DC = 0;
const A_AC = 1;
const A_PEAK_ALL = 2;
const A_PEAK_ALL_AVG = 3;
const A_PEAK_DC = 4;
const A_PEAK_DC_AVG = 5;
const A_AC_PEAK = 6;
const A_AC_PEAK_AVG = 7;
const ACC = 8;

/** A warning tied to a row (the row's `time` becomes its `at`). */
export interface RowWarning {
  code: string;
  row: number;
  message: string;
}

/** One array's cached output per rated watt (DC, after losses, before the controller). */
export interface PreparedArray {
  spec: ResolvedArray;
  /** Hour-average W per rated W. */
  perWatt: Float64Array;
  /** Largest sub-step W per rated W in the hour (decides whether the controller cap can bind). */
  perWattMax: Float64Array;
  /**
   * W per rated W at each sub-step, row-major (n × SUBSTEPS). MPPT: DC output with the power
   * temperature coefficient. PWM (Revision 2): POA/1000·(1 − losses), no temperature coefficient
   * (the panel's current is (rated/Vmp) × this).
   */
  perWattSub: Float64Array;
}

/** Load demand of every row in one cabin state (heating without power, or with power). */
export interface PreparedDemand {
  /** DC loads, W. */
  dcW: Float64Array;
  /** AC loads before the inverter, W. */
  acW: Float64Array;
  /** The biggest single unit at full draw among all loads (AC through the inverter's efficiency), DC W. */
  peakAllW: Float64Array;
  /** That unit's average DC W in the hour. */
  peakAllAvgW: Float64Array;
  /** The same among DC loads only (AC served from shore or a generator). */
  peakDcW: Float64Array;
  peakDcAvgW: Float64Array;
  /** 1 when the AC loads can overload the inverter (continuous or surge rating). */
  inverterOverload: Uint8Array;
}

/** A trip prepared for simulation: the plan, its grid and every per-hour input of the battery loop. */
export interface PreparedTrip {
  plan: ResolvedPlan;
  grid: Grid;
  n: number;
  ambientC: Float64Array;
  sunAltitudeDeg: Float64Array;
  /** The first array's hour-average plane-of-array irradiance after shade, W/m² (0 with no array). */
  poaWm2: Float64Array;
  arrays: PreparedArray[];
  /** DC loads, W. */
  dcLoadW: Float64Array;
  /** What the inverter draws from the bank for the AC loads (losses and idle included), W. */
  acBankW: Float64Array;
  /** Revision 2: the cabin's temperature when its heating loads have power (= ambient without them). */
  cabinHeatedC: Float64Array;
  /** Revision 2: demand with the cabin at ambient ([0]) and with heating powered ([1]). */
  demand: [PreparedDemand, PreparedDemand];
  /** Revision 2: fraction of each row inside a drive (alternator charging). */
  driveFrac: Float64Array;
  /** 1 at a hookup stop outside drive hours: shore charging, AC loads off the bank. */
  shore: Uint8Array;
  /** 1 where the plan's generator may run (window, no hookup, not driving). */
  generatorAllowed: Uint8Array;
  /** 1 where the owning stop has no hookup and the row is not a drive hour (window not applied). */
  generatorSite: Uint8Array;
  /** Index into `days` of each row. */
  dayIndex: Uint16Array;
  /** Local dates of the forecast, ascending. */
  days: string[];
  warnings: RowWarning[];
}

/**
 * The part of a trip that depends only on where and when it is and how its panels are aimed: the
 * grid, the days, drive hours and the sun at every sub-step with its clear-sky irradiance and its
 * angle on every array. Weather, shade, loads, the bank and the chargers do not enter it, so one
 * value serves every weather (the "how sure is this?" band) and can be kept by a cache keyed by
 * `sunKey(plan)`. Read-only once made.
 */
export interface PreparedSun {
  /** `sunKey` of the plan it was made from. */
  key: string;
  grid: Grid;
  n: number;
  /** Local dates (day numbers) of the forecast, ascending; `dayIndex` points into it. */
  dayList: number[];
  dayIndex: Uint16Array;
  /** Per stop: the local days it owns an hour of, in order. */
  ownedDays: number[][];
  /** `${stop}|${day}` → the first row of that stop-day. */
  firstRowOfStopDay: Map<string, number>;
  /** Per stop: its first row, or −1 when it owns none. */
  firstRowOfStop: number[];
  driveFrac: Float64Array;
  /** Sun altitude at each row's midpoint, degrees (apparent). */
  sunAltitudeDeg: Float64Array;
  /** Minutes past the local clock hour at each row's start, as a fraction (0 but after a move to a zone with another minute offset). */
  minuteFrac: Float64Array;
  /** 1 where some sub-step of the row can have sun on an array (always 0 without arrays). */
  lit: Uint8Array;
  /** Extraterrestrial irradiance of each row's local day, W/m². */
  e0: Float64Array;
  /** Per row × sub-step: cos of the zenith angle and the Haurwitz clear-sky GHI (0 where dark). */
  cosZSub: Float64Array;
  clearSub: Float64Array;
  /** Per row: the sum of the hour's six clear-sky GHI sub-steps. */
  clearSum: Float64Array;
  /** Per array, per row × sub-step: cos of the angle of incidence on the panel. */
  cosIncSub: Float64Array[];
}

/**
 * The cache key of a trip's prepared sun: every plan field `prepareSun` reads (places, time zones,
 * dates, arrival hours, drives and the arrays' tilt, azimuth and aim), and nothing else.
 */
export function sunKey(plan: ResolvedPlan): string {
  return JSON.stringify([
    plan.stops.map((s) => [s.lat, s.lon, s.timeZone, s.arrive, s.nights, s.arriveHour]),
    plan.drives,
    plan.arrays.map((a) => [a.tiltDeg, a.azimuthDeg, a.aim]),
  ]);
}

/** The sun of a validated plan (see PreparedSun). The CPU-heavy part: thousands of sun positions. */
export function prepareSun(plan: ResolvedPlan): PreparedSun {
  const grid = buildGrid(plan.stops, plan.drives);
  const n = grid.n;
  const daySet = new Set<number>();
  const ownedDays: number[][] = plan.stops.map(() => []);
  const firstRowOfStopDay = new Map<string, number>();
  const firstRowOfStop: number[] = plan.stops.map(() => -1);
  for (let r = 0; r < n; r++) {
    const s = grid.stop[r]!;
    const d = grid.localDay[r]!;
    daySet.add(d);
    const key = `${s}|${d}`;
    if (!firstRowOfStopDay.has(key)) {
      firstRowOfStopDay.set(key, r);
      ownedDays[s]!.push(d);
    }
    if (firstRowOfStop[s]! < 0) firstRowOfStop[s] = r;
  }
  const dayList = [...daySet].sort((a, b) => a - b);
  const dayPos = new Map<number, number>(dayList.map((d, i) => [d, i]));
  const dayIndex = new Uint16Array(n);
  const driveFrac = new Float64Array(n);
  const sunAltitudeDeg = new Float64Array(n);
  const minuteFrac = new Float64Array(n);
  const lit = new Uint8Array(n);
  const e0 = new Float64Array(n);
  const cosZSub = new Float64Array(n * SUBSTEPS);
  const clearSub = new Float64Array(n * SUBSTEPS);
  const clearSum = new Float64Array(n);
  const na = plan.arrays.length;
  const cosIncSub = plan.arrays.map(() => new Float64Array(n * SUBSTEPS));
  const follow = plan.arrays.map((a) => a.aim === 'follow');
  const cosTilt = plan.arrays.map((a) => Math.cos(a.tiltDeg * RAD));
  const sinTilt = plan.arrays.map((a) => Math.sin(a.tiltDeg * RAD));
  const drives = grid.timeline.drives;
  // suncalc 2.x directly (see sun.ts sunPosition for its conventions), with one reused Date:
  // thousands of sub-steps per trip make allocation show up in the timings.
  const dark = plan.stops.map((st) => darkBelowDeg(st.lat));
  const date = new Date(0);
  for (let r = 0; r < n; r++) {
    const s = grid.stop[r]!;
    const stop = plan.stops[s]!;
    const day = grid.localDay[r]!;
    dayIndex[r] = dayPos.get(day) ?? 0;
    const t0 = grid.startMs + r * HOUR_MS;
    let df = 0;
    for (const d of drives) {
      const lo = Math.max(d.startMs, t0);
      const hi = Math.min(d.endMs, t0 + HOUR_MS);
      if (hi > lo) df += (hi - lo) / HOUR_MS;
    }
    driveFrac[r] = Math.min(1, df);
    const local = t0 + grid.offsetMin[r]! * 60_000;
    minuteFrac[r] = (((local % HOUR_MS) + HOUR_MS) % HOUR_MS) / HOUR_MS;
    // ---- sun at the midpoint (reported) ----
    date.setTime(t0 + HOUR_MS / 2);
    const mid = getPosition(date, stop.lat, stop.lon);
    sunAltitudeDeg[r] = mid.altitude;
    if (na === 0 || mid.altitude < dark[s]!) continue;
    lit[r] = 1;
    e0[r] = extraterrestrial(dayOfYear(day));
    // ---- sun and clear sky at each sub-step (forecast-engine.md steps 1–3), incidence (step 6) ----
    let sum = 0;
    for (let k = 0; k < SUBSTEPS; k++) {
      const i = r * SUBSTEPS + k;
      date.setTime(t0 + ((k + 0.5) * HOUR_MS) / SUBSTEPS);
      const p = getPosition(date, stop.lat, stop.lon);
      const cosZ = Math.sin(p.altitude * RAD);
      cosZSub[i] = cosZ;
      const clear = haurwitz(cosZ);
      clearSub[i] = clear;
      sum += clear;
      if (!(cosZ > 0)) continue;
      const sinZ = Math.sqrt(Math.max(0, 1 - cosZ * cosZ));
      for (let a = 0; a < na; a++) {
        // Step 6: a panel that follows the sun faces the sun's azimuth at every sub-step.
        const cosDaz = follow[a] ? 1 : Math.cos((p.azimuth - plan.arrays[a]!.azimuthDeg) * RAD);
        cosIncSub[a]![i] = cosIncidenceTrig(cosZ, sinZ, cosTilt[a]!, sinTilt[a]!, cosDaz);
      }
    }
    clearSum[r] = sum;
  }
  return {
    key: sunKey(plan),
    grid,
    n,
    dayList,
    dayIndex,
    ownedDays,
    firstRowOfStopDay,
    firstRowOfStop,
    driveFrac,
    sunAltitudeDeg,
    minuteFrac,
    lit,
    e0,
    cosZSub,
    clearSub,
    clearSum,
    cosIncSub,
  };
}

/** Computes once, for a validated plan, everything the battery loop needs per hour. */
export function prepareTrip(plan: ResolvedPlan): PreparedTrip {
  return prepareWithSun(prepareSun(plan), plan);
}

/**
 * The weather's part of a trip on top of its sun: each row's air temperature, the irradiance and
 * every array's output per rated watt, and the weather warnings. It reads the stops' weather, names
 * and shade and the arrays' figures other than their rated watts (see `skyKey`) — not the loads, the
 * bank, the chargers or the hookups — so a re-run of the same trip in the same weather with other
 * loads or another bank can reuse it (the server keeps recent ones by `skyKey`). Read-only once made.
 */
export interface PreparedSky {
  /** `skyKey` of the plan it was made from. */
  key: string;
  /** `sunKey` of the sun it was made on. */
  sunKey: string;
  ambientC: Float64Array;
  /** The first array's hour-average plane-of-array irradiance after shade, W/m² (0 with no array). */
  poaWm2: Float64Array;
  /** Per array: see PreparedArray. */
  perWatt: Float64Array[];
  perWattMax: Float64Array[];
  perWattSub: Float64Array[];
  warnings: RowWarning[];
}

function skyKeyOn(sunKeyOfPlan: string, plan: ResolvedPlan): string {
  // Of an array, what the battery loop reads is left out: its rated watts and its controller's
  // efficiency, current limit and Vmp (and its name).
  const figures = plan.arrays.map(({ ratedWatts: _w, name: _n, controllerEfficiencyPct: _e, controllerMaxAmps: _a, vmpVolts: _v, ...rest }) => rest);
  return JSON.stringify([sunKeyOfPlan, plan.stops, figures]);
}

/**
 * The cache key of a trip's prepared sky: its sun's key, every stop field (weather, names, shade)
 * and every array figure the sky reads (shade, losses, temperature figures, controller kind).
 */
export function skyKey(plan: ResolvedPlan): string {
  return skyKeyOn(sunKey(plan), plan);
}

/** The weather's part of a validated plan on its prepared sun (see PreparedSky). */
export function prepareSky(sun: PreparedSun, plan: ResolvedPlan): PreparedSky {
  const ownSunKey = sunKey(plan);
  if (ownSunKey !== sun.key) throw new RangeError('prepareSky: the plan has other places, dates, drives or array geometry than the prepared sun');
  return buildSky(sun, plan, skyKeyOn(ownSunKey, plan));
}

function buildSky(sun: PreparedSun, plan: ResolvedPlan, key: string): PreparedSky {
  const { grid, n, ownedDays, firstRowOfStopDay, firstRowOfStop } = sun;
  const warnings: RowWarning[] = [];
  const weather = plan.stops.map((stop, s) => {
    const owned = ownedDays[s]!;
    const w = resolveStopWeather(stop.weather, owned);
    // A stop that owns no row still gets its ignored-weather warning, at the row after its arrival.
    const firstRow = firstRowOfStop[s]!;
    const at = firstRow >= 0 ? firstRow : Math.min(n - 1, Math.max(0, Math.ceil((grid.timeline.arrivals[s]! - grid.startMs) / HOUR_MS)));
    if (w.ignoredDates.length > 0) warnings.push({ code: 'weather-ignored', row: at, message: ignoredMessage(stop.name, w.ignoredDates) });
    for (const d of owned) {
      if (w.byDay.get(d)?.assumed) warnings.push({ code: 'weather-assumed', row: firstRowOfStopDay.get(`${s}|${d}`) ?? 0, message: assumedMessage(stop.name, d) });
    }
    return w;
  });

  // ---- per-array constants ----
  const na = plan.arrays.length;
  const perWatt = plan.arrays.map(() => new Float64Array(n));
  const perWattMax = plan.arrays.map(() => new Float64Array(n));
  const perWattSub = plan.arrays.map(() => new Float64Array(n * SUBSTEPS));
  const arrayShade = plan.arrays.map((a) => 1 - a.shadePct / 100);
  const cosTilt = plan.arrays.map((a) => Math.cos(a.tiltDeg * RAD));
  const pwm = plan.arrays.map((a) => a.controller === 'pwm');
  const ambientC = new Float64Array(n);
  const poaWm2 = new Float64Array(n);
  const poaSub = new Float64Array(na);
  for (let r = 0; r < n; r++) {
    const s = grid.stop[r]!;
    const stop = plan.stops[s]!;
    const day = grid.localDay[r]!;
    const hour = grid.localHour[r]!;
    const w = weather[s]!.byDay.get(day) as DayWeather;
    // Revision 2: an hour's `tempC` from a source replaces the ASHRAE profile.
    const givenT = w.tempC ? w.tempC[hour] : NaN;
    const ta = givenT !== undefined && Number.isFinite(givenT) ? givenT : ambientForRow(hour, w.highC, w.lowC);
    ambientC[r] = ta;

    if (na === 0 || sun.lit[r] !== 1) continue;

    // ---- irradiance at each sub-step (forecast-engine.md steps 1–8; the sun from `sun`) ----
    const e0 = sun.e0[r]!;
    const cloud = kastenCzeplak(w.cloudOktas);
    const shadeStop = 1 - stop.shadePct / 100;
    let poaFirstSum = 0;
    const clearSum = sun.clearSum[r]!;
    // Revision 2: an hour's GHI from a source replaces clear sky × clouds, spread over the
    // sub-steps with the hour's clear-sky shape (dropped where that shape is zero).
    const givenGhi = w.ghiWm2 ? w.ghiWm2[hour] : NaN;
    const useGiven = givenGhi !== undefined && Number.isFinite(givenGhi);
    const ghiScale = useGiven ? (clearSum > 0 ? (givenGhi * SUBSTEPS) / clearSum : 0) : cloud;
    for (let k = 0; k < SUBSTEPS; k++) {
      const i = r * SUBSTEPS + k;
      const cosZ = sun.cosZSub[i]!;
      if (!(cosZ > 0)) continue;
      // Steps 3–5: clear sky, clouds (or the given GHI), beam/diffuse split.
      const sky = splitErbs(sun.clearSub[i]! * ghiScale, cosZ, e0);
      for (let a = 0; a < na; a++) {
        const spec = plan.arrays[a]!;
        // Step 6 (the angle of incidence) is in `sun`.
        const cosT = sun.cosIncSub[a]![i]!;
        // Step 7: shade scales the plane-of-array irradiance before the cell temperature.
        const poa = poaIsotropicCos(sky.dni, sky.dhi, sky.ghi, cosT, cosTilt[a]!) * shadeStop * arrayShade[a]!;
        poaSub[a] = poa;
        // Step 8: NOCT cell temperature and DC output per rated watt.
        // PWM (Revision 2): the panel's current follows POA with no temperature coefficient.
        const pw = pwm[a] ? Math.max(0, (poa / 1000) * (1 - spec.lossesPct / 100)) : dcPerWatt(poa, cellTempNoct(ta, poa, spec.nocC), spec.tempCoeffPctPerC, spec.lossesPct);
        const pwSub = perWattSub[a]!;
        const pwHour = perWatt[a]!;
        const pwMax = perWattMax[a]!;
        pwSub[i] = pw;
        pwHour[r] = pwHour[r]! + pw / SUBSTEPS;
        if (pw > pwMax[r]!) pwMax[r] = pw;
      }
      poaFirstSum += poaSub[0]!;
    }
    poaWm2[r] = poaFirstSum / SUBSTEPS;
  }
  return { key, sunKey: sun.key, ambientC, poaWm2, perWatt, perWattMax, perWattSub, warnings };
}

/** Adds one load's hour (its unit's average W and all its units' W) to one cabin state's accumulators. */
function addLoad(acc: Float64Array, o: number, ac: boolean, full: number, fullOverEta: number, invEta: number, unitAvg: number, wts: number): void {
  if (ac) {
    acc[o + A_AC] = acc[o + A_AC]! + wts;
    if (fullOverEta > acc[o + A_PEAK_ALL]!) {
      acc[o + A_PEAK_ALL] = fullOverEta;
      acc[o + A_PEAK_ALL_AVG] = unitAvg / invEta;
    }
    if (full > acc[o + A_AC_PEAK]!) {
      acc[o + A_AC_PEAK] = full;
      acc[o + A_AC_PEAK_AVG] = unitAvg;
    }
  } else {
    acc[o + A_DC] = acc[o + A_DC]! + wts;
    if (full > acc[o + A_PEAK_ALL]!) {
      acc[o + A_PEAK_ALL] = full;
      acc[o + A_PEAK_ALL_AVG] = unitAvg;
    }
    if (full > acc[o + A_PEAK_DC]!) {
      acc[o + A_PEAK_DC] = full;
      acc[o + A_PEAK_DC_AVG] = unitAvg;
    }
  }
}

/**
 * Stage one with the sun already prepared: the plan's weather, shade, loads, hookups and
 * generator windows on top of `sun`. `plan` must have the places, dates, drives and array
 * geometry `sun` was made from (same `sunKey`; anything else may differ, e.g. each past year's
 * weather), otherwise it throws. Cheap next to `prepareSun`: no sun positions.
 */
export function prepareWithSun(sun: PreparedSun, plan: ResolvedPlan): PreparedTrip {
  if (sunKey(plan) !== sun.key) throw new RangeError('prepareWithSun: the plan has other places, dates, drives or array geometry than the prepared sun');
  // A sky made for this plan alone and not kept: it needs no key.
  return buildTrip(sun, buildSky(sun, plan, ''), plan);
}

/**
 * Stage one with the sun and the weather already prepared: the plan's loads, hookups and generator
 * windows on top of `sky` (made by `prepareSky` on this `sun` for a plan with the same `skyKey`;
 * loads, bank, chargers, inverter and rated watts may differ), otherwise it throws.
 */
export function prepareWithSky(sun: PreparedSun, sky: PreparedSky, plan: ResolvedPlan): PreparedTrip {
  if (sky.sunKey !== sun.key || skyKey(plan) !== sky.key) throw new RangeError('prepareWithSky: the plan has other places, dates, weather or arrays than the prepared sky');
  return buildTrip(sun, sky, plan);
}

function buildTrip(sun: PreparedSun, sky: PreparedSky, plan: ResolvedPlan): PreparedTrip {
  const { grid, n, dayList, dayIndex, driveFrac, sunAltitudeDeg } = sun;
  const ambientC = sky.ambientC;
  const arrays: PreparedArray[] = plan.arrays.map((spec, a) => ({ spec, perWatt: sky.perWatt[a]!, perWattMax: sky.perWattMax[a]!, perWattSub: sky.perWattSub[a]! }));

  const cabinHeatedC = new Float64Array(n);
  const newDemand = (): PreparedDemand => ({
    dcW: new Float64Array(n),
    acW: new Float64Array(n),
    peakAllW: new Float64Array(n),
    peakAllAvgW: new Float64Array(n),
    peakDcW: new Float64Array(n),
    peakDcAvgW: new Float64Array(n),
    inverterOverload: new Uint8Array(n),
  });
  const demand: [PreparedDemand, PreparedDemand] = [newDemand(), newDemand()];
  const invEta = plan.inverter.efficiencyPct / 100;
  const dcLoadW = new Float64Array(n);
  const acBankW = new Float64Array(n);
  const shore = new Uint8Array(n);
  const generatorAllowed = new Uint8Array(n);
  const generatorSite = new Uint8Array(n);

  // ---- loads: masks and constant parts once ----
  const loads = plan.loads;
  const nLoads = loads.length;
  const masks = loads.map((l) => windowMask(l.windows));
  const fixedDuty = loads.map((l) => (l.response === 'none' ? dutyAt(l, 0) : -1));
  const heatingIdx: number[] = [];
  loads.forEach((l, i) => {
    if (l.response === 'heating') heatingIdx.push(i);
  });
  const cabinCooling = Uint8Array.from(loads, (l) => (l.response === 'cooling' && l.location === 'cabin' ? 1 : 0));
  const isAc = loads.map((l) => l.supply === 'ac');
  const fullW = loads.map((l) => l.surgeWatts ?? l.watts);
  const fullOverEta = fullW.map((w) => w / invEta);
  const overSurge = loads.map((l) => l.supply === 'ac' && plan.inverter.surgeWatts !== null && l.surgeWatts !== null && l.surgeWatts > plan.inverter.surgeWatts);
  // Whole-hour rows (all rows but those after a move into a zone with another minute offset): the
  // loads on at each local hour of a camp day and of a drive day, in list order, and the highest
  // heating setpoint on then, found once rather than once a row.
  const allLoads = Int32Array.from(loads, (_, i) => i);
  const onAt: Int32Array[] = [];
  const setAt = new Float64Array(48);
  for (let h = 0; h < 24; h++) {
    for (let dd = 0; dd < 2; dd++) {
      const on: number[] = [];
      for (let i = 0; i < nLoads; i++) {
        const l = loads[i]!;
        if (l.quantity === 0 || !runsOnDay(l.days, dd === 1) || ((masks[i]! >>> h) & 1) === 0) continue;
        on.push(i);
      }
      onAt.push(Int32Array.from(on));
      let maxSet = -Infinity;
      for (const i of heatingIdx) {
        const l = loads[i]!;
        if (!runsOnDay(l.days, dd === 1) || ((masks[i]! >>> h) & 1) === 0) continue;
        if (l.setpointC > maxSet) maxSet = l.setpointC;
      }
      setAt[h * 2 + dd] = maxSet;
    }
  }
  // Per-row accumulators for the two cabin states (offsets into `acc`).
  const acc = new Float64Array(2 * ACC);
  for (let r = 0; r < n; r++) {
    const s = grid.stop[r]!;
    const stop = plan.stops[s]!;
    const hour = grid.localHour[r]!;
    const ta = ambientC[r]!;
    const minuteFrac = sun.minuteFrac[r]!;

    const driving = grid.driving[r] === 1;
    const hookup = stop.hookup === 'shore';
    shore[r] = hookup && !driving ? 1 : 0;
    generatorSite[r] = !hookup && !driving ? 1 : 0;
    generatorAllowed[r] = generatorSite[r] === 1 && inGeneratorWindow(hour, stop.generatorHours) ? 1 : 0;

    // ---- loads (Revision 2: cabin temperature, location, fraction of the row, surges) ----
    // One pass computes both cabin states: only cooling loads in the cabin differ between them.
    const isDriveDay = grid.driveDay[r] === 1;
    const wholeHour = minuteFrac === 0;
    let maxSet = -Infinity;
    if (wholeHour) maxSet = setAt[hour * 2 + (isDriveDay ? 1 : 0)]!;
    else {
      for (const i of heatingIdx) {
        const l = loads[i]!;
        if (!runsOnDay(l.days, isDriveDay) || windowFraction(masks[i]!, hour, minuteFrac) <= 0) continue;
        if (l.setpointC > maxSet) maxSet = l.setpointC;
      }
    }
    const cabHeated = maxSet > ta ? maxSet : ta;
    cabinHeatedC[r] = cabHeated;
    acc.fill(0);
    let acSurgeOver0 = false;
    let acSurgeOver1 = false;
    const list = wholeHour ? onAt[hour * 2 + (isDriveDay ? 1 : 0)]! : allLoads;
    for (let j = 0; j < list.length; j++) {
      const i = list[j]!;
      const l = loads[i]!;
      let frac = 1;
      if (!wholeHour) {
        if (l.quantity === 0 || !runsOnDay(l.days, isDriveDay)) continue;
        frac = windowFraction(masks[i]!, hour, minuteFrac);
        if (frac <= 0) continue;
      }
      const fixed = fixedDuty[i]!;
      const ac = isAc[i]!;
      const full = fullW[i]!;
      const fullEta = fullOverEta[i]!;
      if (fixed >= 0) {
        // The same duty in both cabin states.
        const unitAvg = l.watts * fixed * frac;
        if (!(unitAvg > 0)) continue;
        const wts = unitAvg * l.quantity;
        addLoad(acc, 0, ac, full, fullEta, invEta, unitAvg, wts);
        addLoad(acc, ACC, ac, full, fullEta, invEta, unitAvg, wts);
        if (overSurge[i]) acSurgeOver0 = acSurgeOver1 = true;
        continue;
      }
      let duty1: number;
      let duty0: number;
      if (cabinCooling[i] === 1) {
        duty1 = dutyAt(l, cabHeated);
        duty0 = cabHeated === ta ? duty1 : dutyAt(l, ta);
      } else duty1 = duty0 = dutyAt(l, ta); // heating and outside cooling follow the outdoor air
      const unitAvg0 = l.watts * duty0 * frac;
      if (unitAvg0 > 0) {
        addLoad(acc, 0, ac, full, fullEta, invEta, unitAvg0, unitAvg0 * l.quantity);
        if (overSurge[i]) acSurgeOver0 = true;
      }
      const unitAvg1 = l.watts * duty1 * frac;
      if (unitAvg1 > 0) {
        addLoad(acc, ACC, ac, full, fullEta, invEta, unitAvg1, unitAvg1 * l.quantity);
        if (overSurge[i]) acSurgeOver1 = true;
      }
    }
    const cont = plan.inverter.continuousWatts;
    for (let st = 0; st < 2; st++) {
      const o = st * ACC;
      const dm = demand[st as 0 | 1];
      const ac = acc[o + A_AC]!;
      dm.dcW[r] = acc[o + A_DC]!;
      dm.acW[r] = ac;
      dm.peakAllW[r] = acc[o + A_PEAK_ALL]!;
      dm.peakAllAvgW[r] = acc[o + A_PEAK_ALL_AVG]!;
      dm.peakDcW[r] = acc[o + A_PEAK_DC]!;
      dm.peakDcAvgW[r] = acc[o + A_PEAK_DC_AVG]!;
      // The biggest AC unit at full draw plus the others' averages.
      const overCont = cont !== null && ac > 0 && acc[o + A_AC_PEAK]! + (ac - acc[o + A_AC_PEAK_AVG]!) > cont;
      dm.inverterOverload[r] = overCont || (st === 1 ? acSurgeOver1 : acSurgeOver0) ? 1 : 0;
    }
    dcLoadW[r] = demand[1].dcW[r]!;
    acBankW[r] = inverterDcWatts(demand[1].acW[r]!, plan.inverter);
  }

  return {
    plan,
    grid,
    n,
    ambientC,
    cabinHeatedC,
    demand,
    driveFrac,
    sunAltitudeDeg,
    poaWm2: sky.poaWm2,
    arrays,
    dcLoadW,
    acBankW,
    shore,
    generatorAllowed,
    generatorSite,
    dayIndex,
    days: dayList.map(isoDate),
    warnings: sky.warnings.slice(),
  };
}
