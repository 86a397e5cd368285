// The invented demo trip reads plausibly to a camper. Bands are broad and come from
// trade-notes.md; they catch implausible bugs, they are not targets to tune the model to.
import { describe, expect, it } from 'vitest';
import { demoPlan, runForecast } from '../../../src/engine/index';

const r = runForecast(demoPlan());
if (!r.ok) throw new Error(JSON.stringify(r.envelope));
const f = r.forecast;
const fullDays = f.days.slice(1, -1);

describe('demo trip: Reyes-Okafor van, late October 2027', () => {
  it('spans five nights at two stops across two zones, with the drive day between them', () => {
    expect(f.hourly[0]!.time).toBe('2027-10-21T15:00-06:00');
    expect(f.hourly[f.hourly.length - 1]!.time).toBe('2027-10-26T10:00-07:00');
    expect(f.stops.map((s) => s.name)).toEqual(['Juniper Mesa', 'Cinder Flat']);
    expect(f.hourly.filter((h) => h.driving)).toHaveLength(5);
    expect(f.days.find((d) => d.date === '2027-10-24')?.chargeWh).toBeGreaterThan(0);
  });

  it('a flat 400 W roof array harvests 1.5–4.5 h × rated on full days (rule of thumb ~4 h on a clear summer day [cp], less in October)', () => {
    for (const d of fullDays.filter((x) => x.date !== '2027-10-24')) {
      expect(d.solarWh / 400).toBeGreaterThan(1.5);
      expect(d.solarWh / 400).toBeLessThan(4.5);
    }
  });

  it('uses 60–200 Ah a day on full camp days (trade notes: 60–90 Ah mild with propane fridge, up to double with compressor fridge, CPAP, cold nights)', () => {
    for (const d of fullDays.filter((x) => x.date !== '2027-10-24')) {
      const ah = d.loadWh / 12.8;
      expect(ah).toBeGreaterThan(60);
      expect(ah).toBeLessThan(200);
    }
  });

  it('drops 10–40 points overnight and never cuts off', () => {
    const at = (t: string) => f.hourly.find((h) => h.time === t)?.socPct ?? NaN;
    const drop = at('2027-10-23T17:00-06:00') - at('2027-10-24T07:00-06:00');
    expect(drop).toBeGreaterThan(10);
    expect(drop).toBeLessThan(40);
    expect(f.summary.firstCutoffAt).toBeNull();
    expect(f.summary.unmetWh).toBe(0);
    expect(f.summary.minSocPct).toBeGreaterThan(20);
  });

  it('has a freezing night at Juniper Mesa', () => {
    expect(Math.min(...f.hourly.map((h) => h.ambientC))).toBeLessThan(0);
  });
});
