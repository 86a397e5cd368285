// A band handed to a worker: the past years packed into one typed array come back exactly, and the
// worker builds and runs the same plans the request thread used to build and send.
import { describe, expect, it } from 'vitest';
import { validatePlan, type ResolvedPlan } from '../../src/engine';
import { bandPlans, bandTask, packYears, skyPlans, unpackYears, yearPlans } from '../../src/domain/weather/band';
import { runBandPlans, runBandTask } from '../../src/domain/weather/band-run';
import type { PastYear, StopLike, WeatherEntry } from '../../src/domain/weather/weather';

const stops: StopLike[] = [
  {
    name: 'Cedar rim',
    lat: 37.2,
    lon: -112.1,
    timeZone: 'America/Denver',
    arrive: '2027-04-10',
    nights: 2,
    weather: [{ date: '2027-04-11', cloudOktas: 7, highC: 9, lowC: 0 }],
  },
  { name: 'Salt flat', lat: 38.1, lon: -113.4, timeZone: 'America/Denver', arrive: '2027-04-12', nights: 1 },
];
const dates = [
  ['2027-04-10', '2027-04-11', '2027-04-12'],
  ['2027-04-12', '2027-04-13'],
];

/** A sunny-ish day whose noon irradiance and night cold follow `k`. */
function day(date: string, k: number, source: WeatherEntry['source']): WeatherEntry {
  const hourly = Array.from({ length: 24 }, (_, h) => ({
    hour: h,
    ghiWm2: h >= 7 && h <= 18 ? Math.round((250 + 40 * k) * Math.sin(((h - 6) / 13) * Math.PI)) : 0,
    tempC: -2 + k / 2 + h / 3,
    cloudPct: (k * 9) % 100,
  }));
  return { date, cloudOktas: k % 9, highC: 6 + k, lowC: -2 + k / 2, hourly, source };
}

const years: PastYear[] = [2026, 2025, 2024, 2023].map((year, i) => ({
  year,
  yearsBack: i + 1,
  ghiWhM2: 4000 + i * 100,
  stops: dates.map((ds) => ds.filter((d) => d !== '2027-04-11').map((d, j) => day(d, i * 3 + j, 'past-year'))),
}));

function plan(): ResolvedPlan {
  const v = validatePlan({
    bank: { chemistry: 'agm', capacityAh: 100 },
    arrays: [{ name: 'Roof', ratedWatts: 200 }],
    loads: [{ name: 'Fridge', watts: 45, dutyPct: 40 }],
    stops: stops.map((s, i) => ({ ...s, weather: [...(s.weather ?? []).map((w) => ({ ...w, source: 'typed' })), ...years[1]!.stops[i]!] })),
  });
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

describe('handing a band to a worker', () => {
  it('packs past years into one typed array and unpacks them unchanged', () => {
    const packed = packYears(years);
    expect(packed.hours).toBeInstanceOf(Float64Array);
    expect(packed.hours.length).toBe(4 * 4 * 4 * 24);
    expect(unpackYears(structuredClone(packed))).toEqual(years);
  });

  it('a far trip: the worker builds the same plans as yearPlans, in the order of the labels, and runs them alike', () => {
    const p = plan();
    const made = bandTask(p, stops, { kind: 'far', pastYears: years });
    if (!made) throw new Error('no band');
    expect(made.labels.map((l) => l.label)).toEqual(['2023', '2024', '2025', '2026']);
    const task = structuredClone(made.task);
    const direct = yearPlans(p, stops, years).map((r) => r.plan);
    expect(JSON.stringify(bandPlans(task))).toBe(JSON.stringify(direct));
    expect(runBandTask(task)).toEqual(runBandPlans(direct));
  });

  it('a near trip: skies two steps either way; nothing to vary without fetched days', () => {
    const p = plan();
    const made = bandTask(p, stops, { kind: 'near', pastYears: [] });
    if (!made) throw new Error('no band');
    expect(made.labels.map((l) => l.label)).toEqual(skyPlans(p).map((r) => r.label));
    expect(JSON.stringify(bandPlans(structuredClone(made.task)))).toBe(JSON.stringify(skyPlans(p).map((r) => r.plan)));
    const typedOnly = validatePlan({ bank: { chemistry: 'agm', capacityAh: 100 }, stops: [{ ...stops[0]!, weather: stops[0]!.weather }] });
    if (!typedOnly.ok) throw new Error();
    expect(bandTask(typedOnly.plan, [stops[0]!], { kind: 'near', pastYears: [] })).toBeNull();
  });
});
