import { describe, expect, it } from 'vitest';
import {
  archiveRequest,
  dayFromSeries,
  forecastRequest,
  instantsOfLocalStamps,
  isNearTrip,
  localHourRows,
  medianYear,
  mergeStop,
  pastYearShifts,
  stopDates,
  yearsBefore,
  type HourlySeries,
  type PastYear,
  type StopLike,
  type WeatherEntry,
} from '../../src/domain/weather/weather';

// The mapping from the service's hourly series (UTC stamps; irradiance is the mean of the hour
// *ending* at its stamp, temperature and cloud cover are instantaneous) to stop-days in the stop's
// own clock hours. Expected values are worked by hand from synthetic series whose values encode
// their stamp, so each number below can be checked with a pencil.

const H = 3_600_000;
const utc = (s: string) => Date.parse(s);

/** A series stamped every hour from `from` for `hours` hours; each variable's value is a function of the stamp's index. */
function series(
  from: string,
  hours: number,
  f: { ghi?: (i: number) => number; temp?: (i: number) => number; cloud?: (i: number) => number } = {},
): HourlySeries {
  const t0 = utc(from);
  const idx = Array.from({ length: hours }, (_, i) => i);
  return {
    times: idx.map((i) => t0 + i * H),
    ghiWm2: idx.map(f.ghi ?? ((i) => i)),
    tempC: idx.map(f.temp ?? ((i) => i / 10)),
    cloudPct: idx.map(f.cloud ?? (() => 50)),
  };
}

describe('local hour rows across DST and zones', () => {
  it('America/Denver, fall back on 2026-11-01: 25 rows, 01:00 twice (MDT then MST)', () => {
    // US DST ends the first Sunday of November at 02:00 MDT (UTC−6) → 01:00 MST (UTC−7).
    const rows = localHourRows('America/Denver', '2026-11-01');
    expect(rows).toHaveLength(25);
    expect(rows[0]).toEqual({ start: utc('2026-11-01T06:00:00Z'), hour: 0 });
    expect(rows[1]).toEqual({ start: utc('2026-11-01T07:00:00Z'), hour: 1 });
    expect(rows[2]).toEqual({ start: utc('2026-11-01T08:00:00Z'), hour: 1 });
    expect(rows[3]).toEqual({ start: utc('2026-11-01T09:00:00Z'), hour: 2 });
    expect(rows[24]).toEqual({ start: utc('2026-11-02T06:00:00Z'), hour: 23 });
  });

  it('America/Denver, spring forward on 2027-03-14: 23 rows, no 02:00', () => {
    // Second Sunday of March, 02:00 MST (UTC−7) → 03:00 MDT (UTC−6).
    const rows = localHourRows('America/Denver', '2027-03-14');
    expect(rows).toHaveLength(23);
    expect(rows.map((r) => r.hour)).toEqual([0, 1, ...Array.from({ length: 21 }, (_, i) => i + 3)]);
    expect(rows[2]!.start).toBe(utc('2027-03-14T09:00:00Z'));
  });

  it('Asia/Kolkata (UTC+5:30): rows start at :30 UTC', () => {
    const rows = localHourRows('Asia/Kolkata', '2027-01-10');
    expect(rows).toHaveLength(24);
    expect(rows[0]!.start).toBe(utc('2027-01-09T18:30:00Z'));
    expect(rows[12]).toEqual({ start: utc('2027-01-10T06:30:00Z'), hour: 12 });
  });

  it('a midnight swallowed by DST (America/Santiago, 2026-09-06) starts at the first instant after the gap', () => {
    // Chile moves 00:00 (UTC−4) to 01:00 (UTC−3) on the first Sunday of September: the day starts at 04:00 UTC, at 01:00.
    const rows = localHourRows('America/Santiago', '2026-09-06');
    expect(rows[0]).toEqual({ start: utc('2026-09-06T04:00:00Z'), hour: 1 });
    expect(rows).toHaveLength(23);
  });
});

describe('a stop-day from an hourly series', () => {
  it('UTC+5:30: each hour takes half of two hour-ending irradiance means and the temperature at its middle', () => {
    // Series from 2027-01-09 00:00Z: value index i is stamped at 00:00Z + i h.
    const s = series('2027-01-09T00:00:00Z', 72);
    const day = dayFromSeries(s, 'Asia/Kolkata', '2027-01-10', 'forecast')!;
    expect(day.hourly).toHaveLength(24);
    // Local 00:00–01:00 IST = 18:30–19:30Z. The mean of the hour ending 19:00Z (index 19) covers
    // 18:00–19:00Z, half inside; the one ending 20:00Z (index 20) covers 19:00–20:00Z, half inside:
    // (19 + 20) / 2 = 19.5, rounded to 20 W/m² (whole watts). Temperature at 19:00Z = index 19 / 10.
    expect(day.hourly[0]).toEqual({ hour: 0, ghiWm2: 20, tempC: 1.9, cloudPct: 50 });
    // Local 12:00 IST = 06:30Z: (31 + 32)/2 = 31.5 → 32; temperature at 07:00Z = 3.1.
    expect(day.hourly[12]).toEqual({ hour: 12, ghiWm2: 32, tempC: 3.1, cloudPct: 50 });
    expect(day.source).toBe('forecast');
  });

  it('UTC+5:30 with a value that only exists in one of the two overlapping hours', () => {
    // Only the hour ending 20:00Z has sun (100 W/m²): local 00:00 IST (18:30–19:30Z) gets 50, 01:00 IST (19:30–20:30Z) gets 50.
    const s = series('2027-01-09T00:00:00Z', 72, { ghi: (i) => (i === 20 ? 100 : 0) });
    const day = dayFromSeries(s, 'Asia/Kolkata', '2027-01-10', 'forecast')!;
    expect(day.hourly.slice(0, 3).map((h) => h.ghiWm2)).toEqual([50, 50, 0]);
  });

  it('America/Denver over the November change: 24 hours, the repeated 01:00 keeps its first (MDT) hour', () => {
    const s = series('2026-10-31T00:00:00Z', 96);
    const day = dayFromSeries(s, 'America/Denver', '2026-11-01', 'past-year')!;
    expect(day.hourly.map((h) => h.hour)).toEqual(Array.from({ length: 24 }, (_, i) => i));
    // 00:00 MDT = 06:00Z: mean of the hour ending 07:00Z = index 31 (stamps from 2026-10-31 00:00Z); temperature at 06:30Z = (30 + 31)/2 / 10 = 3.05 → 3.1 (one decimal, half up).
    expect(day.hourly[0]).toMatchObject({ hour: 0, ghiWm2: 31, tempC: 3.1 });
    // 01:00 MDT = 07:00Z → hour ending 08:00Z = index 32 (the MST 01:00 at 08:00Z, index 33, is dropped).
    expect(day.hourly[1]!.ghiWm2).toBe(32);
    // 02:00 MST = 09:00Z → index 34.
    expect(day.hourly[2]!.ghiWm2).toBe(34);
    // 23:00 MST = 2026-11-02 06:00Z → index 55.
    expect(day.hourly[23]!.ghiWm2).toBe(55);
  });

  it('the day after the change reads the series on standard time (UTC−7)', () => {
    const s = series('2026-10-31T00:00:00Z', 96);
    const day = dayFromSeries(s, 'America/Denver', '2026-11-02', 'forecast')!;
    // 00:00 MST on 2 November = 07:00Z → hour ending 08:00Z = index 56.
    expect(day.hourly[0]!.ghiWm2).toBe(56);
  });

  it('local stamps (the service asked for a time zone) give the same day as UTC stamps', () => {
    const utcSeries = series('2026-10-31T00:00:00Z', 96);
    // The same instants written in Denver local time, 01:00 appearing twice on 1 November.
    const fmt = new Intl.DateTimeFormat('sv-SE', {
      timeZone: 'America/Denver',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    });
    const stamps = utcSeries.times.map((t) => fmt.format(new Date(t)).replace(' ', 'T'));
    expect(stamps.filter((s) => s === '2026-11-01T01:00')).toHaveLength(2);
    const local = { ...utcSeries, times: instantsOfLocalStamps('America/Denver', stamps) };
    expect(local.times).toEqual(utcSeries.times);
    expect(dayFromSeries(local, 'America/Denver', '2026-11-01', 'forecast')).toEqual(
      dayFromSeries(utcSeries, 'America/Denver', '2026-11-01', 'forecast'),
    );
  });

  it('a series that misses an hour of the day gives no day', () => {
    const s = series('2027-01-09T00:00:00Z', 40);
    // 2027-01-10 23:00 IST ends at 2027-01-10 18:30Z, needing the stamp 19:00Z = index 43.
    expect(dayFromSeries(s, 'Asia/Kolkata', '2027-01-10', 'forecast')).toBeNull();
    const holes = series('2027-01-09T00:00:00Z', 72, { temp: (i) => (i === 30 ? NaN : 5) });
    expect(dayFromSeries(holes, 'Asia/Kolkata', '2027-01-10', 'forecast')).toBeNull();
  });

  it("summarises the day: oktas from the daylight hours' cloud, high and low from the hours", () => {
    // UTC zone: hour h takes the stamp h+1 for sun. Sun 07:00–17:00 (stamps 8..17), 75 % cloud by day, 0 % at night.
    const s = series('2027-06-01T00:00:00Z', 48, {
      ghi: (i) => (i >= 8 && i <= 17 ? 400 : 0),
      cloud: (i) => (i >= 7 && i <= 18 ? 75 : 0),
      temp: (i) => (i === 14 ? 31 : i === 5 ? -3 : 10),
    });
    const day = dayFromSeries(s, 'UTC', '2027-06-01', 'forecast')!;
    // Daylight rows are 07:00..16:00 (stamps 8..17); their mid-hour cloud is 75 % → 6 oktas.
    expect(day.cloudOktas).toBe(6);
    // Temperatures at mid-hour interpolate: 13:30 → (10 + 31)/2 = 20.5 is the highest; 04:30 → (10 − 3)/2 = 3.5 the lowest.
    expect(day.highC).toBe(20.5);
    expect(day.lowC).toBe(3.5);
  });
});

const stop = (over: Partial<StopLike> = {}): StopLike => ({
  lat: 46.53,
  lon: 7.96,
  timeZone: 'Europe/Zurich',
  arrive: '2027-03-10',
  nights: 2,
  ...over,
});

describe('which days come from where', () => {
  it('a stop owns its arrival day to its departure morning, unless the next stop arrives there at midnight', () => {
    expect(stopDates([stop()], 0)).toEqual(['2027-03-10', '2027-03-11', '2027-03-12']);
    expect(stopDates([stop(), stop({ arrive: '2027-03-12', arriveHour: 0 })], 0)).toEqual(['2027-03-10', '2027-03-11']);
    expect(stopDates([stop(), stop({ arrive: '2027-03-12' })], 0)).toHaveLength(3);
  });

  it('near trips start within 16 days (today and 15 more)', () => {
    expect(isNearTrip([stop({ arrive: '2026-12-19' })], '2026-12-04')).toBe(true);
    expect(isNearTrip([stop({ arrive: '2026-12-20' })], '2026-12-04')).toBe(false);
  });

  it('the forecast request covers the untyped days in reach, one UTC day either side, on the 0.1° grid', () => {
    const s = stop({ arrive: '2026-12-10', nights: 3, weather: [{ date: '2026-12-13', cloudOktas: 2, highC: 5, lowC: -4 }] });
    expect(forecastRequest([s], 0, '2026-12-04')).toEqual({
      kind: 'forecast',
      latTenths: 465,
      lonTenths: 80,
      startDate: '2026-12-09',
      endDate: '2026-12-13',
    });
    // A stop reaching past today + 15 (2026-12-19) is asked up to the horizon only.
    expect(forecastRequest([stop({ arrive: '2026-12-17', nights: 5 })], 0, '2026-12-04')!.endDate).toBe('2026-12-19');
    expect(forecastRequest([stop({ arrive: '2027-01-17' })], 0, '2026-12-04')).toBeNull();
  });

  it('past years: the ten most recent years whose same dates are in the archive; 29 February becomes the 28th', () => {
    expect(pastYearShifts(['2027-03-10', '2027-03-12'], '2026-12-04')).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    // Dates that have not yet come round this year start a year further back.
    expect(pastYearShifts(['2027-12-20'], '2026-12-04')[0]).toBe(2);
    expect(pastYearShifts(['2026-11-30'], '2026-12-04')[0]).toBe(1);
    expect(yearsBefore('2028-02-29', 1)).toBe('2027-02-28');
    expect(yearsBefore('2028-02-29', 4)).toBe('2024-02-29');
    expect(archiveRequest(stop(), ['2027-03-10', '2027-03-12'], 3)).toEqual({
      kind: 'archive',
      latTenths: 465,
      lonTenths: 80,
      startDate: '2024-03-09',
      endDate: '2024-03-13',
    });
  });
});

describe('the median year and the merge', () => {
  const year = (y: number, ghi: number): PastYear => ({ year: y, yearsBack: 2027 - y, ghiWhM2: ghi, stops: [] });

  it('is the lower of the two middle years by total irradiance', () => {
    const totals = [5200, 4100, 6100, 3900, 4800, 5000, 4500, 5900, 4300, 5600];
    const years = totals.map((g, i) => year(2026 - i, g));
    // Sorted: 3900 4100 4300 4500 4800 | 5000 5200 5600 5900 6100 → the 5th, 4800 (2022).
    expect(medianYear(years)).toMatchObject({ year: 2022, ghiWhM2: 4800 });
    expect(medianYear(years.slice(0, 3))).toMatchObject({ ghiWhM2: 5200 });
    expect(medianYear([])).toBeNull();
  });

  it('typed days always win over fetched ones; an uncovered day is copied from the nearest covered one', () => {
    const s = stop({ arrive: '2027-03-10', nights: 3, weather: [{ date: '2027-03-11', cloudOktas: 7, highC: 3, lowC: -2 }] });
    const fetched = (date: string, source: 'forecast' | 'past-year'): WeatherEntry => ({
      date,
      cloudOktas: 1,
      highC: 12,
      lowC: 1,
      hourly: [{ hour: 12, ghiWm2: 500, tempC: 12, cloudPct: 10 }],
      source,
    });
    const fill = mergeStop(
      [s],
      0,
      [fetched('2027-03-10', 'forecast'), fetched('2027-03-11', 'forecast')],
      [fetched('2027-03-10', 'past-year'), fetched('2027-03-12', 'past-year')],
    );
    expect(fill.name).toBe('Stop 1');
    expect(fill.weather.map((w) => [w.date, w.source])).toEqual([
      ['2027-03-10', 'forecast'],
      ['2027-03-11', 'typed'],
      ['2027-03-12', 'past-year'],
    ]);
    expect(fill.weather[1]).toEqual({ date: '2027-03-11', cloudOktas: 7, highC: 3, lowC: -2, hourly: [], source: 'typed' });
    expect(fill.days.map((d) => d.source)).toEqual(['forecast', 'typed', 'past-year', 'copied']);
    // 13 March has nothing: the engine uses the nearest covered day, the 12th (a past year).
    expect(fill.days[3]).toEqual({ date: '2027-03-13', source: 'copied', from: '2027-03-12', fromSource: 'past-year' });
  });
});
