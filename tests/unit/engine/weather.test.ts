// Weather fallback rules and their warnings (forecast-engine.md, "Weather and temperature").
import { describe, expect, it } from 'vitest';
import { resolveStopWeather } from '../../../src/engine/weather';
import { dayNumber } from '../../../src/engine/tz';
import { basePlan, run } from '../../reference/plan-helpers';

const day = (s: string) => dayNumber(s);
const w = (date: string, highC: number) => ({ date, cloudOktas: 2, highC, lowC: highC - 10 });

describe('resolveStopWeather', () => {
  const owned = ['2027-06-10', '2027-06-11', '2027-06-12', '2027-06-13'].map(day);

  it('uses the given day, else the nearest by whole days, ties to the earlier', () => {
    const r = resolveStopWeather([w('2027-06-10', 20), w('2027-06-12', 30)], owned);
    expect(r.byDay.get(day('2027-06-10'))?.highC).toBe(20);
    expect(r.byDay.get(day('2027-06-11'))?.highC).toBe(20); // 1 day either side: the earlier
    expect(r.byDay.get(day('2027-06-12'))?.highC).toBe(30);
    expect(r.byDay.get(day('2027-06-13'))?.highC).toBe(30);
    for (const d of owned) expect(r.byDay.get(d)?.assumed).toBe(false);
  });

  it('falls back to 4 oktas, 20 °C, 10 °C when nothing usable is given', () => {
    const r = resolveStopWeather([], owned);
    for (const d of owned) expect(r.byDay.get(d)).toEqual({ cloudOktas: 4, highC: 20, lowC: 10, assumed: true });
  });

  it('ignores given days the stop owns no hour of, and does not use them as the nearest day', () => {
    const r = resolveStopWeather([w('2027-07-01', 35), w('2027-06-30', 33)], owned);
    expect(r.ignoredDates).toEqual(['2027-06-30', '2027-07-01']);
    expect(r.byDay.get(day('2027-06-13'))?.assumed).toBe(true);
  });
});

describe('warnings in the forecast', () => {
  it('weather-assumed: once per stop and date, at its first row, in plain English', () => {
    const f = run(basePlan({ stop: { weather: [] } }));
    const assumed = f.warnings.filter((x) => x.code === 'weather-assumed');
    expect(assumed.map((x) => x.at)).toEqual(['2027-06-10T15:00-07:00', '2027-06-11T00:00-07:00', '2027-06-12T00:00-07:00']);
    expect(assumed[0]!.message).toBe('No weather given for Test camp on 2027-06-10: assumed partly cloudy skies (4 oktas), a high of 20 °C and a low of 10 °C.');
    expect(f.hourly.find((h) => h.time === '2027-06-11T04:00-07:00')?.ambientC).toBe(10);
  });

  it('no warning when the nearest given day fills a gap', () => {
    const f = run(basePlan({ stop: { weather: [w('2027-06-10', 25)] } }));
    expect(f.warnings.filter((x) => x.code.startsWith('weather'))).toEqual([]);
    expect(f.hourly.find((h) => h.time === '2027-06-12T04:00-07:00')?.ambientC).toBe(15);
  });

  it('weather-ignored: one warning per stop listing the days, at the stop\'s first row', () => {
    const f = run(basePlan({ stop: { weather: [w('2027-06-10', 25), w('2027-06-20', 25), w('2027-05-01', 25)] } }));
    const ignored = f.warnings.filter((x) => x.code === 'weather-ignored');
    expect(ignored).toHaveLength(1);
    expect(ignored[0]!.at).toBe('2027-06-10T15:00-07:00');
    expect(ignored[0]!.message).toContain('2027-05-01, 2027-06-20');
  });

  it('warnings are ordered by time', () => {
    const f = run(basePlan({ stop: { weather: [] } }));
    const at = f.warnings.map((x) => Date.parse(x.at));
    expect([...at].sort((a, b) => a - b)).toEqual(at);
  });
});
