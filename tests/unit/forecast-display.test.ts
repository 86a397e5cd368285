// The pure display helpers of the forecast views: local times, chart series, CSV.
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { demoPlan, forecast, validatePlan } from '../../src/engine';
import { cutoffX, dayTicks, daysSummaryText, nightBands, socSeries, socSummaryText, stopSegments, usableSeries, voltageMarks } from '../../src/features/forecast/chart-data';
import { CSV_COLUMNS, forecastCsv } from '../../src/domain/forecasts/hourly-csv';
import { formatDay, formatOffset, formatRowTime, formatRowTimeWithZone, instantOf, localParts } from '../../src/lib/format';
import { at } from '../../src/lib/invariant';

const checked = validatePlan(demoPlan());
if (!checked.ok) throw new Error('demo plan');
const plan = checked.plan;
const demo = forecast(plan);

describe('local times from the row’s own offset', () => {
  it('reads the wall clock from the string', () => {
    expect(localParts('2027-10-23T03:00-06:00')).toMatchObject({ date: '2027-10-23', hour: 3, minute: 0, offset: '-06:00' });
    expect(localParts('not a time')).toBeNull();
  });

  it('formats days and times the way the verdict says them', () => {
    expect(formatDay('2027-10-23')).toBe('Sat 23 Oct');
    expect(formatRowTime('2027-10-23T03:00-06:00')).toBe('Sat 23 Oct, 03:00');
    expect(formatOffset('2027-10-23T03:00+05:30')).toBe('UTC+05:30');
    expect(formatOffset('2027-10-23T03:00-06:00')).toBe('UTC−06:00');
  });

  it('names the zone, with daylight saving, for the repeated hour of a DST change', () => {
    // 01:00 happens twice in Denver on Sun 7 Nov 2027: first as MDT (−06:00), then as MST (−07:00).
    expect(formatRowTimeWithZone('2027-11-07T01:00-06:00', 'America/Denver')).toBe('Sun 7 Nov, 01:00 MDT (UTC−06:00)');
    expect(formatRowTimeWithZone('2027-11-07T01:00-07:00', 'America/Denver')).toBe('Sun 7 Nov, 01:00 MST (UTC−07:00)');
    expect(instantOf('2027-11-07T01:00-07:00') - instantOf('2027-11-07T01:00-06:00')).toBe(3_600_000);
  });
});

describe('chart series of the demo forecast', () => {
  it('draws the SOC from the start, one point per hour end', () => {
    const s = socSeries(demo);
    expect(s.length).toBe(demo.hourly.length + 1);
    expect(s[0]).toEqual({ x: 0, soc: demo.summary.startSocPct, row: -1 });
    expect(s[5]).toEqual({ x: 5, soc: demo.hourly[4]?.socPct, row: 4 });
  });

  it('shades exactly the hours with the sun at or below the horizon, merged into nights', () => {
    const bands = nightBands(demo);
    const dark = new Set<number>();
    for (const b of bands) for (let x = b.x1; x < b.x2; x++) dark.add(x);
    demo.hourly.forEach((r, i) => expect(dark.has(i)).toBe(r.sunAltitudeDeg <= 0));
    // Five nights in the demo trip, each one band.
    expect(bands.length).toBe(5);
  });

  it('names the two stops along the top, in order, covering every hour', () => {
    const segs = stopSegments(demo, plan);
    expect(segs.map((s) => s.name)).toEqual(['Juniper Mesa', 'Cinder Flat']);
    expect(segs[0]?.x1).toBe(0);
    expect(segs[1]?.x2).toBe(demo.hourly.length);
    expect(segs[0]?.x2).toBe(segs[1]?.x1);
  });

  it('puts day ticks at local midnights', () => {
    const ticks = dayTicks(demo, 10);
    expect(ticks[0]?.label).toBe('Fri 22');
    for (const t of ticks) expect(localParts(at(demo.hourly, t.x, 'hour').time)?.hour).toBe(0);
    expect(dayTicks(demo, 2).length).toBeLessThanOrEqual(3);
  });

  it('has no cutoff marker when the bank lasts, and a text summary that says so', () => {
    expect(cutoffX(demo)).toBeNull();
    const text = socSummaryText(demo, plan);
    expect(text).toContain('No cutoff.');
    // The demo's lowest point is an invented scenario's figure (revision 2 moved it from 43 % to
    // 48 %): the text must say the summary's lowest, rounded, at its time.
    expect(text).toContain(`lowest ${Math.round(demo.summary.minSocPct)} % on ${formatRowTime(demo.summary.minSocAt)}`);
    expect(text).not.toMatch(/NaN|undefined/);
  });
});

describe('daysSummaryText', () => {
  it('names the hardest whole day, not a short first or last day', () => {
    // Whole demo days: Fri 22 (−249 Wh net), Sat 23 (−503), Sun 24 (+1,016, the drive), Mon 25 (−119).
    const worst = demo.days.filter((d) => d.date > '2027-10-21' && d.date < '2027-10-26').reduce((a, b) => (b.netWh < a.netWh ? b : a));
    expect(worst.date).toBe('2027-10-23');
    expect(daysSummaryText(demo)).toContain(`The hardest whole day is Sat 23 Oct: ${(-worst.netWh).toLocaleString('en-US')} Wh more used than charged.`);
  });
});

describe('forecastCsv', () => {
  it('has a header and one row per hour, with the stop’s name', () => {
    const parsed = Papa.parse<string[]>(forecastCsv(demo).trim(), { skipEmptyLines: true });
    expect(parsed.data[0]).toEqual(['stop', ...CSV_COLUMNS]);
    expect(parsed.data.length).toBe(demo.hourly.length + 1);
    expect(parsed.data[1]?.[0]).toBe('Juniper Mesa');
    expect(Number(parsed.data[1]?.[2])).toBe(demo.hourly[0]?.socPct);
  });

  it('escapes a stop name that a spreadsheet would run as a formula', () => {
    const evil = { ...demo, stops: [{ name: '=HYPERLINK("x")', timeZone: 'America/Denver' }, at(demo.stops, 1, 'stop')] };
    const first = Papa.parse<string[]>(forecastCsv(evil).trim()).data[1]?.[0];
    expect(first?.startsWith("'")).toBe(true);
  });
});

describe('revision 2 chart marks: usable charge and voltage cutoffs', () => {
  const plan = (over: { lowC: number; highC: number; microwave: boolean }) => {
    const v = validatePlan({
      bank: { chemistry: 'agm', capacityAh: 100, initialSocPct: 100, cutoffVolts: 11.5 },
      inverter: { efficiencyPct: 90, idleWatts: 10 },
      loads: [{ name: 'Lamp', watts: 10 }, ...(over.microwave ? [{ name: 'Microwave', watts: 1200, supply: 'ac' as const, windows: [[18, 19]] as [number, number][], dutyPct: 10, surgeWatts: 1500 }] : [])],
      stops: [{ name: 'Camp', lat: 40, lon: -105, timeZone: 'America/Denver', arrive: '2027-01-10', nights: 1, weather: [{ date: '2027-01-10', cloudOktas: 8, highC: over.highC, lowC: over.lowC }] }],
    });
    if (!v.ok) throw new Error(JSON.stringify(v.envelope));
    return v.plan;
  };

  it('draws no usable line on a warm trip (nothing stranded) and one under SOC on a cold one', () => {
    // At 30 °C f = 1: usable = SOC. At −10 °C an AGM's f = 1 − 0.012 × 35 = 0.58 once the battery
    // has cooled: 42 points stranded, far more than the 1-point threshold.
    expect(usableSeries(forecast(plan({ lowC: 30, highC: 30, microwave: false })))).toBeNull();
    const cold = forecast(plan({ lowC: -10, highC: -10, microwave: false }));
    const u = usableSeries(cold);
    expect(u).not.toBeNull();
    u!.forEach((p, i) => expect(p.soc).toBeLessThanOrEqual(at(cold.hourly, i, 'hour').socPct));
    expect(socSummaryText(cold, plan({ lowC: -10, highC: -10, microwave: false }))).toContain('usable charge is lowest at');
  });

  it('marks each hour with a voltage, surge or collapse warning once, with its kind, and says so in the summary', () => {
    // A full 100 Ah AGM (12 mΩ) at 20 °C: the microwave's 1,500 W surge through a 90 % inverter is
    // 1,667 W, I = (12.8 − √(12.8² − 4 × 0.012 × 1,667)) / 0.024 = (12.8 − 9.16) / 0.024 ≈ 152 A, a 1.8 V sag to ~11.0 V,
    // under the 11.5 V cutoff in the 18:00 hour (hand calculation).
    const p = plan({ lowC: 20, highC: 20, microwave: true });
    const f = forecast(p);
    const codes = new Set(['voltage-cutoff', 'surge-cutoff', 'voltage-collapse']);
    const warned = f.warnings.filter((w) => codes.has(w.code));
    expect(warned.length).toBeGreaterThan(0);
    const marks = voltageMarks(f);
    expect(new Set(marks.map((m) => m.time))).toEqual(new Set(warned.map((w) => w.at)));
    for (const m of marks) {
      expect(at(f.hourly, m.x, 'hour').time).toBe(m.time);
      const kinds = warned.filter((w) => w.at === m.time).map((w) => w.code);
      expect(m.kind).toBe(kinds.includes('voltage-collapse') ? 'collapse' : kinds.includes('surge-cutoff') ? 'surge' : 'voltage');
    }
    expect(socSummaryText(f, p)).toMatch(/A (low-voltage cutoff|surge cutoff|voltage collapse) on /);
    // A trip without such warnings has no marks.
    expect(voltageMarks(forecast(plan({ lowC: 20, highC: 20, microwave: false })))).toEqual([]);
  });
});
