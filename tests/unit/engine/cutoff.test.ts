// Cutoff and reconnect rules (forecast-engine.md, "Chargers and battery").
import { describe, expect, it } from 'vitest';
import { basePlan, constantWeather, run, sim } from '../../reference/plan-helpers';

// A 100 Ah LiFePO4 bank at 30 °C (capacity factor 1), Peukert off, a steady 10 A load.
const bank = { chemistry: 'lifepo4' as const, capacityAh: 100, peukertExponent: 1, floorSocPct: 10 };
const load10A = [{ name: '10 A', watts: 128 }];

describe('floor cutoff', () => {
  it('reaching the floor mid-hour serves the fraction of the hour it lasts, then loads go unmet', () => {
    const s = sim(basePlan({ bank: { ...bank, initialSocPct: 15 }, loads: load10A, tempC: 30 }));
    expect(s.socEndPct[0]).toBeCloseTo(10, 9);
    expect(s.loadW[0]).toBeCloseTo(64, 9);
    expect(s.unmetW[0]).toBeCloseTo(64, 9);
    expect(s.summary.firstCutoffRow).toBe(0);
    for (let r = 1; r < s.n; r++) {
      expect(s.disconnected[r]).toBe(1);
      expect(s.loadW[r]).toBe(0);
      expect(s.unmetW[r]).toBeCloseTo(128, 9);
      expect(s.socEndPct[r]).toBeCloseTo(10, 9);
    }
    expect(s.warnings.filter((w) => w.code === 'floor-cutoff')).toHaveLength(1);
  });

  it('reaching the floor exactly at an hour end disconnects in that row', () => {
    const s = sim(basePlan({ bank: { ...bank, initialSocPct: 20 }, loads: load10A, tempC: 30 }));
    expect(s.socEndPct[0]).toBeCloseTo(10, 9);
    expect(s.unmetW[0]).toBeCloseTo(0, 9);
    expect(s.summary.firstCutoffRow).toBe(0);
    expect(s.disconnected[1]).toBe(1);
  });

  it('while disconnected all charging goes to the bank; it reconnects at the first hour starting at floor + 5', () => {
    const s = sim(
      basePlan({
        bank: { ...bank, initialSocPct: 12 },
        loads: load10A,
        arrays: [{ name: 'Roof', ratedWatts: 400 }],
        stop: { nights: 3, weather: constantWeather('2027-06-10', 3, 30, 0) },
      }),
    );
    const cut = s.summary.firstCutoffRow ?? -1;
    expect(cut).toBeGreaterThanOrEqual(0);
    let r = cut + 1;
    while (r < s.n && s.socStartPct[r] < 15 - 1e-9) {
      expect(s.disconnected[r]).toBe(1);
      expect(s.loadW[r]).toBe(0);
      // Every watt of solar the bank accepts is charge; nothing serves the loads.
      expect(s.solarW[r]).toBeCloseTo(s.ahIn[r] * 12.8, 9);
      r++;
    }
    expect(r).toBeLessThan(s.n);
    expect(s.disconnected[r]).toBe(0);
    expect(s.loadW[r]).toBeCloseTo(128, 9);
  });

  it('a bank that starts at or below its floor starts disconnected and firstCutoffAt is the first row', () => {
    const f = run(basePlan({ bank: { ...bank, initialSocPct: 10 }, loads: load10A, tempC: 30 }));
    expect(f.summary.firstCutoffAt).toBe(f.hourly[0].time);
    expect(f.hourly[0].disconnected).toBe(true);
    expect(f.hourly[0].loadWatts).toBe(0);
    expect(f.hourly[0].unmetWatts).toBe(128);
    expect(f.warnings[0].code).toBe('floor-cutoff');
  });
});

describe('voltage cutoff', () => {
  // OCV at 30 % is 13.065 V; 10 A × 8 mΩ drops 0.08 V → 12.985 V ≤ 13.0 V at the end of row 2.
  const plan = (genAmps: number) =>
    basePlan({
      bank: { ...bank, initialSocPct: 60, cutoffVolts: 13.0 },
      loads: load10A,
      chargers: genAmps > 0 ? [{ kind: 'generator' as const, amps: genAmps, startSocPct: 40, stopSocPct: 80 }] : [],
      stop: { generatorHours: [8, 20] },
      tempC: 30,
    });

  it('is checked at the hour end and disconnects from the next hour', () => {
    const s = sim(plan(0));
    expect(s.socEndPct[2]).toBeCloseTo(30, 9);
    expect(s.volts[2]).toBeCloseTo(12.985, 9);
    expect(s.summary.firstCutoffRow).toBe(2);
    expect(s.disconnected[2]).toBe(0);
    expect(s.loadW[2]).toBeCloseTo(128, 9);
    expect(s.disconnected[3]).toBe(1);
    expect(s.unmetW[3]).toBeCloseTo(128, 9);
    expect(s.warnings.find((w) => w.code === 'voltage-cutoff')?.row).toBe(2);
  });

  it('stays off at least the next hour, then needs SOC ≥ max(floor, SOC at cutoff) + 5', () => {
    // 20 A generator from 18:00: 30 → 49.8 % in the forced-off hour, reconnects at 19:00.
    const big = sim(plan(20));
    expect(big.generatorOn[3]).toBe(1);
    expect(big.disconnected[3]).toBe(1);
    expect(big.socEndPct[3]).toBeCloseTo(49.8, 9);
    expect(big.disconnected[4]).toBe(0);
    // 4 A generator: 33.96 % after row 3 (< 35), 37.92 % after row 4 → back on at row 5.
    const small = sim(plan(4));
    expect(small.socEndPct[3]).toBeCloseTo(33.96, 9);
    expect(small.disconnected[4]).toBe(1);
    expect(small.disconnected[5]).toBe(0);
  });
});
