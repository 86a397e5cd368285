import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fetchWeatherApi } from 'openmeteo';
import { Variable } from '@openmeteo/sdk/variable';
import { Unit } from '@openmeteo/sdk/unit';
import { startFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';

// The local fake weather server, read back by the service's own SDK: if the fake's FlatBuffers
// were laid out wrongly, `fetchWeatherApi` would read other fields, zeros or throw.

const HOURLY = 'shortwave_radiation,temperature_2m,cloud_cover';
let fake: FakeWeather;

beforeAll(async () => {
  fake = await startFakeWeather({ quiet: true });
});
afterAll(async () => {
  await fake.stop();
});

function isoDay(offsetDays: number): string {
  return new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

describe('fake weather service, decoded by the openmeteo SDK', () => {
  it('answers a forecast request with every asked variable, in order, hour by hour', async () => {
    const start = isoDay(1);
    const end = isoDay(3);
    const [r, ...more] = await fetchWeatherApi(
      fake.forecastUrl,
      { latitude: [46.5], longitude: [7.9], hourly: HOURLY, start_date: start, end_date: end, timezone: 'GMT' },
      1,
    );
    expect(more).toHaveLength(0);
    expect(r!.latitude()).toBeCloseTo(46.5, 4);
    expect(r!.longitude()).toBeCloseTo(7.9, 4);
    expect(r!.utcOffsetSeconds()).toBe(0);
    expect(r!.timezone()).toBe('GMT');
    const h = r!.hourly()!;
    expect(Number(h.time())).toBe(Date.parse(`${start}T00:00:00Z`) / 1000);
    expect(Number(h.timeEnd())).toBe(Date.parse(`${end}T00:00:00Z`) / 1000 + 86_400);
    expect(h.interval()).toBe(3600);
    expect(h.variablesLength()).toBe(3);
    const [ghi, temp, cloud] = [0, 1, 2].map((i) => h.variables(i)!);
    expect([ghi!.variable(), ghi!.unit()]).toEqual([Variable.shortwave_radiation, Unit.watt_per_square_metre]);
    expect([temp!.variable(), temp!.unit(), temp!.altitude()]).toEqual([Variable.temperature, Unit.celsius, 2]);
    expect([cloud!.variable(), cloud!.unit()]).toEqual([Variable.cloud_cover, Unit.percentage]);
    for (const v of [ghi!, temp!, cloud!]) expect(v.valuesArray()!.length).toBe(72);
    const g = Array.from(ghi!.valuesArray()!);
    // Night at 46.5° N, 7.9° E: the sun is down around 23:00–04:00 UTC in any season.
    expect(g[0]).toBe(0);
    expect(Math.max(...g)).toBeGreaterThan(20);
    expect(Math.max(...g)).toBeLessThan(1100);
    for (const c of cloud!.valuesArray()!) expect(c >= 0 && c <= 100).toBe(true);
    for (const t of temp!.valuesArray()!) expect(t > -40 && t < 45).toBe(true);
  });

  it('is deterministic and differs between places and years', async () => {
    const q = (lat: number, start: string, end: string) =>
      fetchWeatherApi(fake.archiveUrl, { latitude: [lat], longitude: [-105.9], hourly: HOURLY, start_date: start, end_date: end }, 1);
    const a = Array.from((await q(35.6, '2020-07-01', '2020-07-02'))[0]!.hourly()!.variables(0)!.valuesArray()!);
    const b = Array.from((await q(35.6, '2020-07-01', '2020-07-02'))[0]!.hourly()!.variables(0)!.valuesArray()!);
    const c = Array.from((await q(35.6, '2019-07-01', '2019-07-02'))[0]!.hourly()!.variables(0)!.valuesArray()!);
    const d = Array.from((await q(44.0, '2020-07-01', '2020-07-02'))[0]!.hourly()!.variables(0)!.valuesArray()!);
    expect(b).toEqual(a);
    expect(c).not.toEqual(a);
    expect(d).not.toEqual(a);
  });

  it('answers several places in one request as several size-prefixed roots', async () => {
    const rs = await fetchWeatherApi(
      fake.archiveUrl,
      { latitude: [46.5, -33.9], longitude: [7.9, 18.4], hourly: 'temperature_2m', start_date: '2016-07-05', end_date: '2016-07-05' },
      1,
    );
    expect(rs).toHaveLength(2);
    expect(rs[1]!.latitude()).toBeCloseTo(-33.9, 4);
    const north = Array.from(rs[0]!.hourly()!.variables(0)!.valuesArray()!);
    const south = Array.from(rs[1]!.hourly()!.variables(0)!.valuesArray()!);
    // July: summer in the Alps, winter at the Cape.
    expect(Math.max(...north)).toBeGreaterThan(Math.max(...south));
  });

  it('starts at local midnight when asked for a time zone, as the service does', async () => {
    const [r] = await fetchWeatherApi(
      fake.archiveUrl,
      {
        latitude: [39.7],
        longitude: [-105],
        hourly: 'temperature_2m',
        start_date: '2025-11-02',
        end_date: '2025-11-02',
        timezone: 'America/Denver',
      },
      1,
    );
    // 2025-11-02 00:00 in Denver is still daylight time (UTC−6): 06:00 UTC.
    expect(Number(r!.hourly()!.time())).toBe(Date.parse('2025-11-02T06:00:00Z') / 1000);
    expect(r!.utcOffsetSeconds()).toBe(-6 * 3600);
  });

  it('refuses what the service refuses, with its JSON reason', async () => {
    await expect(
      fetchWeatherApi(
        fake.forecastUrl,
        { latitude: [46.5], longitude: [7.9], hourly: HOURLY, start_date: isoDay(30), end_date: isoDay(31) },
        1,
      ),
    ).rejects.toThrow(/out of allowed range/);
    await expect(
      fetchWeatherApi(
        fake.archiveUrl,
        { latitude: [46.5], longitude: [7.9], hourly: 'snow_depth_9m', start_date: '2020-01-01', end_date: '2020-01-01' },
        1,
      ),
    ).rejects.toThrow(/snow_depth_9m/);
    await expect(
      fetchWeatherApi(
        fake.archiveUrl,
        { latitude: [95], longitude: [7.9], hourly: HOURLY, start_date: '2020-01-01', end_date: '2020-01-01' },
        1,
      ),
    ).rejects.toThrow(/Latitude/);
  });

  it('fails, hangs and answers garbage when told to, and counts the requests', async () => {
    const control = (mode: string) => fetch(`${fake.url}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode }) });
    await fetch(`${fake.url}/__fake/reset`, { method: 'POST' });
    const params = { latitude: [46.5], longitude: [7.9], hourly: HOURLY, start_date: '2020-01-01', end_date: '2020-01-01' };
    await control('fail');
    await expect(fetchWeatherApi(fake.archiveUrl, params, 1)).rejects.toThrow();
    await control('garbage');
    // Garbage either throws while decoding or decodes into a root with no hourly data.
    const garbage = await fetchWeatherApi(fake.archiveUrl, params, 1).then(
      (rs) =>
        rs.every((r) => {
          try {
            return r.hourly() === null || r.hourly()!.variablesLength() === 0;
          } catch {
            return true;
          }
        }),
      () => true,
    );
    expect(garbage).toBe(true);
    await control('hang');
    const abort = AbortSignal.timeout(300);
    await expect(fetchWeatherApi(fake.archiveUrl, params, 1, 0.2, 2, { signal: abort })).rejects.toThrow();
    const stats = (await (await fetch(`${fake.url}/__fake/stats`)).json()) as { archive: number; forecast: number };
    expect(stats).toMatchObject({ archive: 3, forecast: 0 });
    await fetch(`${fake.url}/__fake/reset`, { method: 'POST' });
    const ok = await fetchWeatherApi(fake.archiveUrl, params, 1);
    expect(ok[0]!.hourly()!.variablesLength()).toBe(3);
  });
});
