// The plan schema: defaults, limits, cross-field rules and the contract's error envelope.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { demoPlan, runForecast, validatePlan, type Plan } from '../../../src/engine/index';
import { basePlan } from '../../reference/plan-helpers';

type Mutable = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

function refuse(mutate: (p: Mutable) => void) {
  const p = structuredClone(demoPlan()) as Mutable;
  mutate(p);
  const v = validatePlan(p);
  if (v.ok) throw new Error('expected the plan to be refused');
  return v.envelope;
}

describe('defaults (forecast-engine.md defaults table, Revision 2)', () => {
  // Revision 2: LiFePO4 Peukert 1.02 (was 1.05); resistance in mΩ per 100 Ah; location outside; thermalHours 6.
  it.each([
    ['lifepo4', 12.8, 10, 150, 1.02, 99, 8],
    ['agm', 12, 50, 60, 1.12, 92, 12],
    ['gel', 12, 50, 60, 1.12, 90, 15],
    ['flooded', 12, 50, 60, 1.25, 85, 15],
  ] as const)('%s: nominal %f V, floor %f %%, max charge %f A (of 300 Ah), Peukert %f, efficiency %f %%, %f mΩ', (chem, volts, floor, amps, k, eff, mohm) => {
    const v = validatePlan(basePlan({ bank: { chemistry: chem, capacityAh: 300 } }));
    if (!v.ok) throw new Error('invalid');
    expect(v.plan.bank).toEqual({
      chemistry: chem,
      nominalVolts: volts,
      capacityAh: 300,
      initialSocPct: 100,
      floorSocPct: floor,
      cutoffVolts: null,
      maxChargeAmps: amps,
      peukertExponent: k,
      chargeEfficiencyPct: eff,
      internalResistanceMilliohm: mohm,
      insideHeatedSpace: false,
      selfHeating: false,
      location: 'outside',
      thermalHours: 6,
    });
  });

  it('bank location: insideHeatedSpace is read as "cabin"; location wins when both are given', () => {
    const bankOf = (bank: Record<string, unknown>) => {
      const v = validatePlan(basePlan({ bank: { chemistry: 'agm', capacityAh: 100, ...bank } }));
      if (!v.ok) throw new Error('invalid');
      return v.plan.bank;
    };
    expect(bankOf({ insideHeatedSpace: true }).location).toBe('cabin');
    expect(bankOf({ insideHeatedSpace: true, location: 'outside' }).location).toBe('outside');
    expect(bankOf({ location: 'cabin' }).location).toBe('cabin');
    expect(bankOf({}).location).toBe('outside');
  });

  it('a stop without a name is "Stop N" (Revision 2), like arrays and loads', () => {
    const p = basePlan();
    const stop = { ...p.stops[0]! } as Record<string, unknown>;
    delete stop.name;
    const v = validatePlan({ ...p, stops: [stop] });
    if (!v.ok) throw new Error(JSON.stringify(v.envelope));
    expect(v.plan.stops[0]!.name).toBe('Stop 1');
  });

  it('fills array, charger, inverter, load and stop defaults', () => {
    const v = validatePlan({
      bank: { chemistry: 'lifepo4', capacityAh: 100 },
      arrays: [{ ratedWatts: 200 }],
      chargers: [{ kind: 'generator', amps: 30 }],
      loads: [{ name: 'Fridge', watts: 45 }],
      stops: [{ name: 'Camp', lat: 35, lon: -111, timeZone: 'America/Phoenix', arrive: '2027-06-10', nights: 1 }],
    });
    if (!v.ok) throw new Error(JSON.stringify(v.envelope));
    expect(v.plan.arrays[0]).toEqual({
      name: 'Array 1',
      ratedWatts: 200,
      tiltDeg: 0,
      azimuthDeg: 180,
      aim: 'fixed',
      tempCoeffPctPerC: -0.4,
      nocC: 45,
      lossesPct: 14,
      controller: 'mppt',
      controllerEfficiencyPct: 97,
      controllerMaxAmps: null,
      shadePct: 0,
    });
    expect(v.plan.chargers[0]).toEqual({ kind: 'generator', amps: 30, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 });
    expect(v.plan.inverter).toEqual({ efficiencyPct: 90, idleWatts: 12, alwaysOn: false, continuousWatts: null, surgeWatts: null });
    expect(v.plan.loads[0]).toEqual({ name: 'Fridge', watts: 45, quantity: 1, supply: 'dc', windows: [[0, 24]], dutyPct: 100, days: 'all', response: 'none', setpointC: 18, location: 'cabin', surgeWatts: null });
    expect(v.plan.stops[0]).toMatchObject({ arriveHour: 15, shadePct: 0, hookup: 'none', generatorHours: [8, 20], weather: [] });
    expect(v.plan.drives).toEqual([]);
  });

  it('the demo plan is valid', () => {
    expect(validatePlan(demoPlan()).ok).toBe(true);
  });
});

describe('refusals name the field with a dot path', () => {
  it.each<[string, (p: Mutable) => void, string]>([
    ['capacity 0', (p) => (p.bank.capacityAh = 0), 'bank.capacityAh'],
    ['capacity as text', (p) => (p.bank.capacityAh = '300'), 'bank.capacityAh'],
    ['capacity missing', (p) => delete p.bank.capacityAh, 'bank.capacityAh'],
    ['unknown chemistry', (p) => (p.bank.chemistry = 'nicad'), 'bank.chemistry'],
    ['SOC above 100', (p) => (p.bank.initialSocPct = 120), 'bank.initialSocPct'],
    ['latitude 91', (p) => (p.stops[0].lat = 91), 'stops.0.lat'],
    ['longitude −181', (p) => (p.stops[1].lon = -181), 'stops.1.lon'],
    ['bad zone', (p) => (p.stops[0].timeZone = 'Mars/Olympus_Mons'), 'stops.0.timeZone'],
    ['bad date', (p) => (p.stops[0].arrive = '2027-02-30'), 'stops.0.arrive'],
    ['date format', (p) => (p.stops[0].arrive = '10/21/2027'), 'stops.0.arrive'],
    ['fractional nights', (p) => (p.stops[0].nights = 2.5), 'stops.0.nights'],
    ['arriveHour 24', (p) => (p.stops[0].arriveHour = 24), 'stops.0.arriveHour'],
    ['oktas 9', (p) => (p.stops[0].weather[1].cloudOktas = 9), 'stops.0.weather.1.cloudOktas'],
    ['high below low', (p) => (p.stops[0].weather[0].highC = -10), 'stops.0.weather.0.highC'],
    ['weather day twice', (p) => p.stops[0].weather.push({ ...p.stops[0].weather[0] }), 'stops.0.weather.4.date'],
    ['stops out of order', (p) => (p.stops[1].arrive = '2027-10-20'), 'stops.1.arrive'],
    ['stops overlapping', (p) => (p.stops[1].arrive = '2027-10-23'), 'stops.1.arrive'],
    ['load window hour 25', (p) => (p.loads[1].windows = [[6, 25]]), 'loads.1.windows.0.1'],
    ['negative watts', (p) => (p.loads[0].watts = -5), 'loads.0.watts'],
    ['two generators', (p) => (p.chargers = [{ kind: 'generator', amps: 10 }, { kind: 'generator', amps: 20 }]), 'chargers.1.kind'],
    ['generator start ≥ stop', (p) => (p.chargers = [{ kind: 'generator', amps: 10, startSocPct: 80, stopSocPct: 80 }]), 'chargers.0.startSocPct'],
    ['generator hours backwards', (p) => (p.stops[0].generatorHours = [20, 8]), 'stops.0.generatorHours'],
    ['drive before the trip', (p) => (p.drives = [{ date: '2027-10-20', startHour: 9, hours: 2 }]), 'drives.0.date'],
    ['drive starting after the trip (Revision 2: a drive must start inside it)', (p) => (p.drives = [{ date: '2027-10-26', startHour: 11, hours: 3 }]), 'drives.0.date'],
    ['generator hours across midnight (Revision 2)', (p) => (p.stops[0].generatorHours = [22, 6]), 'stops.0.generatorHours'],
    ['trip across the date line (Revision 2) names the later stop', (p) => ((p.stops[0].lon = 179), (p.stops[1].lon = -179)), 'stops.1.lon'],
    ['bank location elsewhere', (p) => (p.bank.location = 'roof'), 'bank.location'],
    ['load location elsewhere', (p) => (p.loads[0].location = 'roof'), 'loads.0.location'],
    ['weather hour 24', (p) => (p.stops[0].weather[0].hourly = [{ hour: 24, ghiWm2: 100 }]), 'stops.0.weather.0.hourly.0.hour'],
    ['weather hour given twice', (p) => (p.stops[0].weather[0].hourly = [{ hour: 12, ghiWm2: 100 }, { hour: 12, tempC: 3 }]), 'stops.0.weather.0.hourly.1.hour'],
    ['weather source unknown', (p) => (p.stops[0].weather[0].source = 'guess'), 'stops.0.weather.0.source'],
    ['drive hours fractional', (p) => (p.drives = [{ date: '2027-10-24', startHour: 9, hours: 1.5 }]), 'drives.0.hours'],
    ['array ratedWatts infinite-ish', (p) => (p.arrays[0].ratedWatts = 1e12), 'arrays.0.ratedWatts'],
    ['array tilt 100', (p) => (p.arrays[0].tiltDeg = 100), 'arrays.0.tiltDeg'],
  ])('%s → %s', (_name, mutate, path) => {
    const env = refuse(mutate);
    expect(env.error.code).toBe('invalid_plan');
    expect(env.issues.map((i) => i.path)).toContain(path);
    expect(env.error.message).toContain(env.issues[0]!.message);
    for (const i of env.issues) expect(i.message.length).toBeGreaterThan(3);
  });

  it.each<[string, (p: Mutable) => void, string]>([
    ['31 stops', (p) => (p.stops = Array.from({ length: 31 }, (_, i) => ({ ...p.stops[0], arrive: `2027-${String(1 + Math.floor(i / 28)).padStart(2, '0')}-${String(1 + (i % 28)).padStart(2, '0')}`, nights: 1, weather: [] }))), 'stops'],
    ['11 arrays', (p) => (p.arrays = Array.from({ length: 11 }, () => ({ ratedWatts: 100 }))), 'arrays'],
    ['201 loads', (p) => (p.loads = Array.from({ length: 201 }, () => ({ watts: 1 }))), 'loads'],
    ['61 days', (p) => (p.stops = [{ ...p.stops[0], nights: 61 }]), 'stops.0.nights'],
    ['60 nights arriving at midnight (60 × 24 h + 11 h)', (p) => (p.stops = [{ ...p.stops[0], nights: 60, arriveHour: 0, weather: [] }]), 'stops.0.nights'],
  ])('limit: %s → %s', (_name, mutate, path) => {
    expect(refuse(mutate).issues.map((i) => i.path)).toContain(path);
  });

  it('60 nights arriving at 15:00 is within the 60-day span', () => {
    const p = structuredClone(demoPlan()) as Mutable;
    p.stops = [{ ...p.stops[0], nights: 60, weather: [] }];
    p.drives = [];
    expect(validatePlan(p).ok).toBe(true);
  });

  it('a non-object plan gets a root-level issue', () => {
    for (const input of [null, 'plan', 42, [], undefined]) {
      const r = runForecast(input);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.envelope.issues.length).toBeGreaterThan(0);
    }
  });

  it('never throws on arbitrary JSON, and always answers with a forecast or the envelope', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (input) => {
        const r = runForecast(input);
        if (!r.ok) {
          expect(r.envelope.error.code).toBe('invalid_plan');
          expect(Array.isArray(r.envelope.issues)).toBe(true);
        }
      }),
      { numRuns: 200 },
    );
  }, 30_000);

  it('never throws on a demo plan with one field replaced by arbitrary JSON', () => {
    const paths: string[][] = [['bank', 'capacityAh'], ['bank'], ['stops', '0', 'timeZone'], ['stops', '0', 'arrive'], ['stops', '1', 'weather'], ['loads', '0', 'windows'], ['drives'], ['chargers', '0'], ['arrays', '0', 'aim'], ['inverter']];
    fc.assert(
      fc.property(fc.constantFrom(...paths), fc.jsonValue(), (path, value) => {
        const p = structuredClone(demoPlan()) as Mutable;
        let o = p;
        for (const k of path.slice(0, -1)) o = o[k];
        o[path[path.length - 1]!] = value;
        const r = runForecast(p);
        if (!r.ok) expect(r.envelope.issues.length).toBeGreaterThan(0);
      }),
      { numRuns: 200 },
    );
  }, 30_000);
});

describe('types', () => {
  it('Plan accepts the contract example shape', () => {
    const p: Plan = {
      bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 300, initialSocPct: 100, floorSocPct: 10, cutoffVolts: null, maxChargeAmps: 150, peukertExponent: 1.05, chargeEfficiencyPct: 99, internalResistanceMilliohm: 8, insideHeatedSpace: false, selfHeating: false },
      arrays: [{ name: 'Roof', ratedWatts: 400, tiltDeg: 0, azimuthDeg: 180, aim: 'fixed', tempCoeffPctPerC: -0.4, nocC: 45, lossesPct: 14, controller: 'mppt', controllerEfficiencyPct: 97, controllerMaxAmps: 40, shadePct: 0, vmpVolts: 18 }],
      chargers: [{ kind: 'alternator', amps: 30, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 }],
      inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false },
      loads: [{ name: 'Fridge', watts: 45, quantity: 1, supply: 'dc', windows: [[0, 24]], dutyPct: 40, days: 'all', response: 'none', setpointC: 18 }],
      stops: [{ name: 'Mesa camp', lat: 35.6, lon: -105.9, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 3, arriveHour: 15, shadePct: 10, hookup: 'none', generatorHours: [8, 20], weather: [{ date: '2027-10-21', cloudOktas: 2, highC: 18, lowC: -2 }] }],
      drives: [{ date: '2027-10-24', startHour: 9, hours: 2 }],
    };
    // Revision 2: the contract example's drive (2027-10-24 09:00 for 4 h) starts before the 11:00 end of
    // this one-stop trip; the hours past the end are ignored, so it is accepted.
    expect(validatePlan(p).ok).toBe(true);
    expect(validatePlan({ ...p, drives: [{ date: '2027-10-24', startHour: 9, hours: 4 }] }).ok).toBe(true);
    expect(validatePlan({ ...p, drives: [{ date: '2027-10-24', startHour: 11, hours: 1 }] }).ok).toBe(false);
  });
});
