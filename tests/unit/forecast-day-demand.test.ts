// The daily chart's bars: demand = loads served + loads not served, per local day (#16 item 9).
import { describe, expect, it } from 'vitest';
import { daysSummaryText } from '../../src/features/forecast/chart-data';
import { dayEnergy, unmetDays } from '../../src/features/forecast/day-energy';
import { basePlan, run } from '../reference/plan-helpers';

// A 100 Ah LiFePO4 bank at 30 °C (capacity factor 1), Peukert off, no internal resistance, a steady
// 128 W DC load, one night at a stop arriving 15:00 (America/Phoenix, no DST): rows 15:00–23:00 on
// the first day (9 hours) and 00:00–10:00 on the second (11 hours), ending at 11:00.
// From 15 % the bank reaches its 10 % floor inside the first hour: tests/unit/engine/cutoff.test.ts
// works out 63.54 Wh served by hand (mean OCV × points on the common-practice OCV table); every
// later hour is cut off, so its 128 Wh go unmet.
const plan = basePlan({
  bank: { chemistry: 'lifepo4', capacityAh: 100, peukertExponent: 1, floorSocPct: 10, internalResistanceMilliohm: 0, initialSocPct: 15 },
  loads: [{ name: '10 A', watts: 128 }],
  tempC: 30,
  stop: { nights: 1 },
});

describe('daily demand with loads not served', () => {
  const f = run(plan);

  it('adds what went unmet to what was served, so a cut-off day is as tall as it asked', () => {
    const days = dayEnergy(f);
    expect(days.map((d) => d.date)).toEqual(['2027-06-10', '2027-06-11']);
    const [first, second] = days;
    // Day one: 9 hours × 128 W = 1,152 Wh asked; 63.54 Wh served in the first hour; 1,152 − 63.54 = 1,088.46 unmet.
    expect(Math.abs((first?.servedWh ?? 0) - 63.54)).toBeLessThan(1); // loadWh is rounded to whole Wh
    expect(Math.abs((first?.unmetWh ?? 0) - 1088.46)).toBeLessThan(1);
    expect(first?.demandWh).toBeCloseTo(1152, 0);
    // Day two: 11 hours × 128 W = 1,408 Wh asked, none served (the bank never charges back to 15 %).
    expect(second?.servedWh).toBe(0);
    expect(second?.unmetWh).toBe(1408);
    expect(second?.demandWh).toBe(1408);
    expect(unmetDays(f).map((d) => d.date)).toEqual(['2027-06-10', '2027-06-11']);
  });

  it('sums the hours for a snapshot whose days carry no unmetWh (saved before the field existed)', () => {
    const old = { ...f, days: f.days.map(({ unmetWh: _drop, ...d }) => d) } as unknown as typeof f;
    const days = dayEnergy(old);
    // Hours are rounded to whole watts: 64 (128 − 63.54 = 64.46) + 8 × 128 = 1,088; day two 11 × 128 = 1,408.
    expect(days[0]?.unmetWh).toBe(64 + 8 * 128);
    expect(days[1]?.unmetWh).toBe(11 * 128);
    expect(days[1]?.demandWh).toBe(1408);
  });

  it('has no unmet days when the bank never cuts off', () => {
    const full = run(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 100 },
        loads: [{ name: 'Light', watts: 10 }],
        tempC: 30,
        stop: { nights: 1 },
      }),
    );
    expect(unmetDays(full)).toEqual([]);
    // 9 + 11 hours × 10 W, all served (loadWh is the served part).
    expect(dayEnergy(full).map((d) => d.demandWh)).toEqual([90, 110]);
  });
});

describe('the daily chart’s summary', () => {
  it('says what the loads asked for and got, and judges the hardest day by what it asked', () => {
    const text = daysSummaryText(run(plan));
    // Asked 1,152 + 1,408 = 2,560 Wh; served 63.54 → 64 Wh (loadWh rounded). Neither day is whole (9 and 11 hours),
    // so both are judged: day two is short by 1,408 Wh (nothing charges), all of it not served.
    expect(text).toContain('Over 2 days the loads ask for 2,560 Wh and get 64 Wh;');
    expect(text).toContain('The hardest day is Fri 11 Jun: 1,408 Wh more asked for than charged (1,408 Wh of it not served).');
  });
});
