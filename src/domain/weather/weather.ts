// Weather from a source, per stop and local day (forecast-engine.md, Revision 2, "Weather from a
// source"). Pure: no I/O, no clock (today comes in as an argument). The server fetches the series
// this module asks for and hands them back; this module turns the service's hourly series into
// stop-days in each stop's local clock hours, decides which days come from the forecast and which
// from past years, and picks the median past year.

/** Where one day's weather came from: the engine's `source`. */
export type WeatherSource = 'forecast' | 'past-year' | 'typed';
/**
 * Where a day's weather comes from, for people — what the engine really uses for it: its own
 * typed or fetched day; `copied`, the stop's nearest day that has weather (the engine's rule when
 * a day has none); `assumed`, the engine's 4 oktas / 20 °C / 10 °C when the stop has no day at all.
 */
export type DaySource = WeatherSource | 'copied' | 'assumed';

/** One owned day of a stop with where its weather comes from; a copied day names the day it copies. */
export interface DayOrigin {
  date: string;
  source: DaySource;
  /** For `copied`: the date whose weather the engine uses, and where that day's came from. */
  from?: string;
  fromSource?: WeatherSource;
}

/** One local clock hour of a stop-day (the engine's `weather[i].hourly[j]`). */
export interface SourceHour {
  hour: number;
  ghiWm2: number;
  tempC: number;
  cloudPct: number;
}

/** One stop-day of weather as the engine takes it (Revision 2): the day's summary plus its hours. */
export interface WeatherEntry {
  date: string;
  cloudOktas: number;
  highC: number;
  lowC: number;
  hourly: SourceHour[];
  source: WeatherSource;
}

/**
 * An hourly series of the service at one place. `times` are the stamps (ms since the epoch, UTC).
 * Shortwave radiation is the mean over the interval *ending* at its stamp (the service's
 * "preceding hour mean"); temperature and cloud cover are instantaneous at the stamp. NaN = missing.
 */
export interface HourlySeries {
  times: number[];
  ghiWm2: number[];
  tempC: number[];
  cloudPct: number[];
}

/** The part of a stop this module reads (the engine contract's stop). */
export interface StopLike {
  name?: string;
  lat: number;
  lon: number;
  timeZone: string;
  arrive: string;
  nights: number;
  arriveHour?: number;
  weather?: { date: string; cloudOktas: number; highC: number; lowC: number }[];
}

/** One request to the service: a place (tenths of a degree), a UTC date range and the kind. */
export interface WeatherRequest {
  kind: 'forecast' | 'archive';
  latTenths: number;
  lonTenths: number;
  startDate: string;
  endDate: string;
}

const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;
/** The service forecasts today and the next 15 days (16 days). */
export const FORECAST_DAYS = 16;
/** Past years used for a far trip. */
export const PAST_YEARS = 10;
/** The archive runs until about five days ago; a request keeps two more days' margin. */
const ARCHIVE_LAG_DAYS = 7;

// ---------- dates ----------

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Day number (days since 1970-01-01) of `YYYY-MM-DD`. */
export function dayNumber(iso: string): number {
  const m = DATE_RE.exec(iso);
  if (!m) throw new RangeError(`not a date: ${iso}`);
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) / DAY_MS;
}

/** `YYYY-MM-DD` of a day number. */
export function isoDate(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** The same calendar date `years` years earlier (29 February becomes the 28th in a common year). */
export function yearsBefore(iso: string, years: number): string {
  const [y, m, d] = iso.split('-').map(Number) as [number, number, number];
  const yy = y - years;
  const leap = (yy % 4 === 0 && yy % 100 !== 0) || yy % 400 === 0;
  const dd = m === 2 && d === 29 && !leap ? 28 : d;
  return `${String(yy).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(dd).padStart(2, '0')}`;
}

// ---------- local clock hours ----------

// One formatter per zone (making one costs far more than using it) and the midnights already
// found: both hold pure results, so the module stays deterministic.
const formatters = new Map<string, Intl.DateTimeFormat>();
const midnights = new Map<string, number>();
const OFFSET_RE = /GMT(?:([+-])(\d{1,2})(?::?(\d{2}))?)?/;

/** UTC offset of a zone at an instant, minutes (local − UTC), from Intl's `longOffset` name. */
function offsetMin(timeZone: string, ms: number): number {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' });
    formatters.set(timeZone, f);
  }
  const m = OFFSET_RE.exec(f.format(new Date(ms)));
  if (!m || !m[1]) return 0;
  const v = Number(m[2]) * 60 + Number(m[3] ?? 0);
  return m[1] === '-' ? -v : v;
}

/**
 * The instant a local date begins in a zone: its midnight, or the first instant after a DST gap
 * that swallows midnight (as the engine reads a time inside a gap).
 */
export function localMidnight(timeZone: string, iso: string): number {
  const key = `${timeZone}|${iso}`;
  const known = midnights.get(key);
  if (known !== undefined) return known;
  if (midnights.size > 20_000) midnights.clear();
  const wall = dayNumber(iso) * DAY_MS;
  const before = offsetMin(timeZone, wall - 36 * HOUR_MS);
  const after = offsetMin(timeZone, wall + 36 * HOUR_MS);
  const found: number[] = [];
  for (const o of before === after ? [before] : [before, after]) {
    const t = wall - o * 60_000;
    if (offsetMin(timeZone, t) === o) found.push(t);
  }
  // Overlap: the earlier instant. Gap: the transition, where the old offset would have read midnight.
  const t = found.length > 0 ? Math.min(...found) : wall - before * 60_000;
  midnights.set(key, t);
  return t;
}

/** Local clock hour (0–23) of an instant at a known offset. */
function clockHour(ms: number, offset: number): number {
  const local = ms + offset * 60_000;
  return Math.floor((((local % DAY_MS) + DAY_MS) % DAY_MS) / HOUR_MS);
}

/**
 * The hour rows of a local date: instants one hour apart from the day's start to the next day's
 * start, each with the clock hour it starts in. 23 rows on a spring-forward day, 25 on a
 * fall-back day (the repeated hour twice).
 */
export function localHourRows(timeZone: string, iso: string): { start: number; hour: number }[] {
  const from = localMidnight(timeZone, iso);
  const to = localMidnight(timeZone, isoDate(dayNumber(iso) + 1));
  const rows: { start: number; hour: number }[] = [];
  // Most days keep one offset from start to end: then it needs reading only once.
  const first = offsetMin(timeZone, from);
  const steady = first === offsetMin(timeZone, to - 1);
  for (let t = from; t < to; t += HOUR_MS) rows.push({ start: t, hour: clockHour(t, steady ? first : offsetMin(timeZone, t)) });
  return rows;
}

/**
 * Instants of local wall-clock stamps (`YYYY-MM-DDTHH:MM`, as the service writes them when asked
 * for a time zone). A stamp repeated by a fall-back change is the earlier instant the first time
 * and the later one the second time; stamps must be in order.
 */
export function instantsOfLocalStamps(timeZone: string, stamps: string[]): number[] {
  const out: number[] = [];
  for (const s of stamps) {
    const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/.exec(s);
    if (!m) throw new RangeError(`not a local time: ${s}`);
    const wall = dayNumber(m[1]!) * DAY_MS + Number(m[2]) * HOUR_MS + Number(m[3]) * 60_000;
    const before = offsetMin(timeZone, wall - 36 * HOUR_MS);
    const after = offsetMin(timeZone, wall + 36 * HOUR_MS);
    const candidates = [...new Set([before, after])]
      .map((o) => wall - o * 60_000)
      .filter((t) => t + offsetMin(timeZone, t) * 60_000 === wall)
      .sort((a, b) => a - b);
    const prev = out.length > 0 ? out[out.length - 1]! : -Infinity;
    const t = candidates.find((c) => c > prev);
    if (t === undefined) throw new RangeError(`local time ${s} does not exist in ${timeZone} or is out of order`);
    out.push(t);
  }
  return out;
}

// ---------- reading a series ----------

/** First index whose stamp is ≥ t (binary search). */
function lowerBound(times: number[], t: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Mean over [a, b) of a series whose values each cover the interval ending at their stamp; NaN if not fully covered. */
export function meanOver(times: number[], values: number[], a: number, b: number): number {
  if (times.length < 2) return NaN;
  let covered = 0;
  let sum = 0;
  for (let i = Math.max(0, lowerBound(times, a) - 1); i < times.length; i++) {
    const end = times[i]!;
    const width = i > 0 ? end - times[i - 1]! : times[1]! - times[0]!;
    const start = end - width;
    if (start >= b) break;
    const overlap = Math.min(b, end) - Math.max(a, start);
    if (overlap <= 0) continue;
    const v = values[i]!;
    if (!Number.isFinite(v)) return NaN;
    sum += v * overlap;
    covered += overlap;
  }
  return covered >= b - a - 1 ? sum / covered : NaN;
}

/** Linear interpolation of instantaneous values at t; NaN outside the series or next to a missing value. */
export function valueAt(times: number[], values: number[], t: number): number {
  const i = lowerBound(times, t);
  if (i < times.length && times[i] === t) return values[i]!;
  if (i === 0 || i >= times.length) return NaN;
  const t0 = times[i - 1]!;
  const t1 = times[i]!;
  const v0 = values[i - 1]!;
  const v1 = values[i]!;
  return v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
}

const round1 = (v: number) => Math.round(v * 10) / 10;

/**
 * One local date of a stop from a series, or null when the series does not cover every hour of
 * the day. Each row takes the mean irradiance over its own hour and the temperature and cloud
 * cover at its middle; a clock hour repeated by a fall-back change keeps its first row. The day's
 * summary: cloud in oktas from the mean cloud cover of the daylight hours (all hours if none has
 * sun), high and low from the hours.
 */
export function dayFromSeries(
  series: HourlySeries,
  timeZone: string,
  date: string,
  source: WeatherSource,
  seriesDate = date,
): WeatherEntry | null {
  const rows = localHourRows(timeZone, seriesDate);
  const hourly: SourceHour[] = [];
  const seen = new Set<number>();
  for (const row of rows) {
    if (seen.has(row.hour)) continue;
    seen.add(row.hour);
    const ghi = meanOver(series.times, series.ghiWm2, row.start, row.start + HOUR_MS);
    const temp = valueAt(series.times, series.tempC, row.start + HOUR_MS / 2);
    const cloud = valueAt(series.times, series.cloudPct, row.start + HOUR_MS / 2);
    if (!Number.isFinite(ghi) || !Number.isFinite(temp) || !Number.isFinite(cloud)) return null;
    hourly.push({
      hour: row.hour,
      ghiWm2: Math.max(0, Math.round(ghi)),
      tempC: round1(temp),
      cloudPct: Math.round(Math.min(100, Math.max(0, cloud))),
    });
  }
  hourly.sort((a, b) => a.hour - b.hour);
  const daylight = hourly.filter((h) => h.ghiWm2 > 0);
  const cloudRows = daylight.length > 0 ? daylight : hourly;
  const meanCloud = cloudRows.reduce((s, h) => s + h.cloudPct, 0) / cloudRows.length;
  const temps = hourly.map((h) => h.tempC);
  return {
    date,
    cloudOktas: Math.round((meanCloud / 100) * 8),
    highC: Math.min(60, Math.max(-60, Math.max(...temps))),
    lowC: Math.min(60, Math.max(-60, Math.min(...temps))),
    hourly,
    source,
  };
}

// ---------- what to ask for ----------

/**
 * The local dates a stop owns hours of: arrival day to departure morning. The departure day is
 * left out when the next stop arrives on it at midnight (the stop then owns no hour of it).
 */
export function stopDates(stops: StopLike[], i: number): string[] {
  const s = stops[i]!;
  const first = dayNumber(s.arrive);
  let last = first + s.nights;
  const next = stops[i + 1];
  if (next && dayNumber(next.arrive) === last && (next.arriveHour ?? 15) === 0) last--;
  const out: string[] = [];
  for (let d = first; d <= last; d++) out.push(isoDate(d));
  return out;
}

/** A near trip starts within the forecast's reach (today and the next 15 days); `today` is a UTC date. */
export function isNearTrip(stops: StopLike[], today: string): boolean {
  return stops.length > 0 && dayNumber(stops[0]!.arrive) <= dayNumber(today) + FORECAST_DAYS - 1;
}

/** Place key of a stop: tenths of a degree (~11 km), the cache's and the request's grid. */
export function placeOf(stop: StopLike): { latTenths: number; lonTenths: number } {
  return { latTenths: Math.round(stop.lat * 10), lonTenths: Math.round(stop.lon * 10) };
}

/** The UTC dates that hold every hour of these local dates in any zone (one day either side). */
function utcSpan(dates: string[]): { startDate: string; endDate: string } {
  const days = dates.map(dayNumber);
  return { startDate: isoDate(Math.min(...days) - 1), endDate: isoDate(Math.max(...days) + 1) };
}

/** Dates of a stop that are typed by the camper. */
function typedDates(stop: StopLike): Set<string> {
  return new Set((stop.weather ?? []).map((w) => w.date));
}

/**
 * The forecast request of one stop of a near trip, or null: its untyped days inside the forecast's
 * reach (yesterday to today + 15), as UTC dates clipped to what the service forecasts.
 */
export function forecastRequest(stops: StopLike[], i: number, today: string): WeatherRequest | null {
  const t = dayNumber(today);
  const typed = typedDates(stops[i]!);
  const wanted = stopDates(stops, i).filter((d) => !typed.has(d) && dayNumber(d) >= t - 1 && dayNumber(d) <= t + FORECAST_DAYS - 1);
  if (wanted.length === 0) return null;
  const span = utcSpan(wanted);
  return {
    kind: 'forecast',
    ...placeOf(stops[i]!),
    startDate: isoDate(Math.max(dayNumber(span.startDate), t - 2)),
    endDate: isoDate(Math.min(dayNumber(span.endDate), t + FORECAST_DAYS - 1)),
  };
}

/**
 * How many years back each past year lies: the `count` most recent whole-year shifts that put
 * every needed date (and a day's margin) inside the archive, which ends a few days before today.
 */
export function pastYearShifts(dates: string[], today: string, count = PAST_YEARS): number[] {
  if (dates.length === 0) return [];
  const last = dates.reduce((a, b) => (a > b ? a : b));
  const limit = dayNumber(today) - ARCHIVE_LAG_DAYS;
  const out: number[] = [];
  for (let k = 1; out.length < count && k < 200; k++) if (dayNumber(yearsBefore(last, k)) + 1 <= limit) out.push(k);
  return out;
}

/** The archive request of one stop for the dates `dates` moved `k` years back. */
export function archiveRequest(stop: StopLike, dates: string[], k: number): WeatherRequest {
  return { kind: 'archive', ...placeOf(stop), ...utcSpan(dates.map((d) => yearsBefore(d, k))) };
}

// ---------- putting a trip together ----------

/** The typed days of a stop as engine entries (the camper's own sky; no hours). */
export function typedEntries(stop: StopLike): WeatherEntry[] {
  return (stop.weather ?? []).map((w) => ({
    date: w.date,
    cloudOktas: w.cloudOktas,
    highC: w.highC,
    lowC: w.lowC,
    hourly: [],
    source: 'typed' as const,
  }));
}

/** One past year of a trip: the days it fills per stop and its total irradiance. */
export interface PastYear {
  /** The calendar year of the trip's first filled day, moved back. */
  year: number;
  yearsBack: number;
  /** Sum of the hourly GHI over every filled day, Wh/m²: the sun the trip would have had. */
  ghiWhM2: number;
  /** Per stop, the days this year fills (dated on the trip's own dates). */
  stops: WeatherEntry[][];
}

/** Total GHI of some days, Wh/m² (hourly means × 1 h). */
export function totalGhi(days: WeatherEntry[]): number {
  return days.reduce((s, d) => s + d.hourly.reduce((t, h) => t + h.ghiWm2, 0), 0);
}

/**
 * The median of the past years by total irradiance over the trip's filled days. Irradiance,
 * because the harvest is what decides whether the bank makes it, and a whole year (not each day's
 * median) keeps a run of grey days together as it really came. With an even count the lower of
 * the two middle years: the duller one, erring on the side of caution. Null with no years.
 */
export function medianYear(years: PastYear[]): PastYear | null {
  if (years.length === 0) return null;
  const sorted = [...years].sort((a, b) => a.ghiWhM2 - b.ghiWhM2 || b.year - a.year);
  return sorted[Math.floor((sorted.length - 1) / 2)]!;
}

/** A stop's weather, day by day, with where each day came from. */
export interface StopFill {
  name: string;
  /** Engine-ready entries, by date: typed, forecast and past-year days. */
  weather: WeatherEntry[];
  /** Every owned date with its source (`copied` or `assumed` when nothing covers it). */
  days: DayOrigin[];
}

/**
 * The day the engine uses for an uncovered date: the nearest covered date of the stop by whole
 * days, the earlier on a tie (the engine's resolveStopWeather rule), or null when none is covered.
 */
function nearestCovered(date: string, covered: string[]): string | null {
  const d = dayNumber(date);
  let best: string | null = null;
  let bestGap = Infinity;
  for (const c of covered) {
    const gap = Math.abs(dayNumber(c) - d);
    if (gap < bestGap) {
      best = c;
      bestGap = gap;
    }
  }
  return best;
}

/**
 * Merges the sources of one stop, day by day: typed days always win, then the forecast, then the
 * chosen past year. A date covered by none is `copied` from the stop's nearest covered date (as
 * the engine does), or `assumed` when no date of the stop is covered.
 */
export function mergeStop(stops: StopLike[], i: number, forecast: WeatherEntry[], pastYear: WeatherEntry[]): StopFill {
  const stop = stops[i]!;
  const byDate = new Map<string, WeatherEntry>();
  for (const e of pastYear) byDate.set(e.date, e);
  for (const e of forecast) byDate.set(e.date, e);
  for (const e of typedEntries(stop)) byDate.set(e.date, e);
  const weather = [...byDate.values()].sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
  const owned = stopDates(stops, i);
  // The engine ignores given days the stop owns no hour of, so only owned dates can be copied.
  const covered = owned.filter((d) => byDate.has(d));
  const days = owned.map((date): DayOrigin => {
    const own = byDate.get(date);
    if (own) return { date, source: own.source };
    const from = nearestCovered(date, covered);
    return from ? { date, source: 'copied', from, fromSource: byDate.get(from)!.source } : { date, source: 'assumed' };
  });
  return { name: stop.name ?? `Stop ${i + 1}`, weather, days };
}
