import { afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { makeLoad, makeRig } from '../helpers/crew';

// A saved trip's forecast run (POST /api/trips/:id/forecasts) fills every untyped stop-day from
// the local fake weather service: the median past year for a far trip (and the ten years as a
// band), the forecast for a near one (and skies two steps either way as a band). Typed days win,
// and a failed service leaves the run working on typed days (copied to the untyped ones) with a message.

const fakeUrl = () => inject('weatherUrl');
const DAY = 86_400_000;
const isoDay = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

interface Saved {
  id: string;
  plan: { stops: { weather: { date: string; source?: string; hourly?: { hour: number; ghiWm2?: number }[]; cloudOktas: number }[] }[] };
  forecast: {
    hourly: { time: string; socPct: number; usablePct: number }[];
    summary: { firstCutoffAt: string | null; minSocPct: number };
    warnings: { code: string; message: string }[];
    weatherSources?: { kind: string; status: string; message: string | null; medianYear: number | null; stops: { name: string; days: { date: string; source: string }[] }[] };
    band?: { kind: string; runs: { label: string; year: number | null; ok: boolean; minSocPct: number; firstCutoffAt: string | null }[]; lowPct: number[]; highPct: number[]; madeIt: number; total: number; worst: string; sentence: string } | null;
  };
}

let owner: Session;
let rigId: string;
let place = 0;

function stopAt(arrive: string, nights: number, extra: Record<string, unknown> = {}) {
  place += 1;
  return { name: `Camp ${place}`, lat: 44.1, lon: -120 + place * 0.5, timeZone: 'America/Los_Angeles', arrive, nights, ...extra };
}

async function tripOf(stops: unknown[]): Promise<{ id: string; stops: { weather: unknown[] }[] }> {
  const res = await api('/api/trips', { method: 'POST', session: owner, json: { rigId, name: 'Forecast weather trip', stops } });
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string; stops: { weather: unknown[] }[] };
}

async function run(tripId: string): Promise<Saved> {
  const res = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner });
  expect(res.status).toBe(201);
  const created = (await res.json()) as { id: string };
  // Read back what was saved, not only what the run answered.
  const back = await api(`/api/forecasts/${created.id}`, { session: owner });
  expect(back.status).toBe(200);
  return (await back.json()) as Saved;
}

async function mode(m: 'normal' | 'fail' | 'hang' | 'garbage'): Promise<void> {
  const r = await fetch(`${fakeUrl()}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode: m }) });
  expect(r.status).toBe(200);
}

beforeAll(async () => {
  owner = await signUp();
  rigId = (await makeRig(owner)).id;
  // A heavy load so the band's years differ in whether the bank makes it.
  await makeLoad(owner, rigId, { name: 'Heater fan', watts: 60, dutyPct: 100 });
});
afterEach(async () => {
  await fetch(`${fakeUrl()}/__fake/reset`, { method: 'POST' });
});

describe('a far trip with no typed weather', () => {
  it('runs on the median past year, keeps each day source and a ten-year band with its sentence', async () => {
    const t = await tripOf([stopAt(isoDay(60), 3), stopAt(isoDay(63), 2)]);
    const saved = await run(t.id);
    const src = saved.forecast.weatherSources!;
    expect(src.kind).toBe('far');
    expect(src.status).toBe('ok');
    expect(src.medianYear).toBeGreaterThan(2000);
    const sources = src.stops.flatMap((s) => s.days.map((d) => d.source));
    expect(sources.length).toBe(4 + 3);
    expect(new Set(sources)).toEqual(new Set(['past-year']));
    // The plan snapshot holds the hours the engine ran on, with their source.
    for (const stop of saved.plan.stops) {
      expect(stop.weather.length).toBeGreaterThan(0);
      for (const w of stop.weather) {
        expect(w.source).toBe('past-year');
        expect(w.hourly!.length).toBeGreaterThanOrEqual(23);
      }
    }
    const band = saved.forecast.band!;
    expect(band.kind).toBe('years');
    expect(band.total).toBe(10);
    expect(band.runs.map((r) => r.year)).toContain(src.medianYear);
    expect(band.lowPct.length).toBe(saved.forecast.hourly.length);
    // The median year's usable charge lies inside the band, hour by hour.
    saved.forecast.hourly.forEach((r, i) => {
      expect(band.lowPct[i]!).toBeLessThanOrEqual(r.usablePct + 0.11);
      expect(band.highPct[i]!).toBeGreaterThanOrEqual(r.usablePct - 0.11);
    });
    expect(band.madeIt).toBe(band.runs.filter((r) => r.ok).length);
    // The sentence carries the counted years and the worst year found in the runs.
    const worst = band.runs.find((r) => r.label === band.worst)!;
    expect(band.sentence).toContain(`of the last 10 years' weather`);
    expect(band.sentence).toContain(`(${worst.label})`);
    expect(band.sentence).toMatch(worst.firstCutoffAt ? /(reaches the floor|sags to the low-voltage cutoff) on (night|day) \d+ at \d\d:00/ : /gets down to \d+ % on (night|day) \d+ at \d\d:00/);
    expect(band.sentence.startsWith(`In ${band.madeIt === 10 ? 'all 10' : band.madeIt === 0 ? 'none' : band.madeIt} of the last 10`)).toBe(true);
    expect(band.runs.every((r) => r.minSocPct >= Math.min(...band.lowPct) - 0.11)).toBe(true);
  });
});

describe('typed days and a failed service', () => {
  it('keeps typed days as typed, and runs on typed days copied to the untyped ones with a message when the service is down', async () => {
    const d0 = isoDay(70);
    const typed = { date: d0, cloudOktas: 7, highC: 11, lowC: 2 };
    const t = await tripOf([stopAt(d0, 2, { weather: [typed] })]);
    await mode('fail');
    const saved = await run(t.id);
    const src = saved.forecast.weatherSources!;
    expect(src.status).toBe('unreachable');
    expect(src.message).toMatch(/^Weather service unreachable — using your typed skies and each stop's nearest day with weather/);
    // What the engine really used: the typed day, copied to the two untyped ones.
    expect(src.stops[0]!.days).toEqual([
      { date: d0, source: 'typed' },
      { date: isoDay(71), source: 'copied', from: d0, fromSource: 'typed' },
      { date: isoDay(72), source: 'copied', from: d0, fromSource: 'typed' },
    ]);
    expect(saved.forecast.band ?? null).toBeNull();
    const w = saved.plan.stops[0]!.weather;
    expect(w).toHaveLength(1);
    expect(w[0]).toMatchObject({ ...typed, source: 'typed' });
    // The trip itself still holds exactly what was typed.
    const trip = (await (await api(`/api/trips/${t.id}`, { session: owner })).json()) as { stops: { weather: unknown[] }[] };
    expect(trip.stops[0]!.weather).toEqual([typed]);
    // No day is assumed: the engine reports none either.
    expect(src.stops[0]!.days.filter((d) => d.source === 'assumed')).toHaveLength(0);
    expect(saved.forecast.warnings.filter((w) => w.code === 'weather-assumed')).toHaveLength(0);
  });

  it('fills around typed days when the service answers, never over them', async () => {
    const d0 = isoDay(80);
    const typed = { date: d0, cloudOktas: 8, highC: 5, lowC: -1 };
    const t = await tripOf([stopAt(d0, 2, { weather: [typed] })]);
    const saved = await run(t.id);
    expect(saved.forecast.weatherSources!.stops[0]!.days.map((d) => d.source)).toEqual(['typed', 'past-year', 'past-year']);
    expect(saved.plan.stops[0]!.weather.find((w) => w.date === d0)).toMatchObject({ ...typed, source: 'typed' });
  });
});

describe('a near trip', () => {
  it('runs on the forecast and bands skies two steps either way', async () => {
    const t = await tripOf([stopAt(isoDay(2), 3)]);
    const saved = await run(t.id);
    const src = saved.forecast.weatherSources!;
    expect(src.kind).toBe('near');
    expect(src.stops[0]!.days.map((d) => d.source)).toEqual(['forecast', 'forecast', 'forecast', 'forecast']);
    const band = saved.forecast.band!;
    expect(band.kind).toBe('skies');
    expect(band.runs.map((r) => r.label)).toEqual(['two steps cloudier', 'as forecast', 'two steps clearer']);
    // Cloudier skies never leave the bank fuller than clearer ones.
    const [worse, , better] = band.runs;
    expect(worse!.minSocPct).toBeLessThanOrEqual(better!.minSocPct);
    expect(band.sentence).toMatch(/stays above its floor( and its cutoff voltage)? in (all 3|none of the 3|\d of 3) cases/);
  });
});
