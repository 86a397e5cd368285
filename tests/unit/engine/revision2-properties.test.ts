// fast-check properties of engine revision 2 (issue 13): charge is conserved through any temperature
// path, a warmer battery never forecasts less usable charge, adding a load never raises the minimum SOC.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { prepareTrip, simulatePrepared, validatePlan, type Plan, type SimResult } from '../../../src/engine/index';

const ARRIVE = '2027-03-10';
const dates = ['2027-03-10', '2027-03-11', '2027-03-12'];

function simulate(plan: Plan): SimResult {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return simulatePrepared(prepareTrip(v.plan));
}

function weather(temps: readonly (readonly [number, number])[], oktas = 4) {
  return temps.map(([lowC, highC], i) => ({ date: dates[i]!, cloudOktas: oktas, lowC, highC }));
}

function stop(temps: readonly (readonly [number, number])[], over: Record<string, unknown> = {}): Plan['stops'][number] {
  return { name: 'Camp', lat: 44, lon: -110, timeZone: 'America/Denver', arrive: ARRIVE, nights: 2, arriveHour: 12, weather: weather(temps), ...over };
}

/** A day's [low, high] in a range. */
const dayTemps = (min: number, max: number) =>
  fc.tuple(fc.integer({ min, max }), fc.integer({ min: 0, max: 15 })).map(([low, range]) => [low, Math.min(max, low + range)] as const);
const pathArb = (min: number, max: number) => fc.tuple(dayTemps(min, max), dayTemps(min, max), dayTemps(min, max));

describe('charge is conserved through any temperature path (Peukert 1, η 100 %)', () => {
  it('the SOC path does not depend on the temperatures, and start + Ah stored − Ah drawn = end', () => {
    // Above the lockout (LiFePO4 with self-heating, or lead-acid whose cold acceptance stays above the
    // charger's amps) and away from the floor, temperature may move usable charge but never charge itself.
    const caseArb = fc.oneof(
      fc.record({
        chemistry: fc.constant('lifepo4' as const),
        temps: fc.tuple(pathArb(-30, 40), pathArb(-30, 40)),
        // Stranded at −30 °C: 100·(1 − 0.56) = 44 Ah; 8 W for 47 h is ≤ 29 Ah, so Q stays ≥ 51 Ah.
        initial: fc.integer({ min: 80, max: 90 }),
        loadW: fc.integer({ min: 0, max: 8 }),
        amps: fc.integer({ min: 1, max: 10 }),
        hours: fc.integer({ min: 1, max: 3 }),
      }),
      fc.record({
        chemistry: fc.constant('agm' as const),
        // f(−20 °C) = 0.46 → acceptance ≥ 20 A × 0.46 = 9.2 A > 3 A; stranded ≤ 54 Ah < the 63 Ah left at worst.
        temps: fc.tuple(pathArb(-20, 40), pathArb(-20, 40)),
        initial: fc.integer({ min: 70, max: 70 }),
        loadW: fc.integer({ min: 0, max: 2 }),
        amps: fc.integer({ min: 1, max: 3 }),
        hours: fc.integer({ min: 1, max: 3 }),
      }),
    );
    fc.assert(
      fc.property(caseArb, (c) => {
        const plan = (temps: readonly (readonly [number, number])[]): Plan => ({
          bank: { chemistry: c.chemistry, capacityAh: 100, initialSocPct: c.initial, floorSocPct: 0, peukertExponent: 1, chargeEfficiencyPct: 100, internalResistanceMilliohm: 0, selfHeating: true },
          chargers: [{ kind: 'alternator', amps: c.amps }],
          loads: [{ name: 'Steady', watts: c.loadW }],
          stops: [stop(temps)],
          drives: [{ date: '2027-03-11', startHour: 9, hours: c.hours }],
        });
        const a = simulate(plan(c.temps[0]));
        const b = simulate(plan(c.temps[1]));
        let stored = 0;
        let drawn = 0;
        for (let r = 0; r < a.n; r++) {
          expect(Math.abs(a.socEndPct[r]! - b.socEndPct[r]!)).toBeLessThan(1e-9);
          stored += a.ahIn[r]!;
          drawn += a.ahOutRaw[r]!;
        }
        // Stored X Ah (what the alternator left after the loads) and drew Y Ah: the end is start + X − Y.
        expect(a.socEndPct[a.n - 1]! - c.initial).toBeCloseTo(stored - drawn, 9);
        expect(a.summary.firstCutoffRow).toBeNull();
      }),
      { numRuns: 60 },
    );
  }, 60_000);

  it('X Ah stored at any cold temperature is exactly X Ah of usable charge once warm (first model: X/f)', () => {
    // AGM 100 Ah from 50 %, no loads: an alternator (a current source) stores amps × hours × η on a day
    // at −20…0 °C (cold acceptance 20 A × f ≥ 9.2 A > 9 A, below the 80 % knee). On the 25 °C days (f = 1,
    // τ = 0) usable = SOC = 50 + amps·hours·0.92.
    fc.assert(
      fc.property(dayTemps(-20, 0), fc.integer({ min: 1, max: 9 }), fc.integer({ min: 1, max: 3 }), (cold, amps, hours) => {
        const s = simulate({
          bank: { chemistry: 'agm', capacityAh: 100, initialSocPct: 50, thermalHours: 0 },
          chargers: [{ kind: 'alternator', amps }],
          stops: [stop([cold, [25, 25], [25, 25]] as const)],
          drives: [{ date: '2027-03-10', startHour: 13, hours }],
        });
        const last = s.n - 1;
        expect(s.socEndPct[last]).toBeCloseTo(50 + amps * hours * 0.92, 9);
        expect(s.usablePct[last]).toBeCloseTo(50 + amps * hours * 0.92, 9);
      }),
      { numRuns: 40 },
    );
  }, 60_000);
});

describe('a warmer battery never forecasts less usable charge', () => {
  it('same plan, battery temperatures raised by Δ ≥ 0: usable charge is no lower before the cold forecast\'s first cutoff, and the warm one cuts off no earlier', () => {
    // Only the battery's temperature differs: loads without temperature response, current-source chargers, no panels.
    const caseArb = fc.record({
      chemistry: fc.constantFrom('lifepo4' as const, 'agm' as const, 'flooded' as const, 'gel' as const),
      capacityAh: fc.integer({ min: 50, max: 400 }),
      initial: fc.integer({ min: 10, max: 100 }),
      selfHeating: fc.boolean(),
      thermalHours: fc.integer({ min: 0, max: 12 }),
      loads: fc.array(fc.record({ watts: fc.integer({ min: 0, max: 400 }), supply: fc.constantFrom('dc' as const, 'ac' as const), from: fc.integer({ min: 0, max: 23 }), to: fc.integer({ min: 0, max: 24 }) }), { maxLength: 4 }),
      shoreAmps: fc.option(fc.integer({ min: 1, max: 60 }), { nil: null }),
      altAmps: fc.integer({ min: 1, max: 60 }),
      temps: pathArb(-30, 30),
      delta: fc.tuple(fc.integer({ min: 0, max: 30 }), fc.integer({ min: 0, max: 30 }), fc.integer({ min: 0, max: 30 })),
    });
    fc.assert(
      fc.property(caseArb, (c) => {
        const plan = (temps: readonly (readonly [number, number])[]): Plan => ({
          bank: { chemistry: c.chemistry, capacityAh: c.capacityAh, initialSocPct: c.initial, selfHeating: c.selfHeating, thermalHours: c.thermalHours },
          chargers: [{ kind: 'alternator', amps: c.altAmps }, ...(c.shoreAmps ? [{ kind: 'shore' as const, amps: c.shoreAmps }] : [])],
          loads: c.loads.map((l, i) => ({ name: `L${i}`, watts: l.watts, supply: l.supply, windows: [[l.from, l.to] as [number, number]] })),
          stops: [stop(temps, { hookup: c.shoreAmps ? 'shore' : 'none' })],
          drives: [{ date: '2027-03-11', startHour: 8, hours: 2 }],
        });
        const warmTemps = c.temps.map(([lo, hi], i) => [lo + c.delta[i]!, hi + c.delta[i]!] as const);
        const cold = simulate(plan(c.temps));
        const warm = simulate(plan(warmTemps));
        // Up to the end of the row before the cold forecast's first cutoff (in the cutoff row itself the
        // disconnected cold bank stops serving loads and may end the hour higher).
        const coldCut = cold.summary.firstCutoffRow ?? cold.n;
        for (let r = 0; r < coldCut; r++) {
          expect(warm.batteryC[r]! >= cold.batteryC[r]! - 1e-9).toBe(true);
          expect(warm.usablePct[r]! >= cold.usablePct[r]! - 1e-7).toBe(true);
        }
        if (warm.summary.firstCutoffRow !== null) expect(warm.summary.firstCutoffRow).toBeGreaterThanOrEqual(cold.summary.firstCutoffRow ?? Infinity);
      }),
      { numRuns: 80 },
    );
  }, 60_000);
});

describe('adding a load never raises the minimum SOC', () => {
  it('any plan (panels, chargers, loads) with one more load: minSocPct is no higher', () => {
    // At or above 25 °C (no cold stranding, no lockout), no voltage cutoff and no generator: the extra
    // load can only take charge away, hour by hour, and only brings a floor cutoff earlier.
    const loadArb = fc.record({
      watts: fc.integer({ min: 0, max: 600 }),
      quantity: fc.integer({ min: 0, max: 3 }),
      supply: fc.constantFrom('dc' as const, 'ac' as const),
      from: fc.integer({ min: 0, max: 23 }),
      to: fc.integer({ min: 0, max: 24 }),
      dutyPct: fc.integer({ min: 0, max: 100 }),
      response: fc.constantFrom('none' as const, 'cooling' as const, 'heating' as const),
      location: fc.constantFrom('cabin' as const, 'outside' as const),
      surgeWatts: fc.option(fc.integer({ min: 0, max: 2000 }), { nil: null }),
    });
    const caseArb = fc.record({
      chemistry: fc.constantFrom('lifepo4' as const, 'agm' as const, 'flooded' as const, 'gel' as const),
      capacityAh: fc.integer({ min: 20, max: 400 }),
      initial: fc.integer({ min: 0, max: 100 }),
      arrays: fc.array(fc.record({ ratedWatts: fc.integer({ min: 0, max: 800 }), tiltDeg: fc.integer({ min: 0, max: 60 }), controller: fc.constantFrom('mppt' as const, 'pwm' as const), controllerMaxAmps: fc.option(fc.integer({ min: 1, max: 40 }), { nil: null }) }), { maxLength: 2 }),
      shoreAmps: fc.option(fc.integer({ min: 1, max: 40 }), { nil: null }),
      altAmps: fc.integer({ min: 1, max: 40 }),
      loads: fc.array(loadArb, { maxLength: 4 }),
      extra: loadArb,
      temps: pathArb(25, 45),
      oktas: fc.integer({ min: 0, max: 8 }),
    });
    fc.assert(
      fc.property(caseArb, (c) => {
        const toLoad = (l: typeof c.extra, i: number) => ({ name: `L${i}`, watts: l.watts, quantity: l.quantity, supply: l.supply, windows: [[l.from, l.to] as [number, number]], dutyPct: l.dutyPct, response: l.response, location: l.location, surgeWatts: l.surgeWatts });
        const plan = (loads: (typeof c.extra)[]): Plan => ({
          bank: { chemistry: c.chemistry, capacityAh: c.capacityAh, initialSocPct: c.initial },
          arrays: c.arrays.map((a, i) => ({ name: `A${i}`, ...a })),
          chargers: [{ kind: 'alternator', amps: c.altAmps }, ...(c.shoreAmps ? [{ kind: 'shore' as const, amps: c.shoreAmps }] : [])],
          loads: loads.map(toLoad),
          stops: [{ ...stop(c.temps, { hookup: c.shoreAmps ? 'shore' : 'none' }), weather: weather(c.temps, c.oktas) }],
          drives: [{ date: '2027-03-11', startHour: 8, hours: 2 }],
        });
        const without = simulate(plan(c.loads));
        const withExtra = simulate(plan([...c.loads, c.extra]));
        const cutW = withExtra.summary.firstCutoffRow;
        const cutO = without.summary.firstCutoffRow;
        if (cutW === null && cutO === null) {
          expect(withExtra.summary.minSocPct).toBeLessThanOrEqual(without.summary.minSocPct + 1e-9);
        } else {
          // A cutoff: minimums are sampled at hour ends, and a bank cut off mid-hour goes on charging for
          // the rest of that hour, so compare every hour before the extra load's first cutoff, and the cutoffs.
          expect(cutW).not.toBeNull();
          for (let r = 0; r < (cutW ?? 0); r++) expect(withExtra.socEndPct[r]! <= without.socEndPct[r]! + 1e-9).toBe(true);
          if (cutO !== null) expect(cutW!).toBeLessThanOrEqual(cutO);
        }
      }),
      { numRuns: 100 },
    );
  }, 60_000);
});
