import { describe, expect, it } from 'vitest';
import { changedDay, type PlanWeather } from '../../src/domain/watch/changed-day';

// Which stop-day's weather the watch's e-mail names as the one that moved the answer. The sunlight
// of a day is the sum of its hourly irradiance (W/m² over 1 h = Wh/m²); the figures are invented.

/** A day whose hours 10–14 have `ghi` W/m² each: 5 × ghi Wh/m² in all. */
const day = (date: string, ghi: number) => ({ date, cloudOktas: 4, hourly: [10, 11, 12, 13, 14].map((hour) => ({ hour, ghiWm2: ghi })) });

const plan = (a: number[], b: number[]): PlanWeather => ({
  stops: [
    { name: 'Ridge camp', arrive: '2026-12-07', nights: 2, weather: [day('2026-12-07', a[0]!), day('2026-12-08', a[1]!), day('2026-12-09', a[2]!)] },
    { name: 'Wash camp', arrive: '2026-12-09', nights: 2, weather: [day('2026-12-09', b[0]!), day('2026-12-10', b[1]!), day('2026-12-11', b[2]!)] },
  ],
});

describe('changedDay', () => {
  it('names the camped day whose sunlight moved the most', () => {
    // Ridge 8 Dec moves 5 × (600 − 300) = 1500 Wh/m²; Wash 10 Dec 5 × (500 − 150) = 1750 Wh/m², the most.
    expect(changedDay(plan([500, 600, 500], [500, 500, 500]), plan([500, 300, 500], [500, 150, 500]))).toEqual({ date: '2026-12-10', stop: 'Wash camp' });
  });

  it('leaves out the departure morning and the days after a cutoff', () => {
    // Ridge's 9 Dec is its departure day (arrive 7 Dec + 2 nights): a big move there does not count.
    expect(changedDay(plan([500, 500, 900], [500, 500, 500]), plan([500, 400, 0], [500, 500, 500]))).toEqual({ date: '2026-12-08', stop: 'Ridge camp' });
    // With the cutoff on 8 Dec, Wash camp's larger move on 10 Dec comes after it.
    expect(changedDay(plan([500, 500, 500], [500, 900, 500]), plan([500, 400, 500], [500, 100, 500]), '2026-12-08')).toEqual({ date: '2026-12-08', stop: 'Ridge camp' });
  });

  it('names nothing with no earlier answer or no weather moved', () => {
    expect(changedDay(null, plan([1, 2, 3], [1, 2, 3]))).toBeNull();
    expect(changedDay(plan([1, 2, 3], [1, 2, 3]), plan([1, 2, 3], [1, 2, 3]))).toBeNull();
  });
});
