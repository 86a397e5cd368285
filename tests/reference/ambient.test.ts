// Hourly ambient temperature from the daily low and high (forecast-engine.md step 10):
// ASHRAE Handbook — Fundamentals 2009, ch. 14, table 6, T = Tmax − f·(Tmax − Tmin), hour-ending.
import { describe, expect, it } from 'vitest';
import { ASHRAE_FRACTIONS, ambientForRow, ashraeTemperature } from '../../src/engine/ambient';
import { basePlan, run } from './plan-helpers';

describe('ASHRAE fractions of the daily range (check-values §12; also EnergyPlus and ladybug-tools designday)', () => {
  it('are the published 24 hour-ending values (VERIFIED, secondary)', () => {
    expect(ASHRAE_FRACTIONS).toEqual([
      0.88, 0.92, 0.95, 0.98, 1.0, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13, 0.05, 0.0, 0.0, 0.06, 0.14, 0.24, 0.39, 0.5, 0.59, 0.68, 0.75, 0.82,
    ]);
  });

  it.each([
    [5, 20.0],
    [14, 30.0],
    [15, 30.0],
    [20, 25.0],
  ])('Tmax 30, range 10: hour %i → %f °C (check-values §12, COMPUTED)', (h, t) => {
    expect(ashraeTemperature(h, 30, 20)).toBeCloseTo(t, 12);
  });

  it('the mean fraction is 0.53625, so the daily mean is 24.64 °C, not the midpoint 25 (COMPUTED)', () => {
    const mean = ASHRAE_FRACTIONS.reduce((a, b) => a + b, 0) / 24;
    expect(mean).toBeCloseTo(0.53625, 12);
    expect(30 - mean * 10).toBeCloseTo(24.6375, 10);
  });

  it('the row [h, h+1) uses the fraction of hour h+1 (hour-ending): the row at 04:00 is the minimum', () => {
    expect(ambientForRow(4, 30, 20)).toBe(20);
    expect(ambientForRow(0, 30, 20)).toBeCloseTo(30 - 0.88 * 10, 12);
    expect(ambientForRow(23, 30, 20)).toBeCloseTo(30 - 0.82 * 10, 12);
  });

  it('in the forecast: each row uses its local clock hour and its own day\'s high and low', () => {
    const f = run(
      basePlan({
        stop: {
          arrive: '2027-06-10',
          nights: 2,
          weather: [
            { date: '2027-06-10', cloudOktas: 0, highC: 30, lowC: 20 },
            { date: '2027-06-11', cloudOktas: 0, highC: 10, lowC: -2 },
            { date: '2027-06-12', cloudOktas: 0, highC: 12, lowC: 0 },
          ],
        },
      }),
    );
    const at = (t: string) => f.hourly.find((h) => h.time === t)?.ambientC;
    expect(at('2027-06-10T19:00-07:00')).toBe(25); // f(20) = 0.5
    expect(at('2027-06-11T04:00-07:00')).toBe(-2); // the 11th's low, from midnight
    expect(at('2027-06-11T13:00-07:00')).toBe(10);
    expect(at('2027-06-12T04:00-07:00')).toBe(0);
  });
});
