import type { Kysely } from 'kysely';
import { fetchWeatherApi } from 'openmeteo';
import type { WeatherApiResponse } from '@openmeteo/sdk/weather-api-response';
import { Variable } from '@openmeteo/sdk/variable';
import type { DB } from '../../db/schema';
import {
  archiveRequest,
  dayFromSeries,
  forecastRequest,
  isNearTrip,
  medianYear,
  mergeStop,
  pastYearShifts,
  stopDates,
  yearsBefore,
  type HourlySeries,
  type PastYear,
  type StopFill,
  type StopLike,
  type WeatherEntry,
  type WeatherRequest,
} from '../domain/weather/weather';

// A trip's weather from the hosted weather service (through its SDK), cached in `weather_cache`.
// One fill has one deadline (WEATHER_TIMEOUT_MS, at most 5 s) for all its requests together, and
// each request is tried at most twice; after the first failure the fill asks nothing more and
// uses what the cache has, the camper's typed skies and the engine's typical sky. Nothing here
// writes to the trip: what the camper typed is never touched.

/** Forecasts go stale after three hours; the past never changes. */
export const FORECAST_TTL_MS = 3 * 3_600_000;
const ATTEMPTS = 2;
const RETRY_DELAY_MS = 150;
const CONCURRENCY = 6;
const HOURLY = 'shortwave_radiation,temperature_2m,cloud_cover';

/** Where and how long to ask. */
export interface WeatherConfig {
  forecastUrl: string;
  archiveUrl: string;
  timeoutMs: number;
  /** The clock, for tests and the benchmark; defaults to now. */
  now?: Date;
}

/** A trip's weather as the API answers it. */
export interface TripWeather {
  /** `near`: starts within the forecast's 16 days; `far`: filled from the same dates of past years. */
  kind: 'near' | 'far';
  /** `ok`, or `unreachable` when the service failed (down, too slow or garbage) during this fill. */
  status: 'ok' | 'unreachable';
  /** For the camper, when something went wrong: what is used instead. */
  message: string | null;
  stops: StopFill[];
  /** The median past year (by total irradiance) the far days use, or null. */
  medianYear: number | null;
  /** Every complete past year, newest first, kept for the "how sure is this?" band. */
  pastYears: PastYear[];
  /** Requests this fill needed, and how many the cache answered. */
  requests: { total: number; fromCache: number };
}

/** Why the service failed, in words for the message. */
type Failure = 'timeout' | 'error' | 'garbage';

interface Session {
  config: WeatherConfig;
  signal: AbortSignal;
  failed: Failure | null;
  total: number;
  fromCache: number;
}

class GarbageError extends Error {}

// ---------- the SDK's answer → a series ----------

function variableValues(
  hourly: NonNullable<ReturnType<WeatherApiResponse['hourly']>>,
  variable: Variable,
  n: number,
  min: number,
  max: number,
): number[] {
  for (let i = 0; i < hourly.variablesLength(); i++) {
    const v = hourly.variables(i);
    if (!v || v.variable() !== variable) continue;
    if (variable === Variable.temperature && v.altitude() !== 2) continue;
    const values = v.valuesArray();
    if (!values || values.length !== n) throw new GarbageError('a variable has the wrong number of hours');
    // To 0.1, the precision the service states its values in (and the cache keeps), so a fresh and a cached answer read alike.
    const out = Array.from(values, (x) => (Number.isFinite(x) ? Math.round(x * 10) / 10 : NaN));
    if (out.some((x) => !Number.isNaN(x) && (x < min || x > max))) throw new GarbageError('values out of range');
    return out;
  }
  throw new GarbageError(`variable ${Variable[variable]} missing`);
}

/** Reads one answer into a series, or throws GarbageError when it is not the weather asked for. */
function toSeries(responses: WeatherApiResponse[]): HourlySeries {
  try {
    if (responses.length !== 1) throw new GarbageError(`${responses.length} places in the answer`);
    const hourly = responses[0]!.hourly();
    if (!hourly) throw new GarbageError('no hourly data');
    const start = Number(hourly.time());
    const end = Number(hourly.timeEnd());
    const step = hourly.interval();
    const n = (end - start) / step;
    if (step !== 3600 || !Number.isInteger(n) || n < 24 || n > 24 * 400) throw new GarbageError('not an hourly series');
    const series: HourlySeries = {
      times: Array.from({ length: n }, (_, i) => (start + i * step) * 1000),
      ghiWm2: variableValues(hourly, Variable.shortwave_radiation, n, 0, 1500),
      tempC: variableValues(hourly, Variable.temperature, n, -90, 65),
      cloudPct: variableValues(hourly, Variable.cloud_cover, n, 0, 100),
    };
    if (series.ghiWm2.every(Number.isNaN)) throw new GarbageError('no values');
    return series;
  } catch (err) {
    // The readers throw RangeError (or read nonsense) on bytes that are not FlatBuffers.
    throw err instanceof GarbageError ? err : new GarbageError(String(err));
  }
}

/** The cache's JSON of a series: the first stamp, the step and the values (null for missing). */
interface StoredSeries {
  t0: number;
  step: number;
  ghi: (number | null)[];
  temp: (number | null)[];
  cloud: (number | null)[];
}

const toStored = (s: HourlySeries): StoredSeries => {
  const nul = (a: number[]) => a.map((v) => (Number.isFinite(v) ? Math.round(v * 10) / 10 : null));
  return { t0: s.times[0] ?? 0, step: 3_600_000, ghi: nul(s.ghiWm2), temp: nul(s.tempC), cloud: nul(s.cloudPct) };
};

const fromStored = (s: StoredSeries): HourlySeries => {
  const nan = (a: (number | null)[]) => a.map((v) => (v === null ? NaN : v));
  return { times: s.ghi.map((_, i) => s.t0 + i * s.step), ghiWm2: nan(s.ghi), tempC: nan(s.temp), cloudPct: nan(s.cloud) };
};

// ---------- one request: cache, then the service ----------

const keyOf = (r: WeatherRequest) => `${r.kind}|${r.latTenths}|${r.lonTenths}|${r.startDate}|${r.endDate}`;

function cacheRow(db: Kysely<DB>, r: WeatherRequest) {
  return db
    .selectFrom('weather_cache')
    .select(['series', 'fetched_at'])
    .where('kind', '=', r.kind)
    .where('lat_tenths', '=', r.latTenths)
    .where('lon_tenths', '=', r.lonTenths)
    .where('start_date', '=', r.startDate)
    .where('end_date', '=', r.endDate)
    .executeTakeFirst();
}

async function fromService(s: Session, r: WeatherRequest): Promise<HourlySeries> {
  const url = r.kind === 'forecast' ? s.config.forecastUrl : s.config.archiveUrl;
  const params = {
    latitude: [r.latTenths / 10],
    longitude: [r.lonTenths / 10],
    hourly: HOURLY,
    start_date: r.startDate,
    end_date: r.endDate,
    timezone: 'GMT',
  };
  let last: unknown;
  for (let attempt = 1; attempt <= ATTEMPTS; attempt++) {
    if (s.signal.aborted) break;
    try {
      // retries = 1: the SDK itself does not retry; this loop does, within the fill's deadline.
      return toSeries(await fetchWeatherApi(url, params, 1, 0, 0, { signal: s.signal }));
    } catch (err) {
      last = err;
      if (s.signal.aborted) break;
      if (attempt < ATTEMPTS) await new Promise((res) => setTimeout(res, RETRY_DELAY_MS));
    }
  }
  throw s.signal.aborted ? Object.assign(new Error('timeout'), { failure: 'timeout' as Failure }) : last;
}

/** The series of one request: fresh cache, else the service (then cached), else a stale cache row, else null. */
async function seriesFor(db: Kysely<DB>, s: Session, r: WeatherRequest): Promise<HourlySeries | null> {
  s.total++;
  const now = (s.config.now ?? new Date()).getTime();
  const row = await cacheRow(db, r);
  const fresh = row && (r.kind === 'archive' || now - Date.parse(row.fetched_at) < FORECAST_TTL_MS);
  if (row && fresh) {
    s.fromCache++;
    return fromStored(JSON.parse(row.series) as StoredSeries);
  }
  if (!s.failed) {
    try {
      const series = await fromService(s, r);
      const values = {
        kind: r.kind,
        lat_tenths: r.latTenths,
        lon_tenths: r.lonTenths,
        start_date: r.startDate,
        end_date: r.endDate,
        series: JSON.stringify(toStored(series)),
        fetched_at: new Date(now).toISOString(),
      };
      await db
        .insertInto('weather_cache')
        .values(values)
        .onConflict((oc) =>
          oc
            .columns(['kind', 'lat_tenths', 'lon_tenths', 'start_date', 'end_date'])
            .doUpdateSet({ series: values.series, fetched_at: values.fetched_at }),
        )
        .execute();
      return series;
    } catch (err) {
      s.failed =
        s.signal.aborted || (err as { failure?: Failure }).failure === 'timeout'
          ? 'timeout'
          : err instanceof GarbageError
            ? 'garbage'
            : 'error';
    }
  }
  // The service failed: an old forecast is better than none at camp.
  if (row) {
    s.fromCache++;
    return fromStored(JSON.parse(row.series) as StoredSeries);
  }
  return null;
}

/**
 * Lets other requests run. Reading a cached series (SQLite and JSON, synchronous) and turning a
 * long trip's series into stop-days (about 10 µs a day: ten past years of a 60-night trip take
 * some 7 ms) go one request, stop or past year at a time with a turn of the event loop between
 * them, so no request waits behind a fill for more than a millisecond or two.
 */
const breathe = () => new Promise<void>((resolve) => setImmediate(resolve));

/** Every request's series, a few at a time, each distinct request once. */
async function fetchAll(db: Kysely<DB>, s: Session, requests: WeatherRequest[]): Promise<Map<string, HourlySeries | null>> {
  const unique = [...new Map(requests.map((r) => [keyOf(r), r])).values()];
  const out = new Map<string, HourlySeries | null>();
  let next = 0;
  // The workers take turns: one cache read (or answer) per turn of the event loop, not all of them in one.
  let turn = Promise.resolve();
  const myTurn = () => (turn = turn.then(breathe));
  const worker = async () => {
    while (next < unique.length) {
      await myTurn();
      const r = unique[next++];
      if (!r) break;
      out.set(keyOf(r), await seriesFor(db, s, r));
    }
  };
  await Promise.all(Array.from({ length: Math.min(CONCURRENCY, unique.length) }, worker));
  return out;
}

// ---------- a trip ----------


const FAILURE_WORDS: Record<Failure, string> = {
  timeout: 'did not answer in time',
  error: 'could not be reached',
  garbage: 'answered with something that is not weather',
};

function failureMessage(failure: Failure, stops: StopFill[]): string {
  const sources = new Set(stops.flatMap((s) => s.days.map((d) => d.source)));
  const using: string[] = [];
  if (sources.has('forecast') || sources.has('past-year')) using.push('weather saved earlier');
  if (sources.has('typed')) using.push('your typed skies');
  if (sources.has('copied')) using.push("each stop's nearest day with weather for its days without any");
  // No temperatures here: this sentence is stored with the forecast and read in either unit system; the
  // day's "Assumed" badge and the warnings state the typical high and low in the reader's units.
  if (sources.has('assumed')) using.push('typical skies (partly cloudy, mild) where nothing else is known');
  const list = using.length > 1 ? `${using.slice(0, -1).join(', ')} and ${using[using.length - 1]}` : (using[0] ?? 'your typed skies');
  return `Weather service unreachable — using ${list}. (It ${FAILURE_WORDS[failure]}; nothing you typed was changed.)`;
}

/**
 * Fills a trip's stop-days from the weather service: near trips from the forecast, the rest from
 * the same dates of the last ten years (the median year as the trip's weather, every year kept).
 * Typed days always win. Never throws for the service's sake: failures become `status` and `message`.
 */
export async function fillTripWeather(db: Kysely<DB>, stops: StopLike[], config: WeatherConfig): Promise<TripWeather> {
  const now = config.now ?? new Date();
  const today = now.toISOString().slice(0, 10);
  const s: Session = { config, signal: AbortSignal.timeout(config.timeoutMs), failed: null, total: 0, fromCache: 0 };
  const near = isNearTrip(stops, today);
  const typed = stops.map((st) => new Set((st.weather ?? []).map((w) => w.date)));

  // 1. The forecast, for the days it reaches.
  const forecastDays: WeatherEntry[][] = stops.map(() => []);
  if (near) {
    const requests = stops.map((_, i) => forecastRequest(stops, i, today));
    const got = await fetchAll(
      db,
      s,
      requests.filter((r): r is WeatherRequest => r !== null),
    );
    for (const [i, st] of stops.entries()) {
      const r = requests[i];
      const series = r ? got.get(keyOf(r)) : null;
      if (!series) continue;
      await breathe();
      for (const date of stopDates(stops, i)) {
        if (typed[i]!.has(date)) continue;
        const day = dayFromSeries(series, st.timeZone, date, 'forecast');
        if (day) forecastDays[i]!.push(day);
      }
    }
  }

  // 2. Past years for every untyped day the forecast does not cover.
  const remaining = stops.map((_, i) =>
    stopDates(stops, i).filter((d) => !typed[i]!.has(d) && !forecastDays[i]!.some((f) => f.date === d)),
  );
  const allRemaining = remaining.flat().sort();
  const shifts = pastYearShifts(allRemaining, today);
  const years: PastYear[] = [];
  if (allRemaining.length > 0 && shifts.length > 0) {
    const requests = shifts.flatMap((k) => stops.map((st, i) => (remaining[i]!.length > 0 ? archiveRequest(st, remaining[i]!, k) : null)));
    const got = await fetchAll(
      db,
      s,
      requests.filter((r): r is WeatherRequest => r !== null),
    );
    for (const k of shifts) {
      let complete = true;
      const perStop: WeatherEntry[][] = [];
      for (const [i, st] of stops.entries()) {
        if (remaining[i]!.length === 0) {
          perStop.push([]);
          continue;
        }
        await breathe();
        const series = got.get(keyOf(archiveRequest(st, remaining[i]!, k)));
        const days = remaining[i]!.map((d) => (series ? dayFromSeries(series, st.timeZone, d, 'past-year', yearsBefore(d, k)) : null));
        if (days.some((d) => d === null)) complete = false;
        perStop.push(days.filter((d): d is WeatherEntry => d !== null));
      }
      if (!complete) continue;
      const ghi = perStop.reduce((t, days) => t + days.reduce((u, d) => u + d.hourly.reduce((v, h) => v + h.ghiWm2, 0), 0), 0);
      years.push({ year: Number(yearsBefore(allRemaining[0]!, k).slice(0, 4)), yearsBack: k, ghiWhM2: Math.round(ghi), stops: perStop });
    }
  }
  const median = medianYear(years);

  const filled = stops.map((_, i) => mergeStop(stops, i, forecastDays[i]!, median?.stops[i] ?? []));
  return {
    kind: near ? 'near' : 'far',
    status: s.failed ? 'unreachable' : 'ok',
    message: s.failed ? failureMessage(s.failed, filled) : null,
    stops: filled,
    medianYear: median?.year ?? null,
    pastYears: years,
    requests: { total: s.total, fromCache: s.fromCache },
  };
}
