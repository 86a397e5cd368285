// With °F chosen in Settings every temperature the forecast speaks of follows: the cold warning, the
// assumed-weather warning and verdict, the cold fixes' setpoints, the caution and the CSV's columns.
// Conversions are checked by hand: °F = °C × 9/5 + 32 (0 °C = 32 °F, 10 °C = 50 °F, 15 °C = 59 °F,
// 18 °C = 64.4 °F, 20 °C = 68 °F), and a 3 °C step is 5.4 °F of difference, shown as 5 °F.
import { describe, expect, it } from 'vitest';
import { forecast, validatePlan, type Plan, type ResolvedPlan } from '../../src/engine';
import { advise, coldAdvice } from '../../src/domain/advice/advice';
import { warningsOf } from '../../src/domain/advice/advice-text';
import { coldCaution } from '../../src/domain/advice/cautions';
import { verdict } from '../../src/domain/forecasts/verdict';
import { forecastCsv } from '../../src/domain/forecasts/hourly-csv';
import { tempsInUnits } from '../../src/lib/units';
import { runWatchTask } from '../../src/server/workers/watch-task';

function resolve(plan: Plan): ResolvedPlan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

/** An invented frosty weekend: a LiFePO4 bank outside, a furnace blower at 18 °C, lows of −14 °C. */
const frost: Plan = {
  bank: { chemistry: 'lifepo4', capacityAh: 150, floorSocPct: 10 },
  arrays: [{ name: 'Roof', ratedWatts: 400 }],
  loads: [
    { name: 'Furnace blower', watts: 60, response: 'heating', setpointC: 18, windows: [[18, 8]], dutyPct: 40 },
    { name: 'Standby', watts: 13 },
  ],
  stops: [
    {
      name: 'Frost camp',
      lat: 39,
      lon: -106,
      timeZone: 'America/Denver',
      arrive: '2027-11-20',
      nights: 2,
      weather: [{ date: '2027-11-20', cloudOktas: 1, highC: -2, lowC: -14 }],
    },
  ],
};

/** The same rig on a stop with no weather at all: the engine assumes its typical day (20 °C / 10 °C). */
const unknownSkies: Plan = { ...frost, loads: [{ name: 'Standby', watts: 13 }], stops: [{ ...frost.stops[0]!, weather: [] }] };

describe('temperatures in the forecast’s words follow the units setting', () => {
  const plan = resolve(frost);
  const f = forecast(plan);

  it('the cold warning and its caution say 32 °F for imperial, 0 °C for metric', () => {
    const cold = (u: 'metric' | 'imperial') => warningsOf(f, u).find((w) => w.code === 'cold-charge-blocked')!;
    expect(cold('imperial').message).toContain('below 32 °F');
    expect(cold('imperial').message).not.toContain('°C');
    expect(cold('imperial').caution).toBe(coldCaution('imperial'));
    expect(coldCaution('imperial')).toContain('(32 °F)');
    expect(cold('metric').message).toContain('below 0 °C');
    // The default stays metric for callers that do not know the reader.
    expect(warningsOf(f)).toEqual(warningsOf(f, 'metric'));
  });

  it('the furnace fix speaks in °F: 5 °F lower, 59 °F instead of 64 °F', () => {
    const fix = coldAdvice(plan, f, 10, 'imperial')!.fixes.find((x) => x.kind === 'setpoint')!;
    expect(fix.title).toBe('Set the heating 5 °F lower');
    expect(fix.detail).toContain('Furnace blower at 59 °F instead of 64 °F');
    const self = coldAdvice(plan, f, 10, 'imperial')!.fixes.find((x) => x.kind === 'self-heating')!;
    expect(self.detail).toContain('below 32 °F');
    const all = JSON.stringify(advise(plan, f, 10, 'imperial'), (k, v) => (k === 'forecast' ? undefined : v));
    expect(all).not.toMatch(/°C/);
  });

  it('assumed weather is stated as a high of 68 °F and a low of 50 °F, in the warning and the verdict', () => {
    const g = forecast(resolve(unknownSkies));
    const w = warningsOf(g, 'imperial').find((x) => x.code === 'weather-assumed')!;
    expect(w.message).toContain('a high of 68 °F and a low of 50 °F');
    const v = verdict(g, resolve(unknownSkies), null, 'imperial');
    expect(v.status).toBe('weather-assumed');
    expect(v.detail).toContain('68 °F by day, 50 °F at night');
    expect(v.detail).not.toContain('°C');
  });

  it('the CSV names its temperature columns in °F and converts every row', () => {
    const [header, ...rows] = forecastCsv(f, 'imperial').trim().split('\r\n');
    const cols = header!.split(',');
    expect(cols).toContain('ambientF');
    expect(cols).toContain('batteryF');
    expect(cols).not.toContain('ambientC');
    const metricRows = forecastCsv(f, 'metric').trim().split('\r\n').slice(1);
    const a = cols.indexOf('ambientF');
    for (let i = 0; i < rows.length; i += 7) {
      const c = Number(metricRows[i]!.split(',')[a]);
      expect(Number(rows[i]!.split(',')[a])).toBeCloseTo((c * 9) / 5 + 32, 1);
    }
  });
});

describe('tempsInUnits: catalogue notes written in °C, read in the user’s units', () => {
  it('turns each reading into °F and leaves rates per °C alone', () => {
    // 4 °C = 39.2 °F → 39 °F; 20 °C = 68 °F; 25 °C = 77 °F; −18 °C = −0.4 °F → 0 °F.
    expect(tempsInUnits('a thermostat near 4 °C; 45 % of the time at 20 °C, about half at 25 °C', 'imperial')).toBe('a thermostat near 39 °F; 45 % of the time at 68 °F, about half at 77 °F');
    expect(tempsInUnits('down to −18 °C', 'imperial')).toBe('down to 0 °F');
    expect(tempsInUnits('3 % per °C above 20 °C', 'imperial')).toBe('3 % per °C above 68 °F');
    expect(tempsInUnits('near 4 °C', 'metric')).toBe('near 4 °C');
  });
});

describe('the trip watch e-mail’s advice for someone who chose °F', () => {
  it('works the advice out again in °F when it names a temperature, and keeps one list when it names none', () => {
    // An invented cabin-bank weekend whose advice names the furnace setpoint (found by trying a few sizes).
    const cabin: Plan = {
      bank: { chemistry: 'lifepo4', capacityAh: 100, floorSocPct: 10, location: 'cabin' },
      arrays: [{ name: 'Roof', ratedWatts: 200 }],
      loads: [{ name: 'Furnace blower', watts: 80, response: 'heating', setpointC: 18, windows: [[0, 24]], dutyPct: 40 }, { name: 'Standby', watts: 13 }],
      stops: [{ name: 'Frost camp', lat: 39, lon: -106, timeZone: 'America/Denver', arrive: '2027-11-20', nights: 3, weather: [{ date: '2027-11-20', cloudOktas: 4, highC: 8, lowC: -4 }] }],
    };
    const cold = runWatchTask({ plan: cabin, reserveSocPct: null, from: null });
    if (!cold.ok) throw new Error(cold.message);
    expect(cold.advice.join('\n')).toContain('°C');
    expect(cold.adviceImperial.join('\n')).toContain('°F');
    expect(cold.adviceImperial.join('\n')).not.toContain('°C');
    const mild = runWatchTask({ plan: { ...unknownSkies, stops: [{ ...unknownSkies.stops[0]!, weather: [{ date: '2027-11-20', cloudOktas: 2, highC: 24, lowC: 12 }] }] }, reserveSocPct: null, from: null });
    if (!mild.ok) throw new Error(mild.message);
    expect(mild.advice.join('\n')).not.toContain('°C');
    expect(mild.adviceImperial).toBe(mild.advice);
  });
});
