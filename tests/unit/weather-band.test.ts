// "How sure is this?": the sky shift (Kasten & Czeplak 1980), the band's envelope and its
// sentence from given runs, the trip-relative "night 2 at 03:00", and the verdict on assumed
// weather and with a band.
import { describe, expect, it } from 'vitest';
import { forecast, validatePlan, type Plan, type ResolvedPlan } from '../../src/engine';
import { verdict } from '../../src/domain/forecasts/verdict';
import { buildBand, cloudFactor, shiftSky, whenInTrip, type Band, type ForecastWithWeather, type RunOutcome } from '../../src/domain/weather/band';
import type { WeatherEntry } from '../../src/domain/weather/weather';

describe('cloudFactor (Kasten & Czeplak 1980, Solar Energy 24:177, GHI = clear-sky × (1 − 0.75·(N/8)^3.4))', () => {
  it('is 1 under a clear sky, 0.25 overcast, and 0.92895 at 4 oktas', () => {
    expect(cloudFactor(0)).toBe(1);
    expect(cloudFactor(8)).toBeCloseTo(0.25, 10);
    // 0.5^3.4 = e^(3.4 · ln 0.5) = e^(−2.35670) = 0.094732; 1 − 0.75 · 0.094732 = 0.928951
    expect(cloudFactor(4)).toBeCloseTo(0.928951, 5);
  });
});

describe('shiftSky', () => {
  const day = (source: WeatherEntry['source']): WeatherEntry => ({
    date: '2027-03-04',
    cloudOktas: 4,
    highC: 12,
    lowC: 1,
    source,
    hourly: [
      { hour: 12, ghiWm2: 500, tempC: 12, cloudPct: 50 },
      { hour: 13, ghiWm2: 400, tempC: 12, cloudPct: 100 },
    ],
  });

  it('moves a fetched hour two oktas cloudier by the ratio of the cloud factors', () => {
    const s = shiftSky(day('forecast'), 2);
    // 50 % = 4 oktas → 6 oktas. 0.75^3.4 = e^(3.4 · ln 0.75) = e^(−0.978121) = 0.376018;
    // f(6) = 1 − 0.75 · 0.376018 = 0.717987; 500 · 0.717987 / 0.928951 = 386.45 → 386 W/m².
    expect(s.hourly[0]).toEqual({ hour: 12, ghiWm2: 386, tempC: 12, cloudPct: 75 });
    // Already overcast stays overcast.
    expect(s.hourly[1]).toEqual({ hour: 13, ghiWm2: 400, tempC: 12, cloudPct: 100 });
    expect(s.cloudOktas).toBe(6);
  });

  it('moves two oktas clearer the other way, and leaves a typed day alone', () => {
    // 8 oktas → 6: 400 · 0.717987 / 0.25 = 1148.78 → 1149 W/m².
    expect(shiftSky(day('past-year'), -2).hourly[1]!.ghiWm2).toBe(1149);
    expect(shiftSky(day('typed'), 2)).toEqual(day('typed'));
  });
});

describe('whenInTrip', () => {
  it('counts nights from the evening of the first day and days from 1', () => {
    expect(whenInTrip('2027-03-05T03:00-07:00', '2027-03-04')).toBe('night 1 at 03:00');
    expect(whenInTrip('2027-03-04T21:00-07:00', '2027-03-04')).toBe('night 1 at 21:00');
    expect(whenInTrip('2027-03-06T02:00-07:00', '2027-03-04')).toBe('night 2 at 02:00');
    expect(whenInTrip('2027-03-06T10:00-07:00', '2027-03-04')).toBe('day 3 at 10:00');
  });
});

describe('buildBand', () => {
  const times = ['2027-03-04T22:00-07:00', '2027-03-04T23:00-07:00', '2027-03-05T00:00-07:00', '2027-03-05T01:00-07:00'];
  const run = (soc: number[], minRow: number, cutoff: number | null): RunOutcome => ({ socEndPct: soc, minSocPct: Math.min(...soc), minSocRow: minRow, firstCutoffRow: cutoff });
  const labels = [2019, 2020, 2021].map((y) => ({ label: String(y), year: y }));

  it('takes the lowest and highest run per hour, counts the runs without a cutoff and names the earliest cutoff as the worst', () => {
    const b = buildBand('years', labels, [run([60, 40, 20, 20], 2, 2), run([70, 60, 50, 45], 3, null), run([80, 75, 70, 65], 3, null)], times)!;
    expect(b.lowPct).toEqual([60, 40, 20, 20]);
    expect(b.highPct).toEqual([80, 75, 70, 65]);
    expect(b.madeIt).toBe(2);
    expect(b.total).toBe(3);
    expect(b.worst).toBe('2019');
    expect(b.sentence).toBe("In 2 of the last 3 years' weather the bank stays above its floor; in the worst (2019) it reaches the floor on night 1 at 00:00.");
  });

  it('with no cutoff names the lowest run and its lowest hour', () => {
    const b = buildBand('years', labels, [run([70, 60, 50, 45], 3, null), run([60, 50, 35, 38], 2, null), run([80, 75, 70, 65], 3, null)], times)!;
    expect(b.sentence).toBe("In all 3 of the last 3 years' weather the bank stays above its floor; in the worst (2020) it gets down to 35 % on night 1 at 00:00.");
  });

  it('leaves out runs the engine refused, and gives no band from fewer than two', () => {
    const bad: RunOutcome = { socEndPct: [], minSocPct: NaN, minSocRow: 0, firstCutoffRow: null, error: 'refused' };
    expect(buildBand('years', labels, [bad, bad, run([70, 60, 50, 45], 3, null)], times)).toBeNull();
    expect(buildBand('years', labels, [bad, run([70, 60, 50, 45], 3, null), run([60, 50, 35, 38], 2, null)], times)!.total).toBe(2);
  });
});

describe('the verdict with weather sources and a band', () => {
  /** 100 Ah LiFePO4, full, a 10 W load for one night at 30 °C: the bank makes it easily. */
  function easyPlan(): ResolvedPlan {
    const plan: Plan = {
      bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 100, initialSocPct: 100 },
      loads: [{ name: 'Light', watts: 10 }],
      stops: [{ name: 'Test camp', lat: 35, lon: -106, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 1, weather: [{ date: '2027-10-21', cloudOktas: 0, highC: 30, lowC: 30 }] }],
    };
    const v = validatePlan(plan);
    if (!v.ok) throw new Error(JSON.stringify(v.envelope));
    return v.plan;
  }
  const sources = (s: 'typed' | 'assumed') => ({ kind: 'far' as const, status: 'ok' as const, message: null, medianYear: null, stops: [{ name: 'Test camp', days: [{ date: '2027-10-21', source: 'typed' as const }, { date: '2027-10-22', source: s }] }] });

  it('is never a plain "Makes it" when a day is assumed, and says how to fix it', () => {
    const plan = easyPlan();
    const f: ForecastWithWeather = forecast(plan);
    expect(verdict(f, plan).status).toBe('makes-it');
    expect(verdict({ ...f, weatherSources: sources('typed') } as ForecastWithWeather, plan).status).toBe('makes-it');
    const v = verdict({ ...f, weatherSources: sources('assumed') } as ForecastWithWeather, plan);
    expect(v.status).toBe('weather-assumed');
    expect(v.headline).toMatch(/^Not sure yet — 1 day has no real weather, makes it — lowest/);
    expect(v.detail).toContain('"Fill from the forecast" / "Use past years"');
  });

  it('counts the years of the band', () => {
    const plan = easyPlan();
    const f = forecast(plan);
    const band = (madeIt: number): Band => ({ kind: 'years', runs: [], lowPct: [], highPct: [], madeIt, total: 10, worst: '2019', sentence: 'The sentence.' });
    expect(verdict({ ...f, band: band(10) } as ForecastWithWeather, plan).headline).toMatch(/^Makes it in 10 of the last 10 years' weather — lowest/);
    const some = verdict({ ...f, band: band(8) } as ForecastWithWeather, plan);
    expect(some.status).toBe('some-years-short');
    expect(some.headline).toMatch(/^Makes it in 8 of the last 10 years' weather only — lowest/);
    expect(some.detail.startsWith('The sentence.')).toBe(true);
  });
});
