// The sun prepared once for many weathers (the "how sure is this?" band): a prepared sun made
// from one plan serves another plan with other weather, shade and loads exactly as that plan's
// own sun would, and refuses a plan with other places, dates or panels.
import { describe, expect, it } from 'vitest';
import {
  demoPlan,
  forecast,
  prepareSun,
  prepareTrip,
  prepareWithSun,
  simulatePrepared,
  sunKey,
  toForecast,
  type Plan,
} from '../../../src/engine/index';
import { runBandPlans } from '../../../src/domain/weather/band-run';
import { resolved } from '../../reference/plan-helpers';

/** The demo trip under other skies: every day cloudier, hot, with hourly irradiance from a "source" on some days. */
function otherWeather(p: Plan, seed: number): Plan {
  return {
    ...p,
    stops: p.stops.map((s, i) => ({
      ...s,
      shadePct: (seed * 7 + i * 11) % 40,
      weather: (s.weather ?? []).map((w, k) => ({
        ...w,
        cloudOktas: (k + seed) % 9,
        highC: 30 - k,
        lowC: 12 - k,
        source: 'past-year' as const,
        // A day with hours from a source: a sine-shaped day of irradiance with its own peak.
        hourly:
          k % 2 === 0
            ? Array.from({ length: 24 }, (_, h) => ({
                hour: h,
                ghiWm2: h >= 7 && h <= 17 ? Math.round((300 + seed * 40) * Math.sin(((h - 6) / 12) * Math.PI)) : 0,
                tempC: 10 + h / 3,
                cloudPct: 50,
              }))
            : [],
      })),
    })),
    loads: (p.loads ?? []).slice(1),
  };
}

const json = (x: unknown) => JSON.stringify(x);

describe('prepared sun', () => {
  it('a sun prepared from one plan gives another plan with other weather, shade and loads the same forecast as its own', () => {
    const a = resolved(demoPlan());
    const sunA = prepareSun(a);
    for (const seed of [1, 2, 3]) {
      const b = resolved(otherWeather(demoPlan(), seed));
      const viaA = prepareWithSun(sunA, b);
      const own = prepareTrip(b);
      expect(json(toForecast(viaA, simulatePrepared(viaA)))).toBe(json(forecast(b)));
      expect(Array.from(viaA.arrays[0]!.perWattSub)).toEqual(Array.from(own.arrays[0]!.perWattSub));
      expect(Array.from(viaA.ambientC)).toEqual(Array.from(own.ambientC));
      // And the weather really differs from the first plan's: the check is not vacuous.
      expect(json(forecast(b).summary)).not.toBe(json(forecast(a).summary));
    }
  });

  it('the key follows places, dates, drives and panel aim, not weather, shade, loads or bank', () => {
    const base = demoPlan();
    const k = sunKey(resolved(base));
    expect(sunKey(resolved(otherWeather(base, 4)))).toBe(k);
    expect(sunKey(resolved({ ...base, bank: { ...base.bank, capacityAh: 600 } }))).toBe(k);
    const moved = { ...base, stops: base.stops.map((s, i) => (i === 0 ? { ...s, lat: s.lat + 0.5 } : s)) };
    expect(sunKey(resolved(moved))).not.toBe(k);
    const later = { ...base, stops: base.stops.map((s, i) => (i === 0 ? { ...s, arriveHour: 12 } : s)) };
    expect(sunKey(resolved(later))).not.toBe(k);
    const tilted = { ...base, arrays: (base.arrays ?? []).map((a) => ({ ...a, tiltDeg: 30 })) };
    expect(sunKey(resolved(tilted))).not.toBe(k);
  });

  it('refuses a plan whose places, dates or panels differ from the prepared sun', () => {
    const base = demoPlan();
    const sun = prepareSun(resolved(base));
    const tilted = resolved({ ...base, arrays: (base.arrays ?? []).map((a) => ({ ...a, tiltDeg: 30 })) });
    expect(() => prepareWithSun(sun, tilted)).toThrow(/array geometry/);
  });

  it("the band's runs equal a full forecast of each year's plan", () => {
    const plans = [1, 2, 3, 4].map((seed) => resolved(otherWeather(demoPlan(), seed)));
    const outcomes = runBandPlans(plans);
    outcomes.forEach((o, i) => {
      const f = forecast(plans[i]!);
      expect(o.error).toBeUndefined();
      expect(o.socEndPct).toHaveLength(f.hourly.length);
      expect(o.firstCutoffRow === null).toBe(f.summary.firstCutoffAt === null);
      // The band keeps usable charge to 0.1 %, as the forecast's summary reports it.
      expect(o.minSocPct).toBeCloseTo(f.summary.minUsablePct, 1);
    });
  });
});
