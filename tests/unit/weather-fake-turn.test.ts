import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { fetchWeatherApi } from 'openmeteo';
import { readTurn, startFakeWeather, turnFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';

// The fake weather server's "turn the weather" control, read back through the service's own SDK:
// a storm in the forecast answers (overcast, dim, cold) from local midnight of a chosen day, the
// archive untouched, the same answer every time, and back to the very same normal answer after.

const HOURLY = 'shortwave_radiation,temperature_2m,cloud_cover';
let fake: FakeWeather;

beforeAll(async () => {
  fake = await startFakeWeather({ quiet: true });
});
afterAll(async () => {
  await fake.stop();
});
beforeEach(async () => {
  await fetch(`${fake.url}/__fake/reset`, { method: 'POST' });
});

function isoDay(offsetDays: number): string {
  return new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

interface Hours {
  time: number;
  ghi: number[];
  temp: number[];
  cloud: number[];
}

async function forecast(params: Record<string, unknown>, url = fake.forecastUrl): Promise<Hours> {
  const [r] = await fetchWeatherApi(url, { latitude: [44.2], longitude: [-71.3], hourly: HOURLY, ...params }, 1);
  const h = r!.hourly()!;
  const values = (i: number) => Array.from(h.variables(i)!.valuesArray()!);
  return { time: Number(h.time()), ghi: values(0), temp: values(1), cloud: values(2) };
}

const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
const mean = (xs: number[]) => sum(xs) / xs.length;

async function post(path: string, body: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
  const res = await fetch(`${fake.url}${path}`, { method: 'POST', body: typeof body === 'string' ? body : JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

describe('turning the fake weather', () => {
  it('makes every forecast hour overcast, a tenth of the clear-sky light and about 12 °C colder', async () => {
    const day = { start_date: isoDay(2), end_date: isoDay(2), timezone: 'GMT' };
    const normal = await forecast(day);
    const clearSky = await forecast({ ...day, fake_sky: 'clear' });
    expect(await turnFakeWeather(fake.url, 'storm')).toEqual({ mode: 'storm', from: null });
    const storm = await forecast(day);

    for (const c of storm.cloud) expect(c >= 94 && c <= 100).toBe(true);
    // Storm light is 0.1 × the clear-sky hour means (float32 on the wire: a relative 1e-6 slack).
    storm.ghi.forEach((g, i) => expect(g).toBeCloseTo(clearSky.ghi[i]! * 0.1, 3));
    expect(sum(storm.ghi)).toBeGreaterThan(0);
    expect(sum(storm.ghi)).toBeLessThan(sum(normal.ghi));
    // The normal daily cycle averages out over 24 h, so the day means differ by the 12 °C cooling
    // plus what the normal answer's clouds do to its own cycle (a few tenths at most).
    expect(mean(normal.temp) - mean(storm.temp)).toBeGreaterThan(10.5);
    expect(mean(normal.temp) - mean(storm.temp)).toBeLessThan(13.5);
    // Almost no daily swing under the storm: 2 °C peak to peak.
    expect(Math.max(...storm.temp) - Math.min(...storm.temp)).toBeLessThanOrEqual(2.05);
  });

  it('gives the same storm every time and the very same normal answer after going back', async () => {
    const days = { start_date: isoDay(1), end_date: isoDay(3), timezone: 'GMT' };
    const before = await forecast(days);
    await turnFakeWeather(fake.url, 'storm');
    const a = await forecast(days);
    const b = await forecast(days);
    expect(b).toEqual(a);
    expect(a).not.toEqual(before);
    expect(await turnFakeWeather(fake.url, 'normal')).toEqual({ mode: 'normal', from: null });
    expect(await forecast(days)).toEqual(before);
  });

  it('starts the storm at local midnight of `from` in the asked time zone', async () => {
    const from = isoDay(3);
    const days = { start_date: isoDay(2), end_date: isoDay(4), timezone: 'America/Denver' };
    const normal = await forecast(days);
    await turnFakeWeather(fake.url, 'storm', from);
    const storm = await forecast(days);
    // The first hour of the answer is local midnight of start_date; `from` is 24 hours later
    // (no daylight-saving change in Denver in early December or, if run another time, the check
    // below finds the first storm hour by the wall clock either way).
    const localDate = (i: number) =>
      new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Denver' }).format(new Date((storm.time + i * 3600) * 1000));
    const firstStorm = storm.cloud.findIndex((c, i) => c !== normal.cloud[i] || storm.temp[i] !== normal.temp[i]);
    expect(localDate(firstStorm)).toBe(from);
    expect(localDate(firstStorm - 1)).toBe(isoDay(2));
    expect(
      new Intl.DateTimeFormat('en-GB', { timeZone: 'America/Denver', hour: '2-digit', hourCycle: 'h23' }).format(
        new Date((storm.time + firstStorm * 3600) * 1000),
      ),
    ).toBe('00');
    // Before: the normal answer, hour for hour; from then on: the storm, every hour.
    expect(storm.ghi.slice(0, firstStorm)).toEqual(normal.ghi.slice(0, firstStorm));
    for (const c of storm.cloud.slice(firstStorm)) expect(c).toBeGreaterThanOrEqual(94);
  });

  it('never turns the archive (past years stay as they were)', async () => {
    const past = { start_date: '2021-12-01', end_date: '2021-12-02' };
    const before = await forecast(past, fake.archiveUrl);
    await turnFakeWeather(fake.url, 'storm');
    expect(await forecast(past, fake.archiveUrl)).toEqual(before);
  });

  it('reads the turn back, and reset turns it to normal', async () => {
    await turnFakeWeather(fake.url, 'storm', '2026-12-10');
    expect(await (await fetch(`${fake.url}/__fake/turn`)).json()).toEqual({ mode: 'storm', from: '2026-12-10' });
    expect(await (await fetch(`${fake.url}/__fake/stats`)).json()).toMatchObject({ turn: { mode: 'storm', from: '2026-12-10' } });
    await fetch(`${fake.url}/__fake/reset`, { method: 'POST' });
    expect(await (await fetch(`${fake.url}/__fake/turn`)).json()).toEqual({ mode: 'normal', from: null });
  });

  it('refuses a bad turn with a message naming the field, and keeps the weather it had', async () => {
    await turnFakeWeather(fake.url, 'storm');
    expect(await post('/__fake/turn', { mode: 'hail' })).toEqual({ status: 400, body: { error: "mode must be 'storm' or 'normal'" } });
    expect(await post('/__fake/turn', { mode: 'normal', from: '2026-02-30' })).toEqual({
      status: 400,
      body: { error: 'from must be a date, YYYY-MM-DD' },
    });
    expect(await post('/__fake/turn', '{not json')).toEqual({ status: 400, body: { error: 'body must be JSON' } });
    expect(await (await fetch(`${fake.url}/__fake/turn`)).json()).toEqual({ mode: 'storm', from: null });
    await expect(turnFakeWeather(fake.url, 'sunny' as 'storm')).rejects.toThrow(/mode must be/);
    expect(readTurn([])).toBe('body must be a JSON object');
    expect(readTurn({ mode: 'storm', from: 20261210 })).toBe('from must be a date, YYYY-MM-DD');
  });
});
