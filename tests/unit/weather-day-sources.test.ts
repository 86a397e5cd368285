// The per-day badge says what the engine really uses for each day: when the weather service is
// down, a stop with one typed day has its other days copied from the nearest typed day (the
// engine's rule), and only a stop with no weather at all runs on assumed skies. The verdict is
// never a green "Makes it" while a day is assumed, whether or not the forecast kept its sources.
import { describe, expect, it } from 'vitest';
import { forecast, validatePlan, type Plan } from '../../src/engine/index';
import { mergeStop, type StopLike } from '../../src/domain/weather/weather';
import { verdict } from '../../src/domain/forecasts/verdict';

const typed = (date: string, cloudOktas = 0) => ({ date, cloudOktas, highC: 25, lowC: 18 });

/** Stops of a trip in one zone, four nights each, the second arriving as the first leaves. */
function stops(weather: ReturnType<typeof typed>[][]): StopLike[] {
  return weather.map((w, i) => ({
    name: `Camp ${i + 1}`,
    lat: 35 + i,
    lon: -106,
    timeZone: 'America/Denver',
    arrive: `2027-10-${String(21 + i * 4).padStart(2, '0')}`,
    nights: 4,
    weather: w,
  }));
}

/** The engine's own view: which stop-days it reports as assumed (its `weather-assumed` warnings). */
function engineAssumed(trip: StopLike[]): string[] {
  const v = validatePlan({ bank: { chemistry: 'lifepo4', capacityAh: 300 }, loads: [{ name: 'Light', watts: 10 }], stops: trip } as Plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return forecast(v.plan)
    .warnings.filter((w) => w.code === 'weather-assumed')
    .map((w) => `${/for (Camp \d)/.exec(w.message)![1]} ${/\d{4}-\d{2}-\d{2}/.exec(w.message)![0]}`)
    .sort();
}

/** The badges with the service down (nothing fetched): only typed days and what follows from them. */
function badges(trip: StopLike[]) {
  return trip.map((_, i) => mergeStop(trip, i, [], []));
}

describe('per-day sources with the service down', () => {
  it("a stop's untyped days are copied from its nearest typed day, ties to the earlier day, as the engine does", () => {
    const trip = stops([[typed('2027-10-22'), typed('2027-10-24', 6)], []]);
    const [first] = badges(trip);
    expect(first!.days).toEqual([
      { date: '2027-10-21', source: 'copied', from: '2027-10-22', fromSource: 'typed' },
      { date: '2027-10-22', source: 'typed' },
      // The 23rd is one day from both the 22nd and the 24th: the earlier wins.
      { date: '2027-10-23', source: 'copied', from: '2027-10-22', fromSource: 'typed' },
      { date: '2027-10-24', source: 'typed' },
      // The 25th is the next stop's arrival day (15:00): the first stop still owns its morning.
      { date: '2027-10-25', source: 'copied', from: '2027-10-24', fromSource: 'typed' },
    ]);
  });

  it('"assumed" on exactly the stop-days the engine assumes', () => {
    for (const w of [
      [[typed('2027-10-23')], []],
      [[], []],
      [[typed('2027-10-21')], [typed('2027-10-27')]],
      [[], [typed('2027-10-29')]],
    ]) {
      const trip = stops(w);
      const ours = badges(trip)
        .flatMap((s) => s.days.filter((d) => d.source === 'assumed').map((d) => `${s.name} ${d.date}`))
        .sort();
      expect(ours).toEqual(engineAssumed(trip));
    }
    // And the check is not vacuous: a stop without weather is assumed on each of its days.
    expect(engineAssumed(stops([[typed('2027-10-23')], []]))).toHaveLength(5);
  });
});

describe('the verdict and assumed days', () => {
  it('is not a green "Makes it" when the engine assumed a day, even without saved sources', () => {
    const trip = stops([[typed('2027-10-23')], []]);
    const v = validatePlan({ bank: { chemistry: 'lifepo4', capacityAh: 300 }, loads: [{ name: 'Light', watts: 10 }], stops: trip } as Plan);
    if (!v.ok) throw new Error();
    const f = forecast(v.plan);
    expect(f.summary.firstCutoffAt).toBeNull();
    const said = verdict(f, v.plan);
    expect(said.status).toBe('weather-assumed');
    expect(said.headline).toMatch(/^Not sure yet — 5 days have no real weather/);
  });

  it('is "Makes it" when every day has weather, typed or copied from a typed day', () => {
    const trip = stops([[typed('2027-10-23')], [typed('2027-10-27')]]);
    const v = validatePlan({ bank: { chemistry: 'lifepo4', capacityAh: 300 }, loads: [{ name: 'Light', watts: 10 }], stops: trip } as Plan);
    if (!v.ok) throw new Error();
    expect(verdict(forecast(v.plan), v.plan).status).toBe('makes-it');
  });
});
