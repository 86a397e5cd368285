import { describe, expect, it } from 'vitest';
import { dailyAh, nightBaseline, nightTemperature, plannedNightDraw, suggestedParasiticWatts } from '../../src/domain/monitor/baseline';
import { detectSign } from '../../src/domain/monitor/detect';
import type { Sample } from '../../src/domain/monitor/parse';
import { overlaySoc } from '../../src/domain/monitor/overlay';
import { demoPlan, forecast, validatePlan } from '../../src/engine';
import { truth, type TruthRow } from '../fixtures/monitor/synthetic';
import { at } from '../../src/lib/invariant';

// The night-time baseline and the daily amp-hours on synthetic series whose draw is known.

const TZ = 'America/Denver';
const asSamples = (rows: TruthRow[]): Sample[] => rows.map((r) => ({ t: r.t, volts: r.volts, amps: r.amps, socPct: r.socPct, tempC: r.tempC }));

describe('night-time baseline', () => {
  it('finds the known draw between 01:00 and 05:00, night by night', () => {
    const r = nightBaseline(asSamples(truth({ days: 3, nightDrawA: 1.5 })), TZ);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.baseline.drawA).toBe(1.5);
    expect(r.baseline.nights.map((n) => n.date)).toEqual(['2027-10-21', '2027-10-22', '2027-10-23']);
    // 4 hours of 5-minute readings per night.
    expect(r.baseline.nights.every((n) => n.samples === 48 && n.drawA === 1.5)).toBe(true);
    expect(r.baseline.excludedCharging).toBe(0);
  });

  it('takes the median, so a furnace cycling on one night does not move it', () => {
    const s = asSamples(truth({ days: 3, nightDrawA: 1.2 }));
    // The blower runs 6 A for 40 minutes on the second night.
    const clockStart = Date.parse('2027-10-22T02:00:00-06:00');
    for (const x of s) if (x.t >= clockStart && x.t < clockStart + 40 * 60_000) x.amps = -6;
    const r = nightBaseline(s, TZ);
    expect(r.ok && r.baseline.drawA).toBe(1.2);
  });

  it('leaves out readings where something charged at night, and says when nothing is left', () => {
    const s = asSamples(truth({ days: 2, nightDrawA: 1.5 }));
    const shore = s.map((x) => ({ ...x, amps: x.amps! + 10 }));
    const r = nightBaseline(shore, TZ);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/charging .*shore power or a generator/);
    const part = s.map((x, i) => (i % 2 === 0 ? { ...x, amps: 8 } : x));
    const p = nightBaseline(part, TZ);
    expect(p.ok && p.baseline.drawA).toBe(1.5);
    expect(p.ok && p.baseline.excludedCharging).toBeGreaterThan(0);
  });

  it('reads the night in the log’s time zone', () => {
    // The same instants read in a zone 7 h ahead put the 01:00–05:00 window into the daytime draw.
    const r = nightBaseline(asSamples(truth({ days: 3, nightDrawA: 1.5, dayDrawA: 4, solarPeakA: 0 })), 'Europe/Berlin');
    expect(r.ok && r.baseline.drawA).toBe(4);
  });

  it('needs a current column', () => {
    const s = asSamples(truth({ days: 1 })).map((x) => ({ ...x, amps: null }));
    expect(nightBaseline(s, TZ)).toEqual({ ok: false, reason: 'The log has no current column, so the draw cannot be read from it.' });
  });

  it('the median night temperature', () => {
    expect(nightTemperature(asSamples(truth({ days: 2 })), TZ)).toBeLessThan(12);
  });
});

describe('daily amp-hours', () => {
  it('counts a day without sun exactly: 9 h × 1.5 A + 15 h × 4 A = 73.5 Ah consumed', () => {
    const days = dailyAh(asSamples(truth({ days: 3, nightDrawA: 1.5, dayDrawA: 4, solarPeakA: 0 })), TZ);
    expect(days.map((d) => d.date)).toEqual(['2027-10-21', '2027-10-22', '2027-10-23']);
    expect(days[1]).toEqual({ date: '2027-10-22', consumedAh: 73.5, chargedAh: 0, netAh: -73.5, hoursCovered: 24 });
    // The last reading of the log starts no interval.
    expect(days[2]?.hoursCovered).toBeCloseTo(24 - 5 / 60, 1);
  });

  it('splits charging from consumption and the net matches the integral of the current', () => {
    const rows = truth({ days: 2, solarPeakA: 20 });
    const days = dailyAh(asSamples(rows), TZ);
    const firstDay = rows.filter((r) => r.t < Date.parse('2027-10-22T00:00:00-06:00'));
    const net = firstDay.reduce((s, r) => s + (r.amps * 5) / 60, 0);
    expect(days[0]?.netAh).toBeCloseTo(net, 1);
    expect(days[0]?.chargedAh).toBeGreaterThan(40);
  });

  it('leaves a gap in the log out instead of guessing it', () => {
    const rows = truth({ days: 2, nightDrawA: 1.5, dayDrawA: 4, solarPeakA: 0 });
    const noon = Date.parse('2027-10-21T12:00:00-06:00');
    const gapped = rows.filter((r) => r.t < noon || r.t >= noon + 2 * 3_600_000);
    const d = at(dailyAh(asSamples(gapped), TZ), 0, 'day');
    // The reading at 11:55 is followed by one at 14:00: that 2 h 05 min interval is not counted.
    expect(d.hoursCovered).toBe(Math.round((24 - 2 - 5 / 60) * 10) / 10);
    expect(d.consumedAh).toBe(Math.round((73.5 - 4 * (2 + 5 / 60)) * 10) / 10);
  });

  it('a day with a DST change has 25 hours', () => {
    const days = dailyAh(asSamples(truth({ start: '2027-11-06', days: 3, solarPeakA: 0 })), TZ);
    expect(days.find((d) => d.date === '2027-11-07')?.hoursCovered).toBe(25);
  });
});

describe('what the load list plans for the night, measured by the engine', () => {
  const bank = { chemistry: 'lifepo4' as const, capacityAh: 300 };
  it('a DC fridge at 40 % duty draws 18 W; an evening lamp draws nothing at night', () => {
    const p = plannedNightDraw({ bank, loads: [{ name: 'Fridge', watts: 45, dutyPct: 40 }, { name: 'Lamp', watts: 10, windows: [[18, 23]] }] }, 20);
    expect(p.watts).toBeCloseTo(18, 0);
  });

  it('an AC load at night adds its inverter losses and the inverter’s idle draw (engine rules)', () => {
    const p = plannedNightDraw({ bank, inverter: { efficiencyPct: 90, idleWatts: 12 }, loads: [{ name: 'CPAP', watts: 30, supply: 'ac', windows: [[22, 7]] }] }, 20);
    expect(p.watts).toBeCloseTo(30 / 0.9 + 12, 0);
  });

  it('a cooling load draws more on a warm night', () => {
    const loads = [{ name: 'Fridge', watts: 45, dutyPct: 40, response: 'cooling' as const }];
    expect(plannedNightDraw({ bank, loads }, 30).watts).toBeGreaterThan(plannedNightDraw({ bank, loads }, 10).watts);
  });

  it('suggests the night draw the load list does not explain, never below zero', () => {
    const base = { fromHour: 1, toHour: 5, drawA: 2, volts: 13.2, samples: 48, excludedCharging: 0, nights: [] };
    expect(suggestedParasiticWatts(base, 12.8, { watts: 18, ambientC: 20 })).toBe(7.6);
    expect(suggestedParasiticWatts(base, 12.8, { watts: 40, ambientC: 20 })).toBe(0);
  });
});

describe('the current’s sign', () => {
  const s = asSamples(truth({ days: 2 }));
  it('from the state of charge', () => {
    expect(detectSign(s, TZ).sign).toBe('charge-positive');
    expect(detectSign(s.map((x) => ({ ...x, amps: -x.amps! })), TZ).sign).toBe('discharge-positive');
  });
  it('from the night when only the current is known', () => {
    const bare = s.map((x) => ({ ...x, socPct: null, volts: null }));
    expect(detectSign(bare, TZ)).toMatchObject({ sign: 'charge-positive', reason: expect.stringContaining('01:00 and 05:00') });
    expect(detectSign(bare.map((x) => ({ ...x, amps: -x.amps! })), TZ).sign).toBe('discharge-positive');
  });
});

describe('measured SOC over a saved forecast', () => {
  const v = validatePlan(demoPlan());
  if (!v.ok) throw new Error('demo plan');
  const f = forecast(v.plan);
  const start = Date.parse(at(f.hourly, 0, 'hour').time);
  it('matches readings to the rows’ ends and measures the gap', () => {
    // Readings 5 points under the forecast, a few minutes off the hour, for the first 24 hours only.
    const readings = f.hourly.slice(0, 24).map((r, i) => ({ t: start + (i + 1) * 3_600_000 + 4 * 60_000, socPct: r.socPct - 5 }));
    const o = overlaySoc(f, readings);
    expect(o.matched).toBe(24);
    expect(o.meanDiffPct).toBe(-5);
    expect(o.measured[0]).toBeNull();
    expect(o.measured[1]).toBeCloseTo(at(f.hourly, 0, 'hour').socPct - 5, 5);
    expect(o.measured[30]).toBeNull();
  });
  it('matches nothing when the log is from other dates', () => {
    expect(overlaySoc(f, [{ t: start - 30 * 86_400_000, socPct: 50 }]).matched).toBe(0);
  });
});
