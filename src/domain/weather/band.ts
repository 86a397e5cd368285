// "How sure is this?": a trip re-run under other weather — each of the last ten years for a far
// trip, skies two steps better and worse for a near one — drawn as a band around the trip's own
// state of charge, with one plain sentence computed from the runs. The runs themselves happen in
// the worker pool (band-run.ts); everything here is pure, cheap and free of the engine (the
// forecast page's verdict reads it).
import type { Forecast, ResolvedPlan } from '../../engine';
import { localParts } from '../../lib/format';
import { mergeStop, type DayOrigin, type PastYear, type StopLike, type WeatherEntry } from './weather';

/** Where each stop-day's weather came from, as a saved forecast keeps it. */
export interface WeatherSources {
  kind: 'near' | 'far';
  status: 'ok' | 'unreachable';
  message: string | null;
  medianYear: number | null;
  stops: { name: string; days: DayOrigin[] }[];
}

/** One re-run of the trip under other weather. */
export interface BandRun {
  /** "2019", or "two steps cloudier" / "as forecast" / "two steps clearer". */
  label: string;
  year: number | null;
  /** True when the bank never reaches its floor or cutoff. */
  ok: boolean;
  minSocPct: number;
  minSocAt: string;
  firstCutoffAt: string | null;
  /** Why the bank first disconnects, when it does. */
  cutoffBy: 'floor' | 'volts' | null;
}

/** The band a saved forecast keeps. */
export interface Band {
  kind: 'years' | 'skies';
  runs: BandRun[];
  /** Per hour row: the lowest and highest end-of-hour usable charge over the runs, % of rated. */
  lowPct: number[];
  highPct: number[];
  /** How many runs keep the bank above its floor, of how many. */
  madeIt: number;
  total: number;
  /** The label of the worst run (lowest SOC, earliest cutoff first). */
  worst: string;
  sentence: string;
}

/** A saved forecast with the weather it used and its band (both optional: older forecasts lack them). */
export type ForecastWithWeather = Forecast & { weatherSources?: WeatherSources; band?: Band | null };

/**
 * Stop-days whose weather was assumed (nothing typed or fetched for the whole stop): from the
 * saved sources, or — for a forecast without them — from the engine's own `weather-assumed`
 * warnings, so no caller can miss an assumed day.
 */
export function assumedDays(sources: WeatherSources | undefined, warnings: readonly { code: string; message: string }[] = []): { stop: string; date: string }[] {
  const fromSources = sources ? sources.stops.flatMap((s) => s.days.filter((d) => d.source === 'assumed').map((d) => ({ stop: s.name, date: d.date }))) : [];
  const fromEngine = warnings.filter((w) => w.code === 'weather-assumed').map((w) => ({ stop: '', date: /\d{4}-\d{2}-\d{2}/.exec(w.message)?.[0] ?? '' }));
  return fromEngine.length > fromSources.length ? fromEngine : fromSources;
}

// ---------- skies one step better or worse ----------

/**
 * Kasten & Czeplak (1980), Solar Energy 24(2):177–189: global irradiance under N oktas of cloud is
 * clear-sky × (1 − 0.75·(N/8)^3.4). The ratio of two cloud covers moves an hour's measured or
 * forecast irradiance to the other cover.
 */
export function cloudFactor(oktas: number): number {
  const n = Math.min(8, Math.max(0, oktas));
  return 1 - 0.75 * Math.pow(n / 8, 3.4);
}

/** A fetched day with its sky moved `steps` oktas (positive: cloudier); typed days stay as typed. */
export function shiftSky(entry: WeatherEntry, steps: number): WeatherEntry {
  if (entry.source === 'typed') return entry;
  const hourly = entry.hourly.map((h) => {
    const n = (h.cloudPct / 100) * 8;
    const m = Math.min(8, Math.max(0, n + steps));
    const ghi = Math.min(1500, Math.max(0, Math.round(h.ghiWm2 * (cloudFactor(m) / cloudFactor(n)))));
    return { ...h, ghiWm2: ghi, cloudPct: Math.round((m / 8) * 100) };
  });
  return { ...entry, cloudOktas: Math.min(8, Math.max(0, entry.cloudOktas + steps)), hourly };
}

// ---------- the plans of a band ----------

const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));

/** A day inside the engine schema's ranges (the service may report colder or hotter hours). */
function inRange(w: WeatherEntry): WeatherEntry {
  return {
    ...w,
    cloudOktas: clamp(w.cloudOktas, 0, 8),
    highC: clamp(w.highC, -60, 60),
    lowC: clamp(w.lowC, -60, 60),
    hourly: (w.hourly ?? []).map((h) => ({ hour: h.hour, ghiWm2: clamp(h.ghiWm2, 0, 1500), tempC: clamp(h.tempC, -60, 60), cloudPct: clamp(h.cloudPct, 0, 100) })),
  };
}

/** The validated plan with other weather days of the same shape: still a valid, resolved plan. */
function withWeather(plan: ResolvedPlan, weather: WeatherEntry[][]): ResolvedPlan {
  return { ...plan, stops: plan.stops.map((s, i) => ({ ...s, weather: (weather[i] ?? (s.weather as WeatherEntry[])).map(inRange) })) } as ResolvedPlan;
}

/**
 * One plan per past year, oldest first: the trip's plan with each stop's untyped days from that
 * year. `stops` are the camper's own stops (their typed days win).
 */
export function yearPlans(plan: ResolvedPlan, stops: StopLike[], years: PastYear[]): { label: string; year: number; plan: ResolvedPlan }[] {
  return [...years]
    .sort((a, b) => a.year - b.year)
    .map((y) => ({ label: String(y.year), year: y.year, plan: withWeather(plan, stops.map((_, i) => mergeStop(stops, i, [], y.stops[i] ?? []).weather)) }));
}

const SKY_LABELS = ['two steps cloudier', 'as forecast', 'two steps clearer'] as const;

/** Cloudier, as planned, clearer: the plan with every fetched day's sky moved two oktas each way. */
export function skyPlans(plan: ResolvedPlan): { label: string; year: null; plan: ResolvedPlan }[] {
  const shifted = (steps: number) => withWeather(plan, plan.stops.map((s) => (s.weather as WeatherEntry[]).map((w) => shiftSky(w, steps))));
  return [
    { label: SKY_LABELS[0], year: null, plan: shifted(2) },
    { label: SKY_LABELS[1], year: null, plan },
    { label: SKY_LABELS[2], year: null, plan: shifted(-2) },
  ];
}

// ---------- handing a band to a worker ----------

/**
 * Past years packed for the trip to a worker thread: the hours of every day in one Float64Array
 * (hour, GHI, temperature, cloud, four numbers an hour) and the days' few fields beside it. A
 * structured clone copies a typed array in one go, where ten years of hour objects took several
 * milliseconds of the request thread.
 */
export interface PackedYears {
  years: { year: number; yearsBack: number; ghiWhM2: number; stops: { date: string; cloudOktas: number; highC: number; lowC: number; hours: number }[][] }[];
  hours: Float64Array;
}

export function packYears(years: PastYear[]): PackedYears {
  let n = 0;
  for (const y of years) for (const days of y.stops) for (const d of days) n += d.hourly.length;
  const hours = new Float64Array(n * 4);
  let i = 0;
  const meta = years.map((y) => ({
    year: y.year,
    yearsBack: y.yearsBack,
    ghiWhM2: y.ghiWhM2,
    stops: y.stops.map((days) =>
      days.map((d) => {
        for (const h of d.hourly) {
          hours[i++] = h.hour;
          hours[i++] = h.ghiWm2;
          hours[i++] = h.tempC;
          hours[i++] = h.cloudPct;
        }
        return { date: d.date, cloudOktas: d.cloudOktas, highC: d.highC, lowC: d.lowC, hours: d.hourly.length };
      }),
    ),
  }));
  return { years: meta, hours };
}

export function unpackYears(packed: PackedYears): PastYear[] {
  let i = 0;
  const h = packed.hours;
  return packed.years.map((y) => ({
    year: y.year,
    yearsBack: y.yearsBack,
    ghiWhM2: y.ghiWhM2,
    stops: y.stops.map((days) =>
      days.map((d) => {
        const hourly = [];
        for (let k = 0; k < d.hours; k++, i += 4) hourly.push({ hour: h[i]!, ghiWm2: h[i + 1]!, tempC: h[i + 2]!, cloudPct: h[i + 3]! });
        return { date: d.date, cloudOktas: d.cloudOktas, highC: d.highC, lowC: d.lowC, hourly, source: 'past-year' as const };
      }),
    ),
  }));
}

/** What a worker needs to run a band: the trip's plan, the camper's own stops and, for a far trip, the past years. */
export interface BandTask {
  kind: Band['kind'];
  plan: ResolvedPlan;
  stops: StopLike[];
  years: PackedYears | null;
}

/**
 * The band to run for a trip, or null when there is nothing to vary: every past year for a far
 * trip with two or more, skies moved two oktas each way when some day was fetched. The labels are
 * for the request thread; the task goes to a worker, which builds the plans (`bandPlans`).
 */
export function bandTask(plan: ResolvedPlan, stops: StopLike[], fill: { kind: 'near' | 'far'; pastYears: PastYear[] }): { task: BandTask; labels: { label: string; year: number | null }[] } | null {
  if (fill.kind === 'far' && fill.pastYears.length >= 2) {
    const labels = [...fill.pastYears].sort((a, b) => a.year - b.year).map((y) => ({ label: String(y.year), year: y.year }));
    return { task: { kind: 'years', plan, stops, years: packYears(fill.pastYears) }, labels };
  }
  if (!hasFetchedDays(plan)) return null;
  return { task: { kind: 'skies', plan, stops, years: null }, labels: SKY_LABELS.map((label) => ({ label, year: null })) };
}

/** The plans of a band task, in the order of its labels (in the worker). */
export function bandPlans(task: BandTask): ResolvedPlan[] {
  const runs = task.kind === 'years' && task.years ? yearPlans(task.plan, task.stops, unpackYears(task.years)) : skyPlans(task.plan);
  return runs.map((r) => r.plan);
}

/** True when some day of the plan came from the weather service (so skies can be moved). */
export function hasFetchedDays(plan: ResolvedPlan): boolean {
  return plan.stops.some((s) => (s.weather as WeatherEntry[]).some((w) => w.source === 'forecast' || w.source === 'past-year'));
}

// ---------- running and reading ----------

/** What the worker gives back per run: end-of-hour usable charge (% of rated; the floor is judged on it) and where the run is lowest. */
export interface RunOutcome {
  socEndPct: number[];
  minSocPct: number;
  minSocRow: number;
  firstCutoffRow: number | null;
  /** Why the bank first disconnects: its usable floor or its low-voltage cutoff. */
  cutoffBy?: 'floor' | 'volts';
  error?: string;
}


/**
 * "night 2 at 03:00" or "day 3 at 15:00" for a row, counted from the trip's first local date
 * (day 1; night 1 is the evening of day 1 and the small hours after it).
 */
export function whenInTrip(time: string, firstDate: string): string {
  const p = localParts(time);
  const f = localParts(`${firstDate}T00:00Z`);
  if (!p || !f) return `at ${time}`;
  const dayIndex = Math.round((Date.UTC(p.year, p.month - 1, p.day) - Date.UTC(f.year, f.month - 1, f.day)) / 86_400_000);
  const clock = `${String(p.hour).padStart(2, '0')}:${String(p.minute).padStart(2, '0')}`;
  if (p.hour >= 18) return `night ${dayIndex + 1} at ${clock}`;
  if (p.hour < 6) return `night ${Math.max(1, dayIndex)} at ${clock}`;
  return `day ${dayIndex + 1} at ${clock}`;
}

const pctWords = (v: number) => `${Math.round(v)} %`;

/**
 * The band and its sentence from the runs: every number in the sentence comes from the runs.
 * `times` are the forecast's hour rows (the same grid for every run).
 */
export function buildBand(kind: Band['kind'], labels: { label: string; year: number | null }[], outcomes: RunOutcome[], times: string[]): Band | null {
  const usable = outcomes.map((o, i) => ({ o, l: labels[i]! })).filter((x) => !x.o.error && x.o.socEndPct.length === times.length);
  if (usable.length < 2 || times.length === 0) return null;
  const runs: BandRun[] = usable.map(({ o, l }) => ({
    label: l.label,
    year: l.year,
    ok: o.firstCutoffRow === null,
    minSocPct: Math.round(o.minSocPct * 10) / 10,
    minSocAt: times[o.minSocRow] ?? times[0]!,
    firstCutoffAt: o.firstCutoffRow === null ? null : (times[o.firstCutoffRow] ?? null),
    cutoffBy: o.firstCutoffRow === null ? null : (o.cutoffBy ?? 'floor'),
  }));
  const lowPct = times.map((_, r) => Math.min(...usable.map((x) => x.o.socEndPct[r]!)));
  const highPct = times.map((_, r) => Math.max(...usable.map((x) => x.o.socEndPct[r]!)));
  // Worst: a cutoff beats no cutoff, an earlier cutoff beats a later one, then the lowest SOC.
  const worstIdx = usable.reduce((best, x, i) => {
    const b = usable[best]!.o;
    const o = x.o;
    const oc = o.firstCutoffRow ?? Infinity;
    const bc = b.firstCutoffRow ?? Infinity;
    return oc < bc || (oc === bc && o.minSocPct < b.minSocPct) ? i : best;
  }, 0);
  const worst = runs[worstIdx]!;
  const madeIt = runs.filter((r) => r.ok).length;
  const total = runs.length;
  const first = (localParts(times[0]!)?.date ?? times[0]!.slice(0, 10));
  const worstWhat = worst.firstCutoffAt
    ? worst.cutoffBy === 'volts'
      ? `its voltage sags to the low-voltage cutoff on ${whenInTrip(worst.firstCutoffAt, first)}`
      : `it reaches the floor on ${whenInTrip(worst.firstCutoffAt, first)}`
    : `it gets down to ${pctWords(worst.minSocPct)} on ${whenInTrip(worst.minSocAt, first)}`;
  const anyVolts = runs.some((r) => r.cutoffBy === 'volts');
  let sentence: string;
  if (kind === 'years') {
    const count = madeIt === total ? `all ${total}` : madeIt === 0 ? 'none' : `${madeIt}`;
    sentence = `In ${count} of the last ${total} years' weather the bank stays above its floor${anyVolts ? ' and its cutoff voltage' : ''}; in the worst (${worst.label}) ${worstWhat}.`;
  } else {
    const count = madeIt === total ? `all ${total}` : madeIt === 0 ? `none of the ${total}` : `${madeIt} of ${total}`;
    sentence = `With the forecast's skies and skies two steps clearer and cloudier, the bank stays above its floor${anyVolts ? ' and its cutoff voltage' : ''} in ${count} cases; with ${worst.label === 'as forecast' ? 'the forecast itself' : `skies ${worst.label}`} ${worstWhat}.`;
  }
  return { kind, runs, lowPct, highPct, madeIt, total, worst: worst.label, sentence };
}
