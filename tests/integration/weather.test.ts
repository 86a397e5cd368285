import { openTestDb } from '../helpers/test-db';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { makeRig } from '../helpers/crew';

// GET /api/trips/:id/weather against the built server, which asks the local fake weather service
// (a real HTTP server speaking the service's FlatBuffers) through the SDK and caches in SQLite.
// The fake counts the requests it gets, so cache hits and expiry are seen from the outside.

const fakeUrl = () => inject('weatherUrl');
const DAY = 86_400_000;
const isoDay = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

interface Fill {
  tripId: string;
  kind: 'near' | 'far';
  status: 'ok' | 'unreachable';
  message: string | null;
  medianYear: number | null;
  stops: {
    name: string;
    weather: {
      date: string;
      source: string;
      cloudOktas: number;
      highC: number;
      lowC: number;
      hourly: { hour: number; ghiWm2: number; tempC: number; cloudPct: number }[];
    }[];
    days: { date: string; source: string }[];
  }[];
  pastYears: { year: number; yearsBack: number; ghiWhM2: number; stops: { date: string; hourly: unknown[] }[][] }[];
  requests: { total: number; fromCache: number };
}

async function stats(): Promise<{ forecast: number; archive: number }> {
  return (await (await fetch(`${fakeUrl()}/__fake/stats`)).json()) as { forecast: number; archive: number };
}
async function mode(m: 'normal' | 'fail' | 'hang' | 'garbage', status?: number): Promise<void> {
  const r = await fetch(`${fakeUrl()}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode: m, status }) });
  expect(r.status).toBe(200);
}

let owner: Session;
let rigId: string;
let place = 0;

/** A stop at a place no other test uses (its own cache rows), 0.5° apart. */
function stopAt(arrive: string, nights: number, extra: Record<string, unknown> = {}) {
  place += 1;
  return { name: `Camp ${place}`, lat: 39.7, lon: -110 + place * 0.5, timeZone: 'America/Denver', arrive, nights, ...extra };
}

async function trip(stops: unknown[]): Promise<{ id: string; stops: unknown[] }> {
  const res = await api('/api/trips', { method: 'POST', session: owner, json: { rigId, name: 'Weather trip', stops } });
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string; stops: unknown[] };
}

async function fill(tripId: string): Promise<Fill> {
  const res = await api(`/api/trips/${tripId}/weather`, { session: owner });
  expect(res.status).toBe(200);
  return (await res.json()) as Fill;
}

function ageCache(hours: number): void {
  const db = openTestDb({ write: true });
  db.prepare('update weather_cache set fetched_at = ?').run(new Date(Date.now() - hours * 3_600_000).toISOString());
  db.close();
}

beforeAll(async () => {
  owner = await signUp();
  rigId = (await makeRig(owner)).id;
});
afterEach(async () => {
  await fetch(`${fakeUrl()}/__fake/reset`, { method: 'POST' });
});
afterAll(async () => {
  await fetch(`${fakeUrl()}/__fake/reset`, { method: 'POST' });
});

describe('a trip within the forecast', () => {
  it('fills every untyped stop-day from the forecast, keeps the typed day, asks once and then answers from the cache', async () => {
    const typed = { date: isoDay(4), cloudOktas: 7, highC: 3, lowC: -6 };
    const t = await trip([stopAt(isoDay(3), 2, { weather: [typed] })]);
    const before = await stats();
    const f = await fill(t.id);
    expect(f.kind).toBe('near');
    expect(f.status).toBe('ok');
    expect(f.message).toBeNull();
    expect(f.stops[0]!.days).toEqual([
      { date: isoDay(3), source: 'forecast' },
      { date: isoDay(4), source: 'typed' },
      { date: isoDay(5), source: 'forecast' },
    ]);
    const [d3, d4, d5] = f.stops[0]!.weather;
    expect(d4).toEqual({ ...typed, hourly: [], source: 'typed' });
    for (const d of [d3!, d5!]) {
      expect(d.hourly.map((h) => h.hour)).toEqual(Array.from({ length: 24 }, (_, i) => i));
      expect(d.highC).toBe(Math.max(...d.hourly.map((h) => h.tempC)));
      expect(d.lowC).toBe(Math.min(...d.hourly.map((h) => h.tempC)));
      expect(d.cloudOktas >= 0 && d.cloudOktas <= 8).toBe(true);
      // Night in Denver has no sun; the middle of the day has some.
      expect(d.hourly[2]!.ghiWm2).toBe(0);
      expect(d.hourly[12]!.ghiWm2).toBeGreaterThan(0);
    }
    expect(await stats()).toEqual({ ...before, forecast: before.forecast + 1, mode: 'normal' });

    // Opened again: the same answer, from the cache, without asking the service.
    const again = await fill(t.id);
    expect(again.stops).toEqual(f.stops);
    expect(again.requests).toEqual({ total: 1, fromCache: 1 });
    expect((await stats()).forecast).toBe(before.forecast + 1);

    // The trip itself is untouched.
    const stored = (await (await api(`/api/trips/${t.id}`, { session: owner })).json()) as { stops: { weather: unknown[] }[] };
    expect(stored.stops[0]!.weather).toEqual([typed]);
  });

  it('asks again once a cached forecast is older than three hours', async () => {
    const t = await trip([stopAt(isoDay(1), 1)]);
    await fill(t.id);
    const asked = (await stats()).forecast;
    ageCache(2.9);
    expect((await fill(t.id)).requests.fromCache).toBe(1);
    expect((await stats()).forecast).toBe(asked);
    ageCache(3.1);
    const f = await fill(t.id);
    expect(f.requests.fromCache).toBe(0);
    expect((await stats()).forecast).toBe(asked + 1);
  });
});

describe('a trip beyond the forecast', () => {
  it('fills from the same dates of the last ten years, the median year by irradiance, every year kept; history never expires', async () => {
    const t = await trip([stopAt(isoDay(60), 2), stopAt(isoDay(62), 1)]);
    const before = await stats();
    const f = await fill(t.id);
    expect(f.kind).toBe('far');
    expect(f.status).toBe('ok');
    // Two stops × ten years.
    expect((await stats()).archive).toBe(before.archive + 20);
    expect(f.pastYears).toHaveLength(10);
    expect(f.pastYears.map((y) => y.yearsBack)).toEqual(f.pastYears.map((_, i) => f.pastYears[0]!.yearsBack + i));
    // The median: sort the ten totals, take the lower of the two middle ones (5th of 10).
    const sorted = [...f.pastYears].sort((a, b) => a.ghiWhM2 - b.ghiWhM2);
    expect(f.medianYear).toBe(sorted[4]!.year);
    const median = f.pastYears.find((y) => y.year === f.medianYear)!;
    for (const [i, s] of f.stops.entries()) {
      expect(s.days.every((d) => d.source === 'past-year')).toBe(true);
      expect(s.weather.map((w) => w.date)).toEqual(s.days.map((d) => d.date));
      expect(s.weather.map((w) => w.hourly)).toEqual(median.stops[i]!.map((d) => d.hourly));
    }
    // Years differ (the fake seeds its clouds by date).
    expect(new Set(f.pastYears.map((y) => y.ghiWhM2)).size).toBeGreaterThan(5);

    ageCache(24 * 365 * 3);
    const again = await fill(t.id);
    expect(again.requests).toEqual({ total: 20, fromCache: 20 });
    expect((await stats()).archive).toBe(before.archive + 20);
  });
});

describe('when the service fails', () => {
  it.each([
    ['answers 500', 'fail', 500, /could not be reached/],
    ['answers 503 (the SDK reads its body as FlatBuffers: garbage)', 'fail', 503, /not weather/],
    ['answers garbage', 'garbage', undefined, /not weather/],
  ] as const)(
    '%s: a clear message, typed skies kept, the other day copied from the typed one, the trip unchanged',
    async (_, m, status, why) => {
      const typed = { date: isoDay(2), cloudOktas: 5, highC: 8, lowC: 1 };
      const t = await trip([stopAt(isoDay(2), 1, { weather: [typed] })]);
      await mode(m, status);
      const f = await fill(t.id);
      expect(f.status).toBe('unreachable');
      expect(f.message).toMatch(
        /^Weather service unreachable — using your typed skies and each stop's nearest day with weather for its days without any\./,
      );
      expect(f.message).toMatch(why);
      // The engine uses the typed day for the untyped one: the badge says so, not "assumed".
      expect(f.stops[0]!.days).toEqual([
        { date: isoDay(2), source: 'typed' },
        { date: isoDay(3), source: 'copied', from: isoDay(2), fromSource: 'typed' },
      ]);
      expect(f.stops[0]!.weather).toEqual([{ ...typed, hourly: [], source: 'typed' }]);
      const stored = (await (await api(`/api/trips/${t.id}`, { session: owner })).json()) as { stops: { weather: unknown[] }[] };
      expect(stored.stops[0]!.weather).toEqual([typed]);
    },
  );

  it('says "typical skies" alone when nothing was typed, and retries a failing request at most twice', async () => {
    const t = await trip([stopAt(isoDay(2), 1)]);
    await mode('fail');
    const f = await fill(t.id);
    expect(f.message).toMatch(/^Weather service unreachable — using typical skies/);
    expect((await stats()).forecast).toBe(2);
  });

  it('stops waiting for a hanging service at the deadline (5 s)', async () => {
    const t = await trip([stopAt(isoDay(70), 1)]);
    await mode('hang');
    const started = Date.now();
    const f = await fill(t.id);
    const took = Date.now() - started;
    expect(f.status).toBe('unreachable');
    expect(f.message).toMatch(/did not answer in time/);
    expect(f.stops[0]!.days.every((d) => d.source === 'assumed')).toBe(true);
    expect(took).toBeGreaterThanOrEqual(4_900);
    expect(took).toBeLessThan(8_000);
  });

  it('uses a stale cached forecast while the service is down', async () => {
    const t = await trip([stopAt(isoDay(1), 1)]);
    expect((await fill(t.id)).status).toBe('ok');
    ageCache(5);
    await mode('fail');
    const f = await fill(t.id);
    expect(f.status).toBe('unreachable');
    expect(f.message).toMatch(/^Weather service unreachable — using weather saved earlier/);
    expect(f.stops[0]!.days.every((d) => d.source === 'forecast')).toBe(true);
  });
});
