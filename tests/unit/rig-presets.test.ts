import { describe, expect, it } from 'vitest';
import { CHEMISTRIES, CHEMISTRY_DEFAULTS, bankSchema } from '../../src/engine';
import { applyMounting, CHEMISTRY_PRESETS, maxChargeAmpsFor, mountingOf, nominalForChemistry, presetBank, seriesParallel } from '../../src/domain/rigs/presets';
import { emptyRig, newArray, newCharger, rigFormSchema } from '../../src/domain/rigs/rig-form';
import { at } from '../../src/lib/invariant';

describe('series/parallel helper', () => {
  // product.md demo rig: "two 6 V flooded golf-cart batteries (225 Ah at 12 V)".
  it('puts two 6 V 225 Ah batteries in series at 12 V 225 Ah', () => {
    expect(seriesParallel({ batteryVolts: 6, batteryAh: 225, inSeries: 2, parallelStrings: 1 })).toEqual({ nominalVolts: 12, capacityAh: 225, batteries: 2 });
  });

  it('adds amp-hours for strings in parallel', () => {
    expect(seriesParallel({ batteryVolts: 6, batteryAh: 225, inSeries: 2, parallelStrings: 2 })).toEqual({ nominalVolts: 12, capacityAh: 450, batteries: 4 });
    expect(seriesParallel({ batteryVolts: 12.8, batteryAh: 100, inSeries: 1, parallelStrings: 3 })).toEqual({ nominalVolts: 12.8, capacityAh: 300, batteries: 3 });
    expect(seriesParallel({ batteryVolts: 12.8, batteryAh: 100, inSeries: 2, parallelStrings: 1 })).toEqual({ nominalVolts: 25.6, capacityAh: 100, batteries: 2 });
  });

  it.each([
    { batteryVolts: 0, batteryAh: 100, inSeries: 1, parallelStrings: 1 },
    { batteryVolts: 12, batteryAh: Number.NaN, inSeries: 1, parallelStrings: 1 },
    { batteryVolts: 12, batteryAh: 100, inSeries: 1.5, parallelStrings: 1 },
    { batteryVolts: 12, batteryAh: 100, inSeries: 1, parallelStrings: 0 },
  ])('gives no bank for %j', (input) => {
    expect(seriesParallel(input)).toBeNull();
  });
});

describe('chemistry presets', () => {
  it('take the engine defaults for every chemistry', () => {
    for (const c of CHEMISTRIES) {
      const p = presetBank(c, { capacityAh: 200 });
      expect(p.floorSocPct).toBe(CHEMISTRY_DEFAULTS[c].floorSocPct);
      expect(p.peukertExponent).toBe(CHEMISTRY_DEFAULTS[c].peukertExponent);
      expect(p.chargeEfficiencyPct).toBe(CHEMISTRY_DEFAULTS[c].chargeEfficiencyPct);
      expect(p.maxChargeAmps).toBe(Math.round(CHEMISTRY_DEFAULTS[c].maxChargeC * 200));
      // Every preset is a valid bank for the shared schema.
      expect(bankSchema.safeParse({ chemistry: c, capacityAh: 200, ...p }).success).toBe(true);
    }
  });

  // trade-notes.md, Batteries: "LiFePO4 BMS ~2.5 V/cell = 10.0 V [spec]; inverters 10.5 V default [spec]";
  // planning depth of discharge [cp]: flooded and AGM ~50 %, LiFePO4 ~80 % (floor 10–20 %).
  it('uses the trade cutoffs and usable floors', () => {
    expect(CHEMISTRY_PRESETS.lifepo4.cutoffVolts).toBe(10);
    expect(CHEMISTRY_PRESETS.agm.cutoffVolts).toBe(10.5);
    expect(CHEMISTRY_PRESETS.flooded.floorSocPct).toBe(50);
    expect(CHEMISTRY_PRESETS.lifepo4.floorSocPct).toBeLessThanOrEqual(20);
  });

  it('scales the cutoff with the bank voltage', () => {
    expect(presetBank('lifepo4', { nominalVolts: 25.6 }).cutoffVolts).toBe(20);
    expect(presetBank('agm', { nominalVolts: 24 }).cutoffVolts).toBe(21);
    expect(presetBank('agm').nominalVolts).toBe(12);
  });

  it('leaves max charge current empty until there is a capacity', () => {
    expect(presetBank('lifepo4').maxChargeAmps).toBeUndefined();
    expect(maxChargeAmpsFor('lifepo4', 300)).toBe(150);
    expect(maxChargeAmpsFor('flooded', 225)).toBe(45);
  });

  it('keeps the voltage class when the chemistry changes', () => {
    expect(nominalForChemistry('agm', 12.8)).toBe(12);
    expect(nominalForChemistry('lifepo4', 24)).toBe(25.6);
    expect(nominalForChemistry('agm', 51.2)).toBe(48);
    expect(nominalForChemistry('lifepo4', undefined)).toBe(12.8);
    expect(nominalForChemistry('lifepo4', Number.NaN)).toBe(12.8);
  });
});

describe('panel mounting', () => {
  it('reads flat, tilted and portable from tilt and aim', () => {
    expect(mountingOf({ tiltDeg: 0, aim: 'fixed' })).toBe('flat');
    expect(mountingOf({ tiltDeg: 35, aim: 'fixed' })).toBe('tilted');
    expect(mountingOf({ tiltDeg: 30, aim: 'follow' })).toBe('portable');
  });

  it('sets tilt and aim from a mounting choice (forecast-engine.md: flat on the roof is tilt 0; re-aimed is aim follow)', () => {
    expect(applyMounting('flat', { tiltDeg: 35, azimuthDeg: 135 })).toEqual({ tiltDeg: 0, azimuthDeg: 180, aim: 'fixed' });
    expect(applyMounting('tilted', { tiltDeg: 0 })).toEqual({ tiltDeg: 30, azimuthDeg: 180, aim: 'fixed' });
    expect(applyMounting('tilted', { tiltDeg: 45, azimuthDeg: 0 })).toEqual({ tiltDeg: 45, azimuthDeg: 0, aim: 'fixed' });
    expect(applyMounting('portable', { tiltDeg: 0 })).toMatchObject({ aim: 'follow', tiltDeg: 30 });
  });
});

describe('rig form rules', () => {
  const valid = () => {
    const r = emptyRig();
    r.name = 'Van';
    r.bank.capacityAh = 300;
    r.arrays = [{ ...newArray('roof', 0), ratedWatts: 400 }];
    r.chargers = [{ ...newCharger('alternator'), amps: 30 }];
    return r;
  };

  it('accepts a described rig', () => {
    expect(rigFormSchema.safeParse(valid()).success).toBe(true);
  });

  it('names the missing capacity and rated watts', () => {
    const r = valid();
    r.bank.capacityAh = undefined as unknown as number;
    at(r.arrays ?? [], 0, 'panel array').ratedWatts = Number.NaN;
    const res = rigFormSchema.safeParse(r);
    expect(res.success).toBe(false);
    const paths = res.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toContain('bank.capacityAh');
    expect(paths).toContain('arrays.0.ratedWatts');
  });

  it('allows one generator, starting below its stop level, and says so even when other fields are wrong', () => {
    const r = valid();
    r.name = '';
    r.chargers = [
      { ...newCharger('generator'), amps: 40, startSocPct: 80, stopSocPct: 60 },
      { ...newCharger('generator'), amps: 40 },
    ];
    const issues = rigFormSchema.safeParse(r).error!.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    expect(issues).toContain('chargers.0.stopSocPct: must be above the start level');
    expect(issues.some((i) => i.startsWith('chargers.1.kind: A rig has at most one generator'))).toBe(true);
    expect(issues.some((i) => i.startsWith('name:'))).toBe(true);
  });
});
