// Load rules: windows (wrapping midnight, empty, overlapping), days, duty and temperature response.
import { describe, expect, it } from 'vitest';
import { dutyAt, inWindow, loadWattsAt, runsOnDay, windowMask, type LoadSpec } from '../../../src/engine/loads';
import { basePlan, run } from '../../reference/plan-helpers';

const hours = (mask: number) => [...Array(24).keys()].filter((h) => inWindow(mask, h));

describe('windows', () => {
  it.each<[string, [number, number][], number[]]>([
    ['all day', [[0, 24]], [...Array(24).keys()]],
    ['evening', [[18, 23]], [18, 19, 20, 21, 22]],
    ['wraps midnight', [[22, 6]], [0, 1, 2, 3, 4, 5, 22, 23]],
    ['[h, h] is empty', [[6, 6]], []],
    ['to 24', [[20, 24]], [20, 21, 22, 23]],
    ['from 24 wraps to the morning', [[24, 3]], [0, 1, 2]],
    ['overlaps do not add', [[8, 12], [10, 14]], [8, 9, 10, 11, 12, 13]],
    ['two windows', [[6, 8], [18, 20]], [6, 7, 18, 19]],
    ['no windows', [], []],
  ])('%s', (_n, windows, expected) => {
    expect(hours(windowMask(windows))).toEqual(expected);
  });
});

describe('days', () => {
  it.each([
    ['all', false, true],
    ['all', true, true],
    ['camp', false, true],
    ['camp', true, false],
    ['drive', false, false],
    ['drive', true, true],
  ] as const)('%s on a %s drive day → %s', (days, isDrive, expected) => {
    expect(runsOnDay(days, isDrive)).toBe(expected);
  });
});

describe('duty and temperature response (common practice)', () => {
  it('none: dutyPct', () => {
    expect(dutyAt({ dutyPct: 40, response: 'none', setpointC: 18 }, -10)).toBeCloseTo(0.4, 12);
  });

  it('cooling: base·(1 + 0.03·(T − 20)), clamped to [0, 1]', () => {
    const l = { dutyPct: 40, response: 'cooling' as const, setpointC: 18 };
    expect(dutyAt(l, 20)).toBeCloseTo(0.4, 12);
    expect(dutyAt(l, 30)).toBeCloseTo(0.52, 12);
    expect(dutyAt(l, 0)).toBeCloseTo(0.16, 12);
    expect(dutyAt(l, -20)).toBe(0);
    expect(dutyAt({ ...l, dutyPct: 90 }, 60)).toBe(1);
  });

  it('heating: clamp((setpoint − T)/25, 0, 1) × dutyPct/100', () => {
    const l = { dutyPct: 100, response: 'heating' as const, setpointC: 18 };
    expect(dutyAt(l, 18)).toBe(0);
    expect(dutyAt(l, 25)).toBe(0);
    expect(dutyAt(l, 5.5)).toBeCloseTo(0.5, 12);
    expect(dutyAt(l, -7)).toBe(1);
    expect(dutyAt({ ...l, dutyPct: 60 }, -30)).toBeCloseTo(0.6, 12);
  });

  it('watts × quantity × duty inside the window only', () => {
    const l: LoadSpec = { watts: 10, quantity: 3, supply: 'dc', windows: [[22, 6]], dutyPct: 50, days: 'all', response: 'none', setpointC: 18 };
    const mask = windowMask(l.windows);
    expect(loadWattsAt(l, mask, 23, false, 10)).toBe(15);
    expect(loadWattsAt(l, mask, 12, false, 10)).toBe(0);
    expect(loadWattsAt({ ...l, days: 'drive' }, mask, 23, false, 10)).toBe(0);
  });
});

describe('in the forecast', () => {
  it('a load wrapping midnight runs 22:00–06:00 local and a heater follows the ASHRAE night', () => {
    const f = run(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 300, initialSocPct: 100 },
        loads: [{ name: 'CPAP', watts: 25, windows: [[22, 6]] }],
        tempC: 10,
      }),
    );
    for (const h of f.hourly) {
      const hr = Number(h.time.slice(11, 13));
      expect(h.loadWatts).toBe(hr >= 22 || hr < 6 ? 25 : 0);
    }
  });

  it('camp-day and drive-day loads switch with the drive date', () => {
    const f = run(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 300, initialSocPct: 100 },
        loads: [
          { name: 'Laptop', watts: 10, days: 'camp' },
          { name: 'Dash cam', watts: 3, days: 'drive' },
        ],
        drives: [{ date: '2027-06-11', startHour: 9, hours: 2 }],
      }),
    );
    for (const h of f.hourly) expect(h.loadWatts).toBe(h.time.startsWith('2027-06-11') ? 3 : 10);
  });
});
