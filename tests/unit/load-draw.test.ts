// Loads typed in amps: P = V × I at the load's own volts (the bank's nominal volts for DC, the
// outlet's 120 or 230 V for AC), stored as watts. Expectations worked by hand beside each.
import { describe, expect, it } from 'vitest';
import { ampsToWatts, bankAmpsOfAc, wattsToAmps } from '../../src/domain/loads/draw';
import { blankLoad, loadFormSchemaFor, loadToForm } from '../../src/domain/loads/load-form';
import { CATALOGUE, catalogueToLoad } from '../../src/domain/loads/catalogue';
import { bankLocationOf, bankToSave, emptyRig, rigFormSchema } from '../../src/domain/rigs/rig-form';

describe('draw in amps or watts', () => {
  it('DC amps at the bank’s nominal volts: 3 A × 12.8 V = 38.4 W; 2.5 A × 24 V = 60 W', () => {
    expect(ampsToWatts(3, 'dc', 12.8, 120)).toBeCloseTo(38.4, 10);
    expect(ampsToWatts(2.5, 'dc', 24, 230)).toBeCloseTo(60, 10);
  });

  it('AC amps at the outlet the camper picks: 10 A × 120 V = 1,200 W; 5 A × 230 V = 1,150 W', () => {
    expect(ampsToWatts(10, 'ac', 12.8, 120)).toBe(1200);
    expect(ampsToWatts(5, 'ac', 12.8, 230)).toBe(1150);
    expect(wattsToAmps(1150, 'ac', 12.8, 230)).toBeCloseTo(5, 10);
  });

  it('an AC load from the bank: 1,050 W through a 90 % inverter at 12 V is 1050 / 0.9 / 12 = 97.2 A (trade notes: ~90–100 A [meas])', () => {
    expect(bankAmpsOfAc(1050, 12, 90)).toBeCloseTo(97.22, 2);
  });

  it('the form saves amps as watts: 3 A DC on a 12.8 V bank → 38.4 W; 8 A AC at 230 V → 1,840 W', () => {
    const dc = loadFormSchemaFor(12.8).parse({ ...blankLoad(), name: 'Pump', drawUnit: 'A', amps: 3 });
    expect(dc.watts).toBe(38.4);
    expect(dc).not.toHaveProperty('amps');
    expect(dc).not.toHaveProperty('drawUnit');
    const ac = loadFormSchemaFor(12.8).parse({ ...blankLoad(), name: 'Kettle', supply: 'ac', drawUnit: 'A', amps: 8, acVolts: 230 });
    expect(ac.watts).toBe(1840);
    // The same 3 A on a 24 V bank is 72 W.
    expect(loadFormSchemaFor(24).parse({ ...blankLoad(), name: 'Pump', drawUnit: 'A', amps: 3 }).watts).toBe(72);
  });

  it('names the amps field when the amps are missing, negative or too large, and ignores an empty watts box then', () => {
    const s = loadFormSchemaFor(12.8);
    const missing = s.safeParse({ ...blankLoad(), name: 'Pump', drawUnit: 'A', watts: undefined });
    expect(missing.success).toBe(false);
    expect(missing.error!.issues.map((i) => i.path.join('.'))).toEqual(['amps']);
    const negative = s.safeParse({ ...blankLoad(), name: 'Pump', drawUnit: 'A', amps: -1 });
    expect(negative.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['amps', 'must be at least 0']]);
    // 100,000 W / 12.8 V = 7,812.5 A is the most a DC load may draw.
    const big = s.safeParse({ ...blankLoad(), name: 'Pump', drawUnit: 'A', amps: 8000 });
    expect(big.error!.issues[0]!.message).toBe('must be at most 7812 A at 12.8 V');
  });

  it('keeps a load’s place and surge through the form; a new load sits in the cabin without a surge', () => {
    const out = loadFormSchemaFor(12.8).parse({ ...blankLoad(), name: 'Bay fridge', watts: 45, location: 'outside', surgeWatts: 110 });
    expect(out).toMatchObject({ location: 'outside', surgeWatts: 110 });
    expect(loadFormSchemaFor(12.8).parse({ ...blankLoad(), name: 'Lamp', watts: 5 })).toMatchObject({ location: 'cabin', surgeWatts: null });
    const round = loadFormSchemaFor(12.8).parse(loadToForm({ name: 'Bay fridge', watts: 45, location: 'outside', surgeWatts: 110 }));
    expect(round).toMatchObject({ watts: 45, location: 'outside', surgeWatts: 110 });
  });

  it('catalogue surge figures carry through and are never below the running draw', () => {
    const withSurge = CATALOGUE.filter((i) => i.surgeWatts !== undefined);
    expect(withSurge.map((i) => i.id)).toEqual(expect.arrayContaining(['microwave', 'compressor-fridge', 'coffee', 'hair-dryer', 'water-pump']));
    for (const item of withSurge) {
      expect(item.surgeWatts!).toBeGreaterThanOrEqual(item.watts);
      expect(item.surgeAbout).toMatch(/common practice/);
      expect(catalogueToLoad(item).surgeWatts).toBe(item.surgeWatts);
    }
  });
});

describe('rig form: where the bank sits', () => {
  it('reads an older rig’s insideHeatedSpace as the cabin, and location wins when both are given', () => {
    expect(bankLocationOf({ insideHeatedSpace: true })).toBe('cabin');
    expect(bankLocationOf({ insideHeatedSpace: true, location: 'outside' })).toBe('outside');
    expect(bankLocationOf({})).toBe('outside');
  });

  it('saves insideHeatedSpace in step with the location', () => {
    expect(bankToSave({ location: 'cabin' as const, insideHeatedSpace: false })).toEqual({ location: 'cabin', insideHeatedSpace: true });
    expect(bankToSave({ location: 'outside' as const, insideHeatedSpace: true })).toEqual({ location: 'outside', insideHeatedSpace: false });
  });

  it('a new rig starts outside with 6 h of thermal lag; inverter ratings are checked as positive watts', () => {
    const rig = { ...emptyRig(), name: 'Van', bank: { ...emptyRig().bank, capacityAh: 200 } };
    expect(rig.bank).toMatchObject({ location: 'outside', thermalHours: 6 });
    expect(rigFormSchema.safeParse(rig).success).toBe(true);
    const bad = rigFormSchema.safeParse({ ...rig, bank: { ...rig.bank, thermalHours: -1 }, inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false, continuousWatts: 0, surgeWatts: 3000 } });
    expect(bad.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['bank.thermalHours', 'inverter.continuousWatts']);
  });
});
