// The weather's part of a trip prepared once for many load lists and banks (the server's sky
// cache): a sky made from one plan serves another plan with other loads, bank, chargers, inverter
// and rated watts exactly as that plan's own preparation would, and refuses a plan in other
// weather, shade or panels, or a sun of another trip.
import { describe, expect, it } from 'vitest';
import {
  demoPlan,
  forecast,
  prepareSky,
  prepareSun,
  prepareWithSky,
  simulatePrepared,
  toForecast,
  type Plan,
} from '../../../src/engine/index';
import { resolved } from '../../reference/plan-helpers';

/** The demo trip with other loads, a lead-acid bank, a shore charger, another inverter and bigger panels. */
function otherRig(p: Plan): Plan {
  return {
    ...p,
    bank: { chemistry: 'agm', capacityAh: 220, initialSocPct: 80 },
    chargers: [
      { kind: 'alternator', amps: 20 },
      { kind: 'shore', amps: 15 },
    ],
    inverter: { efficiencyPct: 85, idleWatts: 20, alwaysOn: true, continuousWatts: 600, surgeWatts: 1200 },
    arrays: (p.arrays ?? []).map((a) => ({ ...a, ratedWatts: a.ratedWatts * 2, controllerMaxAmps: 40 })),
    loads: [...(p.loads ?? []).slice(2), { name: 'Kettle', watts: 900, supply: 'ac', windows: [[7, 8]], dutyPct: 20, surgeWatts: 1000 }],
  };
}

describe('prepared sky', () => {
  it('a sky made from one plan gives a plan with another rig in the same trip and weather the same forecast as its own', () => {
    const a = resolved(demoPlan());
    const b = resolved(otherRig(demoPlan()));
    const sun = prepareSun(a);
    const sky = prepareSky(sun, a);
    const viaA = prepareWithSky(sun, sky, b);
    expect(JSON.stringify(toForecast(viaA, simulatePrepared(viaA)))).toBe(JSON.stringify(forecast(b)));
    // And the rig made a difference, so the test can tell a stale answer.
    expect(JSON.stringify(forecast(b).summary)).not.toBe(JSON.stringify(forecast(a).summary));
  });

  it('refuses a plan in other weather, shade or panels, and a sky made on another trip’s sun', () => {
    const base = demoPlan();
    const a = resolved(base);
    const sun = prepareSun(a);
    const sky = prepareSky(sun, a);
    const others: Plan[] = [
      { ...base, stops: base.stops.map((s) => ({ ...s, weather: (s.weather ?? []).map((w) => ({ ...w, highC: w.highC + 1 })) })) },
      { ...base, stops: base.stops.map((s) => ({ ...s, shadePct: 30 })) },
      { ...base, arrays: (base.arrays ?? []).map((x) => ({ ...x, nocC: 50 })) },
    ];
    for (const o of others) expect(() => prepareWithSky(sun, sky, resolved(o))).toThrow(RangeError);
    const moved = resolved({ ...base, stops: base.stops.map((s) => ({ ...s, lat: s.lat - 3 })) });
    const movedSun = prepareSun(moved);
    expect(() => prepareWithSky(movedSun, sky, moved)).toThrow(RangeError);
    expect(() => prepareSky(movedSun, a)).toThrow(RangeError);
  });
});
