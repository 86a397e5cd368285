import { describe, expect, it } from 'vitest';
import { benchPlan } from '../../scripts/bench-plan';
import { forecast, validatePlan, type Plan, type ResolvedPlan } from '../../src/engine';
import { cachedForecast, sizeOfSun, skyOf, sunCacheStats, sunOf } from '../../src/server/sun-cache';

function resolved(plan: Plan): ResolvedPlan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

describe('the sun cache', () => {
  it('gives the engine’s own forecast, and a second trip with other loads reuses the sun', () => {
    const base = benchPlan(14);
    const a = resolved(base);
    const before = sunCacheStats();
    expect(cachedForecast(a)).toEqual(forecast(a));
    const heavier = resolved({ ...base, loads: base.loads!.map((l) => ({ ...l, watts: (l.watts ?? 0) * 2 })) });
    const b = cachedForecast(heavier);
    expect(b).toEqual(forecast(heavier));
    expect(b.summary).not.toEqual(forecast(a).summary);
    const after = sunCacheStats();
    expect(after.misses - before.misses).toBe(1);
    expect(after.hits - before.hits).toBe(1);
    expect(sunOf(heavier)).toBe(sunOf(a));
  });

  it('a trip at another place or with other panel tilt gets its own sun', () => {
    const base = benchPlan(7);
    const a = resolved(base);
    const moved = resolved({ ...base, stops: base.stops.map((s, i) => (i === 0 ? { ...s, lat: s.lat + 2 } : s)) });
    const tilted = resolved({ ...base, arrays: base.arrays!.map((x, i) => (i === 0 ? { ...x, tiltDeg: 30 } : x)) });
    expect(sunOf(moved)).not.toBe(sunOf(a));
    expect(sunOf(tilted)).not.toBe(sunOf(a));
    expect(cachedForecast(moved)).toEqual(forecast(moved));
    expect(cachedForecast(tilted)).toEqual(forecast(tilted));
  });

  it('counts a prepared sun by its arrays: a 30-day trip with 3 arrays weighs more than a 7-day one', () => {
    const small = sizeOfSun(sunOf(resolved(benchPlan(7))));
    const large = sizeOfSun(sunOf(resolved(benchPlan(30))));
    // 30 days × 24 h × 6 sub-steps × 3 arrays of Float64 angles alone are over 100 KB.
    expect(large).toBeGreaterThan(30 * 24 * 6 * 3 * 8);
    expect(large).toBeGreaterThan(small * 3);
    expect(sunCacheStats().bytes).toBeLessThanOrEqual(sunCacheStats().maxBytes);
  });

  it('a second run of the same trip and weather with other loads and another bank reuses the sky, and gives the engine’s own forecast', () => {
    const base = benchPlan(9);
    const a = resolved(base);
    const other = resolved({ ...base, bank: { ...base.bank, capacityAh: 180 }, loads: base.loads!.slice(3) });
    const before = sunCacheStats().sky;
    expect(cachedForecast(a)).toEqual(forecast(a));
    expect(cachedForecast(other)).toEqual(forecast(other));
    const after = sunCacheStats().sky;
    expect(after.misses - before.misses).toBe(1);
    expect(after.hits - before.hits).toBe(1);
    expect(skyOf(sunOf(other), other)).toBe(skyOf(sunOf(a), a));
  });

  it('other weather, shade, panel losses or a renamed stop get their own sky (names enter the weather warnings)', () => {
    const base = benchPlan(5);
    const a = resolved(base);
    const variants = [
      {
        ...base,
        stops: base.stops.map((s) => ({ ...s, weather: (s.weather ?? []).map((w) => ({ ...w, cloudOktas: (w.cloudOktas + 3) % 9 })) })),
      },
      { ...base, stops: base.stops.map((s) => ({ ...s, shadePct: 40 })) },
      { ...base, arrays: base.arrays!.map((x) => ({ ...x, lossesPct: 30 })) },
      { ...base, stops: base.stops.map((s, i) => ({ ...s, name: `Renamed ${i}`, weather: [] })) },
    ].map(resolved);
    const skyA = skyOf(sunOf(a), a);
    for (const v of variants) {
      expect(skyOf(sunOf(v), v)).not.toBe(skyA);
      expect(cachedForecast(v)).toEqual(forecast(v));
    }
  });
});
