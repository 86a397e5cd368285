// Same plan → byte-identical JSON; the two-stage API equals a full forecast; the engine source
// stays pure (no clock, randomness or Node-only imports) so it bundles for the browser.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { demoPlan, forecast, prepareTrip, runForecast, simulatePrepared, toForecast, PlanValidationError, type Plan } from '../../../src/engine/index';
import { resolved } from '../../reference/plan-helpers';

const json = (p: unknown) => {
  const r = runForecast(p);
  if (!r.ok) throw new Error(JSON.stringify(r.envelope));
  return JSON.stringify(r.forecast);
};

describe('determinism', () => {
  it('the demo plan gives byte-identical JSON on every run', () => {
    const a = json(demoPlan());
    expect(json(demoPlan())).toBe(a);
    expect(json(JSON.parse(JSON.stringify(demoPlan())))).toBe(a);
  });

  it('prepareTrip + simulatePrepared + toForecast equals forecast()', () => {
    const p = resolved(demoPlan());
    const prepared = prepareTrip(p);
    expect(JSON.stringify(toForecast(prepared, simulatePrepared(prepared)))).toBe(JSON.stringify(forecast(p)));
    // A prepared trip is not changed by simulating it.
    simulatePrepared(prepared, { bank: { chemistry: 'agm', capacityAh: 50 } });
    expect(JSON.stringify(toForecast(prepared, simulatePrepared(prepared)))).toBe(JSON.stringify(forecast(p)));
  });

  it('numbers are rounded per the contract: watts whole, SOC 0.1, volts 0.01', () => {
    const r = runForecast(demoPlan());
    if (!r.ok) throw new Error();
    for (const h of r.forecast.hourly) {
      for (const k of ['solarWatts', 'chargeWatts', 'loadWatts', 'unmetWatts', 'curtailedWatts', 'poaWm2'] as const) expect(Number.isInteger(h[k])).toBe(true);
      expect(Math.round(h.socPct * 10) / 10).toBe(h.socPct);
      expect(Math.round(h.volts * 100) / 100).toBe(h.volts);
    }
  });
});

describe('variants equal the plan changed the same way', () => {
  const base = demoPlan();
  const p = resolved(base);
  const prepared = prepareTrip(p);
  const same = (variant: Parameters<typeof simulatePrepared>[1], changed: Plan) =>
    expect(JSON.stringify(toForecast(prepared, simulatePrepared(prepared, variant)))).toBe(JSON.stringify(forecast(resolved(changed))));

  it('bank', () => {
    const bank = { chemistry: 'agm' as const, capacityAh: 210, initialSocPct: 90 };
    same({ bank }, { ...base, bank });
  });

  it('array rated watts', () => {
    same({ arrayWatts: [800] }, { ...base, arrays: [{ ...base.arrays![0], ratedWatts: 800 }] });
  });

  it('array scale and charger amps', () => {
    same({ arrayScale: 1.5 }, { ...base, arrays: [{ ...base.arrays![0], ratedWatts: 600 }] });
    same({ chargerAmps: [45] }, { ...base, chargers: [{ kind: 'alternator', amps: 45 }] });
  });

  it('chargers', () => {
    const chargers = [{ kind: 'alternator' as const, amps: 60 }, { kind: 'generator' as const, amps: 40, startSocPct: 50, stopSocPct: 90 }];
    same({ chargers }, { ...base, chargers });
  });

  it('generator hours', () => {
    const chargers = [{ kind: 'generator' as const, amps: 40, startSocPct: 70, stopSocPct: 90 }];
    same({ chargers, generatorHours: [10, 14] }, { ...base, chargers, stops: base.stops.map((s) => ({ ...s, generatorHours: [10, 14] as [number, number] })) });
  });

  it('an invalid variant throws PlanValidationError with the envelope', () => {
    expect(() => simulatePrepared(prepared, { arrayWatts: [100, 200] })).toThrow(PlanValidationError);
    try {
      simulatePrepared(prepared, { bank: { chemistry: 'lifepo4', capacityAh: -1 } });
    } catch (e) {
      expect((e as PlanValidationError).envelope.issues[0]!.path).toBe('bank.capacityAh');
    }
  });
});

describe('purity of src/engine', () => {
  const dir = path.resolve(__dirname, '../../../src/engine');
  const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

  it.each(files)('%s uses no clock, randomness, Node-only module or global process', (file) => {
    const src = readFileSync(path.join(dir, file), 'utf8').replace(/\/\/.*$/gm, '');
    expect(src).not.toMatch(/Date\.now\s*\(/);
    expect(src).not.toMatch(/new Date\(\s*\)/);
    expect(src).not.toMatch(/Math\.random/);
    expect(src).not.toMatch(/performance\.now/);
    expect(src).not.toMatch(/from\s+['"]node:/);
    expect(src).not.toMatch(/from\s+['"](fs|path|os|crypto|child_process)['"]/);
    expect(src).not.toMatch(/\bprocess\./);
    expect(src).not.toMatch(/from\s+['"](astro|react|kysely|better-sqlite3)/);
  });
});
