// The verdict sentence, checked on small plans whose answers follow from the engine's documented
// rules (forecast-engine.md): coulomb counting at the nominal voltage, Peukert exponent 1 (no
// rate effect), no cold-capacity loss at or above 25 °C, the floor served for the fraction of the
// hour it lasts, reconnection only 5 points above the floor. No sun: no arrays at all.
// Revision 2: loads are power at the terminal volts, so the charge they take follows the LiFePO4
// open-circuit table (Wh per 100 Ah from full: to 99 % 13.5, to 90 % 134.0, to 70 % 399.8).
import { describe, expect, it } from 'vitest';
import { forecast, validatePlan, type Plan, type ResolvedPlan } from '../../src/engine';
import { verdict } from '../../src/domain/forecasts/verdict';

/** 100 Ah LiFePO4 at 12.8 V, full at 15:00 on Thu 21 Oct 2027, one DC load, 30 °C day and night, no panels. */
function noSunPlan(loadWatts: number, opts: { floorSocPct?: number; nights?: number; timeZone?: string; lat?: number; lon?: number } = {}): ResolvedPlan {
  const plan: Plan = {
    bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 100, initialSocPct: 100, floorSocPct: opts.floorSocPct ?? 15, peukertExponent: 1 },
    loads: [{ name: 'Test load', watts: loadWatts }],
    stops: [
      {
        name: 'Test camp',
        lat: opts.lat ?? 35,
        lon: opts.lon ?? -106,
        timeZone: opts.timeZone ?? 'America/Denver',
        arrive: '2027-10-21',
        nights: opts.nights ?? 1,
        weather: [{ date: '2027-10-21', cloudOktas: 0, highC: 30, lowC: 30 }],
      },
    ],
  };
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

describe('verdict', () => {
  it('runs out at the hour the arithmetic says: 10 A from 100 Ah is 10 points an hour, so a 15 % floor falls in the 9th hour (23:00)', () => {
    // 128 W / 12.8 V = 10 A → 10 %/h. After 8 hours (15:00–23:00) the bank is at 20 %; the 23:00 hour
    // needs 10 points but only 5 remain above the 15 % floor, so the cutoff is in the row labelled 23:00.
    // The trip ends at 11:00 next morning: rows 23:00 … 10:00 are 12 hours with unmet energy.
    const plan = noSunPlan(128);
    const f = forecast(plan);
    const v = verdict(f, plan);
    expect(v.status).toBe('runs-out');
    expect(v.headline).toBe('Runs out Thu 21 Oct at 23:00 at Test camp — 12 hours short');
    expect(v.cutoffAt).toBe('2027-10-21T23:00-06:00');
    expect(v.hoursShort).toBe(12);
    expect(v.detail).toMatch(/15 % floor/);
  });

  it('says "Makes it" with the lowest point and its local time when the bank lasts', () => {
    // 20 hours from 15:00 to 11:00 at 12.8 W = 256 Wh (first model: 1 A, 80 %). Revision 2, by hand:
    // 134.0 Wh to 90 %, then 122.0 Wh at 13.33 − 0.002·u V over u points → u = 9.16 → 80.8 %:
    // lowest 81 % in the last row (10:00).
    const plan = noSunPlan(12.8);
    const f = forecast(plan);
    const v = verdict(f, plan);
    expect(v.status).toBe('makes-it');
    expect(v.headline).toBe('Makes it — lowest 81 % on Fri 22 Oct, 10:00');
    expect(v.cutoffAt).toBeNull();
    expect(v.hoursShort).toBe(0);
  });

  it('warns when the bank stays above its floor but dips below the trip reserve', () => {
    const plan = noSunPlan(12.8);
    const v = verdict(forecast(plan), plan, 85);
    expect(v.status).toBe('below-reserve');
    // Lowest 80.8 % (worked out above), below the 85 % reserve.
    expect(v.headline).toBe('Makes it, but dips below your 85 % reserve — lowest 81 % on Fri 22 Oct, 10:00');
    expect(v.reservePct).toBe(85);
  });

  it('uses the floor as the reserve when the trip sets none', () => {
    const plan = noSunPlan(12.8, { floorSocPct: 20 });
    const v = verdict(forecast(plan), plan, null);
    expect(v.reservePct).toBe(20);
    expect(v.status).toBe('makes-it');
  });

  it('tells the time in the camp’s own zone, whatever zone the machine runs in', () => {
    // The same plan in Auckland (UTC+13 in late October): 23:00 there is still 23:00 on the screen.
    const before = process.env.TZ;
    process.env.TZ = 'America/Los_Angeles';
    try {
      const plan = noSunPlan(128, { timeZone: 'Pacific/Auckland', lat: -39, lon: 176 });
      const f = forecast(plan);
      expect(f.summary.firstCutoffAt).toBe('2027-10-21T23:00+13:00');
      expect(verdict(f, plan).headline).toBe('Runs out Thu 21 Oct at 23:00 at Test camp — 12 hours short');
    } finally {
      if (before === undefined) delete process.env.TZ;
      else process.env.TZ = before;
    }
  });
});
