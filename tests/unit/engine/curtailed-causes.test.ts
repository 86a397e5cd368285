// Why solar was curtailed, hour by hour (#16 item 10): the part a warm bank would have taken is the
// cold's, the part the bank's flat maximum current would have taken is the taper's (bank full), the
// rest is above the bank's charge-current limit. Expected values worked out by hand below.
import { describe, expect, it } from 'vitest';
import { fromColumns, toColumns } from '../../../src/lib/forecast-columns';
import { basePlan, run } from '../../reference/plan-helpers';

// One hour of measured sun on a flat panel (tilt 0: POA = DNI·cos z + DHI = GHI exactly, isotropic
// model with no ground term) at 11:00 on 10 Jun 2027: GHI 500 W/m². A 1,000 W array with no
// temperature coefficient, no losses and a 100 % efficient MPPT delivers 1,000 × 500/1,000 = 500 W.
// Internal resistance 0, so the terminal volts are the open-circuit volts (common-practice table).
const sunHour = (tempC: number) => ({
  arriveHour: 11,
  nights: 1,
  weather: [
    { date: '2027-06-10', cloudOktas: 0, highC: tempC, lowC: tempC, hourly: [{ hour: 11, ghiWm2: 500, tempC }] },
    { date: '2027-06-11', cloudOktas: 8, highC: tempC, lowC: tempC },
  ],
});
const flat1kW = [{ name: 'Flat', ratedWatts: 1000, tiltDeg: 0, tempCoeffPctPerC: 0, lossesPct: 0, controllerEfficiencyPct: 100 }];

function firstHour(bank: Record<string, unknown>, tempC: number) {
  const f = run(
    basePlan({ bank: { internalResistanceMilliohm: 0, ...bank } as never, arrays: flat1kW, tempC, stop: sunHour(tempC) as never }),
  );
  const r = f.hourly[0];
  if (!r) throw new Error('no hours');
  return { f, r };
}

describe('curtailed solar by cause', () => {
  it('a warm half-full bank with room takes all 500 W: nothing curtailed', () => {
    // 1,000 Ah bank, default 0.5 C = 500 A acceptance; 500 W / 13.17 V ≈ 38 A is far below it.
    const { r } = firstHour({ chemistry: 'lifepo4', capacityAh: 1000, initialSocPct: 50 }, 30);
    expect(r.solarWatts).toBe(500);
    expect([r.curtailedWatts, r.curtailedColdWatts, r.curtailedFullWatts, r.curtailedLimitWatts]).toEqual([0, 0, 0, 0]);
  });

  it('a LiFePO4 bank at −5 °C refuses all of it: 500 W curtailed, all of it for the cold', () => {
    // Battery at ambient −5 °C < 0 °C: the lockout refuses charge. Warm, the 0.5 C = 50 A acceptance would
    // have taken the whole 500 W / 13.17 V = 38 A, so all 500 W are the cold's.
    const { r } = firstHour({ chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50 }, -5);
    expect(r.solarWatts).toBe(0);
    expect(r.curtailedWatts).toBe(500);
    expect(r.curtailedColdWatts).toBe(500);
    expect(r.curtailedFullWatts).toBe(0);
    expect(r.curtailedLimitWatts).toBe(0);
  });

  it('a full warm bank refuses all of it: 500 W curtailed because it is full', () => {
    // At 100 % the taper leaves 0 A of acceptance; the flat 50 A would have taken 500 W / 13.6 V = 36.8 A.
    const { r } = firstHour({ chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 100 }, 30);
    expect(r.curtailedWatts).toBe(500);
    expect(r.curtailedFullWatts).toBe(500);
    expect(r.curtailedColdWatts).toBe(0);
    expect(r.curtailedLimitWatts).toBe(0);
  });

  it('a warm bank limited to 10 A takes 10 A × its volts; the rest is over its charge-current limit', () => {
    // 100 Ah at 50 %, 10 A × 0.99 × 1 h = 9.9 Ah → 59.9 %. OCV (LiFePO4 table, 40 % 13.13, 70 % 13.25 V):
    // 50 % 13.13 + 0.12 × 10/30 = 13.17 V; 59.9 % 13.13 + 0.12 × 19.9/30 = 13.2096 V. The 12 sub-steps use the
    // OCV at their start: mean 13.17 + 0.0396 × 5.5/12 = 13.1882 V. Taken 10 × 13.1882 = 131.88 W;
    // curtailed 500 − 131.88 = 368.12 W, all over the limit (below the 95 % knee, warm).
    const { r } = firstHour({ chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50, maxChargeAmps: 10 }, 30);
    expect(r.solarWatts).toBe(132);
    expect(r.curtailedWatts).toBe(368);
    expect(r.curtailedLimitWatts).toBe(368);
    expect(r.curtailedColdWatts).toBe(0);
    expect(r.curtailedFullWatts).toBe(0);
  });

  it('a cold AGM bank takes 0.7 of its 20 A: the missing 6 A are the cold’s, the rest over its limit', () => {
    // AGM 100 Ah, default 0.2 C = 20 A; at 0 °C f = 1 − 0.012 × 25 = 0.7, so 14 A. 14 × 0.92 = 12.88 Ah →
    // 50 → 62.88 %. OCV (AGM 50 % 12.3, 75 % 12.6 V): 12.3 → 12.3 + 0.3 × 12.88/25 = 12.4546 V; sub-step mean
    // 12.3 + 0.1546 × 5.5/12 = 12.3708 V. Taken 14 × 12.3708 = 173.19 W; a warm bank would take 20 A:
    // cold 6 × 12.3708 = 74.22 W; over the limit 500 − 20 × 12.3708 = 252.58 W (total 326.81 W).
    const { f, r } = firstHour({ chemistry: 'agm', capacityAh: 100, initialSocPct: 50, floorSocPct: 10 }, 0);
    expect(r.solarWatts).toBe(173);
    expect(r.curtailedWatts).toBe(327);
    expect(r.curtailedColdWatts).toBe(74);
    expect(r.curtailedLimitWatts).toBe(253);
    expect(r.curtailedFullWatts).toBe(0);
    // The day and the trip carry the same parts, summed from unrounded hours (each hour's watts are
    // rounded to whole W, so the day's sum of rounded hours may differ by up to half a watt-hour per hour).
    const dayHours = f.hourly.filter((h) => h.time.startsWith('2027-06-10'));
    const cold = dayHours.reduce((s, h) => s + (h.curtailedColdWatts ?? 0), 0);
    expect(Math.abs((f.days[0]?.curtailedColdWh ?? -1) - cold)).toBeLessThanOrEqual(dayHours.length / 2);
    const s = f.summary;
    expect(Math.abs((s.curtailedColdWh ?? 0) + (s.curtailedFullWh ?? 0) + (s.curtailedLimitWh ?? 0) - s.curtailedWh)).toBeLessThanOrEqual(
      1.5,
    );
  });

  it('travels in the columns form of the preview and back', () => {
    const { f } = firstHour({ chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50 }, -5);
    const c = toColumns(f);
    expect(c.hourlyColumns.curtailedColdWatts[0]).toBe(500);
    expect(c.hourlyColumns.curtailedFullWatts[0]).toBe(0);
    expect(c.hourlyColumns.curtailedLimitWatts[0]).toBe(0);
    expect(fromColumns(c)).toEqual(f);
  });
});
