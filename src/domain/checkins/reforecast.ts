import { prepareTrip, simulatePrepared, thermalStep, toForecast, validatePlan, type DayRow, type Forecast, type HourlyRow, type PreparedTrip, type ResolvedDrive, type ResolvedPlan, type ResolvedStop, type SimResult } from '../../engine';
import { planTimeline, dayNumber, HOUR_MS, isoDate, localToInstant, offsetMinutes } from '../../engine/light';
import type { CheckInOutcome } from './checkins.schema';
import { at } from '../../lib/invariant';

// The rest of a trip from a check-in: the same plan, starting at the hour of the reading with the
// reading as the bank's state of charge, run by the same engine (which builds for the browser, so
// a phone without signal computes exactly what the server will). Pure.
//
// The engine starts a forecast at a stop's arrival hour and lets a stop stay whole nights, so the
// plan is rewritten: the stop the camper is at "arrives" at the check-in's hour and keeps its
// departure. On the morning a stop is left (before the next arrival or the trip's end) that stop
// has less than a night left; then it runs as a one-night stop cut where it really ends, and the
// rest of the trip runs on from there with the state of charge reached.
//
// Engine revision 2 gives the battery a temperature that lags its surroundings, and the cold
// limits (lockout, stranded charge, lead-acid acceptance) use it. A reading says nothing about
// it, so the re-forecast starts with the temperature the trip's own forecast has at that hour, and
// each piece hands the next the temperature its last hour leads to (not the air's).

export type ReforecastResult = { ok: true; forecast: Forecast; stopIndex: number } | { ok: false; path: 'at'; message: string };

const DAY = 86_400_000;

/** Index of the stop that owns instant `ms`: the last one arrived at by then (the first before any arrival). */
function stopIndexAt(arrivals: readonly number[], stopCount: number, ms: number): number {
  let s = 0;
  while (s + 1 < stopCount && at(arrivals, s + 1, 'stop arrival') <= ms) s++;
  return s;
}

function label(plan: ResolvedPlan, ms: number): string {
  // The owning stop's local time, as the forecast writes it (YYYY-MM-DD HH:MM).
  const tl = planTimeline(plan.stops, plan.drives);
  const stop = at(plan.stops, stopIndexAt(tl.arrivals, plan.stops.length, ms), 'stop');
  const off = offsetMinutes(stop.timeZone, ms);
  const local = new Date(ms + off * 60_000).toISOString();
  return `${local.slice(0, 10)} ${local.slice(11, 16)} at ${stop.name}`;
}

/** Drives (whole hours) that fall inside [from, to), cut to it, in the local terms of the stop owning each one's start. */
function drivesWithin(plan: ResolvedPlan, stops: ResolvedStop[], arrivals: number[], from: number, to: number): ResolvedDrive[] {
  const tl = planTimeline(plan.stops, plan.drives);
  const out: ResolvedDrive[] = [];
  for (const d of tl.drives) {
    const a = Math.max(d.startMs, from);
    const b = Math.min(d.endMs, to);
    if (b <= a) continue;
    const off = offsetMinutes(at(stops, stopIndexAt(arrivals, stops.length, a), 'stop').timeZone, a);
    const local = a + off * 60_000;
    const day = Math.floor(local / DAY);
    out.push({ date: isoDate(day), startHour: Math.floor((local - day * DAY) / HOUR_MS), hours: Math.max(1, Math.ceil((b - a) / HOUR_MS)) });
  }
  return out;
}

interface Run {
  forecast: Forecast;
  prepared: PreparedTrip;
  sim: SimResult;
}

function run(plan: ResolvedPlan): Run | string {
  const v = validatePlan(plan);
  if (!v.ok) return v.envelope.error.message;
  const prepared = prepareTrip(v.plan);
  const sim = simulatePrepared(prepared);
  return { forecast: toForecast(prepared, sim), prepared, sim };
}

/** The battery's temperature at the start of row `k` of a run (k may be one past its last row). */
function batteryCAt(r: Run, k: number): number | undefined {
  if (k <= 0) return r.sim.batteryC[0];
  if (k < r.sim.n) return r.sim.batteryC[k];
  const last = k - 1;
  const tb = r.sim.batteryC[last];
  const around = r.sim.bank.location === 'cabin' ? r.sim.cabinC[last] : r.prepared.ambientC[last];
  return tb === undefined || around === undefined ? undefined : thermalStep(tb, around, r.sim.bank.thermalHours);
}

/** Rows of `f` that start before `endMs`, with the summary and days read from those rows. */
function cut(f: Forecast, endMs: number): Forecast {
  const first = f.hourly[0];
  if (!first) return f;
  const start = Date.parse(first.time);
  const k = Math.max(0, Math.min(f.hourly.length, Math.ceil((endMs - start) / HOUR_MS)));
  return rebuild(f, f.hourly.slice(0, k), f.warnings.filter((w) => Date.parse(w.at) < endMs));
}

/** A forecast made of these rows: summary and days recomputed from them (watts are hour averages, so Wh = W × 1 h). */
function rebuild(base: Forecast, hourly: HourlyRow[], warnings: Forecast['warnings'], stops = base.stops): Forecast {
  const days = new Map<string, DayRow>();
  let minRow: HourlyRow | undefined;
  // The engine's own cutoff events (floor or voltage), as its summary reads them.
  const cutoffs = warnings.filter((w) => w.code === 'floor-cutoff' || w.code === 'voltage-cutoff').map((w) => w.at);
  const cutoff = cutoffs.length ? cutoffs.reduce((a, b) => (Date.parse(b) < Date.parse(a) ? b : a)) : null;
  const sum = { load: 0, solar: 0, charge: 0, unmet: 0, curtailed: 0, cold: 0, full: 0, limit: 0, gen: 0 };
  hourly.forEach((r) => {
    const date = r.time.slice(0, 10);
    const d = days.get(date) ?? { date, loadWh: 0, solarWh: 0, chargeWh: 0, netWh: 0, minSocPct: r.socPct, endSocPct: r.socPct, unmetWh: 0, curtailedWh: 0, curtailedColdWh: 0, curtailedFullWh: 0, curtailedLimitWh: 0 };
    d.loadWh += r.loadWatts;
    d.solarWh += r.solarWatts;
    d.chargeWh += r.chargeWatts;
    d.netWh += r.solarWatts + r.chargeWatts - r.loadWatts;
    d.unmetWh += r.unmetWatts;
    d.curtailedWh += r.curtailedWatts;
    d.curtailedColdWh = (d.curtailedColdWh ?? 0) + (r.curtailedColdWatts ?? 0);
    d.curtailedFullWh = (d.curtailedFullWh ?? 0) + (r.curtailedFullWatts ?? 0);
    d.curtailedLimitWh = (d.curtailedLimitWh ?? 0) + (r.curtailedLimitWatts ?? 0);
    d.minSocPct = Math.min(d.minSocPct, r.socPct);
    d.endSocPct = r.socPct;
    days.set(date, d);
    if (!minRow || r.socPct < minRow.socPct) minRow = r;
    sum.load += r.loadWatts;
    sum.solar += r.solarWatts;
    sum.charge += r.chargeWatts;
    sum.unmet += r.unmetWatts;
    sum.curtailed += r.curtailedWatts;
    sum.cold += r.curtailedColdWatts ?? 0;
    sum.full += r.curtailedFullWatts ?? 0;
    sum.limit += r.curtailedLimitWatts ?? 0;
    if (r.generatorOn) sum.gen++;
  });
  const last = hourly[hourly.length - 1];
  const minVoltsRow = hourly.reduce<HourlyRow | undefined>((m, r) => (!m || r.minVolts < m.minVolts ? r : m), undefined);
  return {
    engineRevision: base.engineRevision,
    hourly,
    days: [...days.values()],
    warnings,
    stops,
    summary: {
      ...base.summary,
      minSocPct: minRow ? minRow.socPct : base.summary.startSocPct,
      minSocAt: minRow ? minRow.time : base.summary.minSocAt,
      firstCutoffAt: cutoff,
      unmetWh: sum.unmet,
      solarWh: sum.solar,
      curtailedWh: sum.curtailed,
      curtailedColdWh: sum.cold,
      curtailedFullWh: sum.full,
      curtailedLimitWh: sum.limit,
      generatorHours: sum.gen,
      endSocPct: last ? last.socPct : base.summary.startSocPct,
      hoursSimulated: hourly.length,
      loadWh: sum.load,
      chargeWh: sum.charge,
      coldBlockedHours: warnings.filter((w) => w.code === 'cold-charge-blocked').length,
      minVolts: minVoltsRow ? minVoltsRow.minVolts : base.summary.minVolts,
      minVoltsAt: minVoltsRow ? minVoltsRow.time : base.summary.minVoltsAt,
      minUsablePct: hourly.length ? Math.min(...hourly.map((r) => r.usablePct)) : base.summary.minUsablePct,
    },
  };
}

/** Loads for a stretch of one local day whose drive-day status the rewritten plan would get wrong. */
function loadsForDay(plan: ResolvedPlan, driveDay: boolean): ResolvedPlan['loads'] {
  return plan.loads.flatMap((l) => {
    if (l.days === 'all') return [l];
    if ((l.days === 'drive') === driveDay) return [{ ...l, days: 'all' as const }];
    return [];
  });
}

/**
 * The forecast from `fromMs` (an hour boundary) to the trip's end with the bank at `socPct`, in
 * pieces when one run cannot say it: the stop's last morning (less than a night left) runs as a
 * one-night stop cut where the stop really ends; a first day whose drive already happened (or
 * a drive that began the day before) keeps the original day's drive-day loads until midnight.
 * Each piece starts with the state of charge the one before ended with.
 */
function span(plan: ResolvedPlan, fromMs: number, socPct: number, batteryC: number | undefined, depth = 0): Forecast | string {
  const tl = planTimeline(plan.stops, plan.drives);
  const s = stopIndexAt(tl.arrivals, plan.stops.length, fromMs);
  const stop = at(plan.stops, s, 'stop');
  const off = offsetMinutes(stop.timeZone, fromMs);
  const local = fromMs + off * 60_000;
  const day = Math.floor(local / DAY);
  const hour = Math.floor((local - day * DAY) / HOUR_MS);
  const bank = { ...plan.bank, initialSocPct: Math.max(0, Math.min(100, socPct)), ...(batteryC !== undefined && { initialBatteryC: Math.max(-60, Math.min(80, batteryC)) }) };
  const rest = plan.stops.slice(s + 1);
  const [next] = rest;
  const isLast = next === undefined;
  const departDay = dayNumber(stop.arrive) + stop.nights;
  const nextDay = next === undefined ? Infinity : dayNumber(next.arrive);
  const weather = stop.weather.filter((w) => dayNumber(w.date) >= day);

  let stops: ResolvedStop[];
  let arrivals: number[];
  let cutAt = tl.endMs;
  if ((isLast && day < departDay) || (!isLast && day < nextDay)) {
    // At least a night of this stop is left (or a gap day before the next one): one run to the end.
    stops = [{ ...stop, arrive: isoDate(day), nights: day < departDay ? departDay - day : nextDay - day, arriveHour: hour, weather }, ...rest];
    arrivals = [fromMs, ...tl.arrivals.slice(s + 1)];
  } else {
    // The morning the stop is left: a one-night stop, cut where the stop really ends.
    stops = [{ ...stop, arrive: isoDate(day), nights: 1, arriveHour: hour, weather }];
    arrivals = [fromMs];
    cutAt = isLast ? tl.endMs : at(tl.arrivals, s + 1, 'next stop arrival');
  }
  const drives = drivesWithin(plan, stops, arrivals, fromMs, cutAt);
  let loads = plan.loads;
  const wasDriveDay = plan.drives.some((d) => dayNumber(d.date) === day);
  if (wasDriveDay !== drives.some((d) => dayNumber(d.date) === day)) {
    // Until midnight, keep the original day's drive-day loads; from midnight the plan says it right.
    cutAt = Math.min(cutAt, localToInstant(stop.timeZone, day + 1, 0));
    loads = loadsForDay(plan, wasDriveDay);
  }
  const r = run({ ...plan, bank, loads, stops, drives: drivesWithin(plan, stops, arrivals, fromMs, Math.min(cutAt, tl.endMs)) });
  if (typeof r === 'string') return r;
  const f = r.forecast;
  const mine = { ...f, hourly: f.hourly.map((r) => ({ ...r, stop: r.stop + s })), stops: plan.stops.map(({ name, timeZone }) => ({ name, timeZone })) };
  const runEnd = fromMs + mine.hourly.length * HOUR_MS;
  const part = runEnd > cutAt ? cut(mine, cutAt) : mine;
  if (cutAt >= tl.endMs) return part;
  if (depth > 4 * plan.stops.length + 8) return 'the trip could not be split into runs';
  const carried = part.hourly.at(-1)?.socPct ?? bank.initialSocPct;
  const later = span(plan, cutAt, carried, batteryCAt(r, part.hourly.length), depth + 1);
  if (typeof later === 'string') return later;
  return rebuild({ ...part, summary: { ...part.summary, startSocPct: bank.initialSocPct } }, [...part.hourly, ...later.hourly], [...part.warnings, ...later.warnings]);
}

/**
 * Re-forecasts the rest of the trip from a reading taken at `atMs` (ms since the epoch) with the
 * bank at `socPct`. The forecast starts at the start of the reading's local hour at the stop the
 * camper is at. A reading before the trip starts or after it ends is refused, naming `at`.
 * `batteryC` is the battery's temperature then; without it, the plan's own forecast at that hour.
 */
export function reforecastFrom(plan: ResolvedPlan, atMs: number, socPct: number, batteryC?: number): ReforecastResult {
  const tl = planTimeline(plan.stops, plan.drives);
  if (!(atMs >= tl.startMs)) return { ok: false, path: 'at', message: `is before the trip starts (${label(plan, tl.startMs)}): check in once you are at camp.` };
  if (atMs >= tl.endMs) return { ok: false, path: 'at', message: `is after the trip ends (${label(plan, tl.endMs - HOUR_MS)}).` };
  const s = stopIndexAt(tl.arrivals, plan.stops.length, atMs);
  const zone = at(plan.stops, s, 'stop').timeZone;
  const local = atMs + offsetMinutes(zone, atMs) * 60_000;
  const day = Math.floor(local / DAY);
  const startMs = Math.max(at(tl.arrivals, s, 'stop arrival'), localToInstant(zone, day, Math.floor((local - day * DAY) / HOUR_MS)));
  const f = span(plan, startMs, socPct, batteryC ?? forecastBatteryC(plan, startMs));
  if (typeof f === 'string') return { ok: false, path: 'at', message: `cannot start a forecast here: ${f}` };
  return { ok: true, forecast: f, stopIndex: s };
}

/** The battery's temperature the plan's own forecast has at the start of the hour at `startMs`. */
function forecastBatteryC(plan: ResolvedPlan, startMs: number): number | undefined {
  const r = run(plan);
  if (typeof r === 'string') return undefined;
  const k = Math.round((startMs - r.prepared.grid.startMs) / HOUR_MS);
  return batteryCAt(r, k);
}

/** The figures a check-in keeps from its re-forecast. */
export function outcomeOf(f: Forecast): CheckInOutcome {
  const s = f.summary;
  const cutRow = s.firstCutoffAt ? f.hourly.find((r) => r.time === s.firstCutoffAt) : undefined;
  const first = s.firstCutoffAt ? Date.parse(s.firstCutoffAt) : NaN;
  const next = f.warnings
    .filter((w) => (w.code === 'floor-cutoff' || w.code === 'voltage-cutoff') && Date.parse(w.at) > first)
    .map((w) => w.at)
    .sort((a, b) => Date.parse(a) - Date.parse(b))[0] ?? null;
  // The first hour after the first cutoff in which the bank is connected again.
  const cutIndex = s.firstCutoffAt ? f.hourly.findIndex((r) => r.time === s.firstCutoffAt) : -1;
  let reconnectAt: string | null = null;
  if (cutIndex >= 0) {
    for (let i = cutIndex + 1; i < f.hourly.length; i++) {
      const r = f.hourly[i]!;
      if (!r.disconnected) {
        reconnectAt = r.time;
        break;
      }
    }
  }
  return {
    startAt: f.hourly[0]?.time ?? '',
    startSocPct: s.startSocPct,
    firstCutoffAt: s.firstCutoffAt,
    nextCutoffAt: next,
    reconnectAt,
    unmetHours: f.hourly.filter((r) => r.unmetWatts > 0).length,
    cutoffStop: cutRow ? (f.stops[cutRow.stop]?.name ?? null) : null,
    minSocPct: s.minSocPct,
    minSocAt: s.minSocAt,
    endSocPct: s.endSocPct,
    unmetWh: Math.round(s.unmetWh),
    hoursSimulated: s.hoursSimulated,
    floorSocPct: s.floorSocPct,
  };
}
