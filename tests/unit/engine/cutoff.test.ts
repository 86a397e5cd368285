// Cutoff and reconnect rules (forecast-engine.md, "Chargers and battery" and "Revision 2").
import { describe, expect, it } from 'vitest';
import { ocvVolts } from '../../../src/engine/index';
import { basePlan, constantWeather, run, sim } from '../../reference/plan-helpers';

// A 100 Ah LiFePO4 bank at 30 °C (capacity factor 1, so usable = true SOC), Peukert off, no internal
// resistance, and a steady 128 W load. Revision 2 draws loads as power at the terminal volts, so with
// R = 0 the current is 128 W / OCV(SOC) and the energy between two SOCs is C·∫OCV ds: a hand
// calculation on the common-practice OCV table (LiFePO4: 9 % 12.5, 14 % 12.8, 20 % 13.0, 40 % 13.13,
// 70 % 13.25 V; linear between). Energies (Wh, C = 100 Ah, mean OCV of each straight piece × points):
//   10→14 %: (12.56 + 12.8)/2 × 4 = 50.72      14→15 %: (12.8 + 12.8333)/2 × 1 = 12.817
//   14→20 %: (12.8 + 13.0)/2 × 6 = 77.4        20→40 %: (13.0 + 13.13)/2 × 20 = 261.3
//   40→60 %: (13.13 + 13.21)/2 × 20 = 263.4
// The engine steps 12 sub-steps an hour with the OCV at each sub-step's start, which draws up to
// ~0.2 % fewer Ah per Wh than the exact integral; tolerances below allow for that.
const bank = { chemistry: 'lifepo4' as const, capacityAh: 100, peukertExponent: 1, floorSocPct: 10, internalResistanceMilliohm: 0 };
const load10A = [{ name: '10 A', watts: 128 }];

describe('floor cutoff', () => {
  it('reaching the floor mid-hour serves the fraction of the hour it lasts, then loads go unmet', () => {
    // 15 → 10 %: 50.72 + 12.817 = 63.54 Wh served of the hour's 128 Wh; 128 − 63.54 = 64.46 unmet.
    const s = sim(basePlan({ bank: { ...bank, initialSocPct: 15 }, loads: load10A, tempC: 30 }));
    expect(s.socEndPct[0]).toBeCloseTo(10, 9);
    expect(s.usablePct[0]).toBeCloseTo(10, 9);
    expect(Math.abs(s.loadW[0]! - 63.54)).toBeLessThan(0.3);
    expect(s.unmetW[0]! + s.loadW[0]!).toBeCloseTo(128, 9);
    expect(s.summary.firstCutoffRow).toBe(0);
    for (let r = 1; r < s.n; r++) {
      expect(s.disconnected[r]).toBe(1);
      expect(s.loadW[r]).toBe(0);
      expect(s.unmetW[r]).toBeCloseTo(128, 9);
      expect(s.socEndPct[r]).toBeCloseTo(10, 9);
    }
    expect(s.warnings.filter((w) => w.code === 'floor-cutoff')).toHaveLength(1);
  });

  it('20 % → floor needs 128.12 Wh: the first hour (128 Wh) ends just above it, the next cuts off at once', () => {
    // 20 → 10 %: 77.4 + 50.72 = 128.12 Wh, 0.12 Wh more than the first hour's 128 Wh.
    const s = sim(basePlan({ bank: { ...bank, initialSocPct: 20 }, loads: load10A, tempC: 30 }));
    expect(s.socEndPct[0]).toBeGreaterThan(10);
    expect(s.socEndPct[0]).toBeLessThan(10.05);
    expect(s.unmetW[0]).toBeCloseTo(0, 9);
    expect(s.summary.firstCutoffRow).toBe(1);
    expect(s.loadW[1]).toBeGreaterThan(0);
    expect(s.loadW[1]).toBeLessThan(1);
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
    while (r < s.n && s.socStartPct[r]! < 15 - 1e-9) {
      expect(s.disconnected[r]).toBe(1);
      expect(s.loadW[r]).toBe(0);
      // Every watt of solar the bank accepts is charge at the terminal volts (= OCV with R = 0); nothing serves the loads.
      const vLo = ocvVolts('lifepo4', s.socStartPct[r]! / 100, 12.8);
      const vHi = ocvVolts('lifepo4', s.socEndPct[r]! / 100, 12.8);
      expect(s.solarW[r]).toBeGreaterThanOrEqual(s.ahIn[r]! * vLo - 1e-9);
      expect(s.solarW[r]).toBeLessThanOrEqual(s.ahIn[r]! * vHi + 1e-9);
      r++;
    }
    expect(r).toBeLessThan(s.n);
    expect(s.disconnected[r]).toBe(0);
    expect(s.loadW[r]).toBeCloseTo(128, 9);
  });

  it('a bank that starts at or below its floor starts disconnected and firstCutoffAt is the first row', () => {
    const f = run(basePlan({ bank: { ...bank, initialSocPct: 10 }, loads: load10A, tempC: 30 }));
    expect(f.summary.firstCutoffAt).toBe(f.hourly[0]!.time);
    expect(f.hourly[0]!.disconnected).toBe(true);
    expect(f.hourly[0]!.loadWatts).toBe(0);
    expect(f.hourly[0]!.unmetWatts).toBe(128);
    expect(f.warnings[0]!.code).toBe('floor-cutoff');
    // One warning for it, not a second one from the first row's own check.
    expect(f.warnings.filter((w) => w.code === 'floor-cutoff' && w.at === f.hourly[0]!.time)).toHaveLength(1);
  });
});

describe('voltage cutoff', () => {
  // Cutoff 13.0 V = the OCV at 20 % (R = 0, so the hour's minVolts is the OCV at its lower SOC).
  // From 60 %: 60→20 % is 263.4 + 261.3 = 524.7 Wh. After 4 h (512 Wh) 12.7 Wh remain above 20 %:
  // ≈ 12.7/13.0 = 0.98 points → 20.98 %, OCV 13.0 + 0.65·0.0098 = 13.006 V > 13.0: no cutoff in row 3.
  // After 5 h (640 Wh): 640 − 524.7 − 77.4 = 37.9 Wh below 14 %, x·(12.8 − 0.03x) = 37.9 → x = 2.98 →
  // 11.02 % (above the 10 % floor), OCV 12.5 + 6·0.0202 = 12.62 V ≤ 13.0: the cutoff is in row 4.
  const plan = (altAmps: number) =>
    basePlan({
      bank: { ...bank, initialSocPct: 60, cutoffVolts: 13.0 },
      loads: load10A,
      chargers: altAmps > 0 ? [{ kind: 'alternator' as const, amps: altAmps }] : [],
      drives: altAmps > 0 ? [{ date: '2027-06-10', startHour: 20, hours: 3 }] : [],
      tempC: 30,
    });

  it('is checked for the hour and disconnects from the next hour', () => {
    const s = sim(plan(0));
    expect(s.socEndPct[3]).toBeCloseTo(20.98, 1);
    expect(s.disconnected[3]).toBe(0);
    expect(s.socEndPct[4]).toBeCloseTo(11.02, 1);
    expect(s.minVolts[4]).toBeCloseTo(12.62, 2);
    expect(s.summary.firstCutoffRow).toBe(4);
    expect(s.disconnected[4]).toBe(0);
    expect(s.loadW[4]).toBeCloseTo(128, 9);
    expect(s.disconnected[5]).toBe(1);
    expect(s.unmetW[5]).toBeCloseTo(128, 9);
    expect(s.warnings.find((w) => w.code === 'voltage-cutoff')?.row).toBe(4);
  });

  it('stays off at least the next hour, then needs usable ≥ max(floor, usable at cutoff) + 5', () => {
    // Usable at the cutoff 11.02 % → back on at ≥ 16.02 %. A 20 A alternator (a current source at its
    // rated amps, Revision 2) adds 20 × 0.99 = 19.8 points in the forced-off hour: 30.82 %, on at row 6.
    const big = sim(plan(20));
    expect(big.disconnected[5]).toBe(1);
    expect(big.socEndPct[5]).toBeCloseTo(11.02 + 19.8, 1);
    expect(big.disconnected[6]).toBe(0);
    // 4 A: 11.02 + 3.96 = 14.98 % after row 5 (< 16.02), 18.94 % after row 6 → back on at row 7.
    const small = sim(plan(4));
    expect(small.socEndPct[5]).toBeCloseTo(14.98, 1);
    expect(small.disconnected[6]).toBe(1);
    expect(small.socEndPct[6]).toBeCloseTo(18.94, 1);
    expect(small.disconnected[7]).toBe(0);
  });
});
