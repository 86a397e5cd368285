// The preview's columnar answer written straight from the simulation (toColumnsJson) is the very
// text JSON.stringify makes of the columnar form (src/lib/forecast-columns.ts) of the contract's
// forecast: same keys, same order, same rounding, byte for byte.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { demoPlan, prepareTrip, simulatePrepared, toColumnsJson, toForecast, type Plan } from '../../../src/engine/index';
import { roundedJson } from '../../../src/engine/columns-json';
import { toColumns } from '../../../src/lib/forecast-columns';
import { benchPlan } from '../../../scripts/bench-plan';
import { resolved } from '../../reference/plan-helpers';

function both(plan: Plan): { direct: string; viaRows: string } {
  const prepared = prepareTrip(resolved(plan));
  const sim = simulatePrepared(prepared);
  return { direct: new TextDecoder().decode(toColumnsJson(prepared, sim)), viaRows: JSON.stringify(toColumns(toForecast(prepared, sim))) };
}

/** The demo trip in other weather and with another bank: cold nights (negative °C), lockouts, cutoffs. */
function varied(c: {
  chemistry: 'lifepo4' | 'agm' | 'flooded' | 'gel';
  initial: number;
  capacityAh: number;
  highC: number;
  spread: number;
  oktas: number;
  location: 'cabin' | 'outside';
}): Plan {
  const p = demoPlan();
  return {
    ...p,
    bank: { chemistry: c.chemistry, capacityAh: c.capacityAh, initialSocPct: c.initial, location: c.location },
    stops: p.stops.map((s) => ({
      ...s,
      weather: (s.weather ?? []).map((w, k) => ({ ...w, highC: c.highC - k, lowC: c.highC - k - c.spread, cloudOktas: (c.oktas + k) % 9 })),
    })),
  };
}

describe('toColumnsJson', () => {
  it('writes the same text as JSON.stringify(toColumns(toForecast(…))) for the demo and a 30-day, 40-load trip', () => {
    for (const plan of [demoPlan(), benchPlan(30), benchPlan(3)]) {
      const { direct, viaRows } = both(plan);
      expect(direct).toBe(viaRows);
    }
  });

  it('writes the same text for any bank and weather, frost and cutoffs included', () => {
    const arb = fc.record({
      chemistry: fc.constantFrom('lifepo4' as const, 'agm' as const, 'flooded' as const, 'gel' as const),
      initial: fc.integer({ min: 0, max: 100 }),
      capacityAh: fc.integer({ min: 20, max: 600 }),
      highC: fc.integer({ min: -25, max: 45 }),
      spread: fc.integer({ min: 0, max: 25 }),
      oktas: fc.integer({ min: 0, max: 8 }),
      location: fc.constantFrom('cabin' as const, 'outside' as const),
    });
    fc.assert(
      fc.property(arb, (c) => {
        const { direct, viaRows } = both(varied(c));
        expect(direct).toBe(viaRows);
      }),
      { numRuns: 40 },
    );
  }, 60_000);

  it('rounds like the contract (0.1 and 0.01) and writes the number as JSON.stringify does, for any double', () => {
    const r0 = (x: number) => (Number.isFinite(x) ? Math.round(x) + 0 : 0);
    const r1 = (x: number) => (Number.isFinite(x) ? Math.round(x * 10) / 10 + 0 : 0);
    const r2 = (x: number) => (Number.isFinite(x) ? Math.round(x * 100) / 100 + 0 : 0);
    const values = fc.oneof(
      fc.double({ noNaN: false }),
      fc.double({ min: -1e6, max: 1e6 }),
      fc.integer({ min: -100_000, max: 100_000 }).map((n) => n / 1000),
      fc.constantFrom(0, -0, 0.05, -0.05, 0.005, -0.005, 1.25, -1.25, 12.345, 99.95, 1e15, -1e15, 1e20, 1e300, Infinity, -Infinity, NaN),
    );
    fc.assert(
      fc.property(values, (x) => {
        expect(roundedJson(x, 0)).toBe(JSON.stringify(r0(x)));
        expect(roundedJson(x, 1)).toBe(JSON.stringify(r1(x)));
        expect(roundedJson(x, 2)).toBe(JSON.stringify(r2(x)));
      }),
      { numRuns: 5000 },
    );
  });
});
