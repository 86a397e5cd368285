import { describe, expect, it } from 'vitest';
import { CATALOGUE, catalogueToLoad } from '../../src/domain/loads/catalogue';
import { TYPICAL_LOADS } from '../../src/domain/loads/typical';
import { buildQuickPlan, defaultQuickPlan, LOAD_CATALOGUE } from '../../src/domain/quick-plan/quick-plan';
import { loadSchema } from '../../src/engine';

// One source of typical figures (issue: the catalogue said a fridge runs 50 % of the time, the quick
// plan "about a third"): the quick plan's loads and the catalogue's items must be the same figures.

describe('typical figures', () => {
  it('the catalogue holds at least 40 appliances, each with where its figure comes from', () => {
    expect(CATALOGUE.length).toBeGreaterThanOrEqual(40);
    for (const item of TYPICAL_LOADS) {
      expect(['trade notes', 'common practice', 'from memory']).toContain(item.basis);
      expect(item.source.length).toBeGreaterThan(10);
      // A figure not from the trade notes says so where the camper reads it.
      if (item.basis === 'from memory') expect(item.about).toMatch(/from memory/);
      if (item.basis === 'trade notes') expect(item.source).toMatch(/^trade-notes\.md/);
    }
  });

  it.each([
    'CPAP, no humidifier',
    'CPAP with humidifier and heated hose',
    'Diesel air heater',
    'Induction hob (through the inverter)',
    'E-bike charger (through the inverter)',
    'Satellite internet dish (through the inverter)',
    'Coffee maker (through the inverter)',
    'Hair dryer (through the inverter)',
    'TV',
    'Wi-Fi router or mobile hotspot',
    'Roof vent fan, low speed',
    'Roof vent fan, medium speed',
    'Roof vent fan, high speed',
    'Propane water heater igniter and board',
    'Slide-out motor',
    'Leveling jacks',
    'Holding-tank heater pads',
    '12 V heated blanket',
    'Electric blanket (through the inverter)',
  ])('the catalogue has %s', (name) => {
    expect(CATALOGUE.map((i) => i.name)).toContain(name);
  });

  it('every quick-plan load is its catalogue item’s figures: draw, count, supply, schedule, duty, temperature response', () => {
    const plan = buildQuickPlan({ ...defaultQuickPlan('2027-10-14'), loads: LOAD_CATALOGUE.map((l) => l.id) });
    expect(plan.loads).toHaveLength(LOAD_CATALOGUE.length);
    LOAD_CATALOGUE.forEach((q, i) => {
      const item = CATALOGUE.find((c) => c.id === q.typicalId);
      expect(item, q.typicalId).toBeDefined();
      const fromCatalogue = catalogueToLoad(item!);
      // Both through the engine's load schema, so a default on one side and a value on the other compare equal.
      const a = loadSchema.parse({ ...plan.loads![i], name: 'x' });
      const b = loadSchema.parse({ ...fromCatalogue, name: 'x', note: undefined, standby: undefined, surgeWatts: undefined });
      for (const field of ['watts', 'quantity', 'supply', 'windows', 'dutyPct', 'days', 'response', 'setpointC'] as const) {
        expect([q.id, field, a[field]]).toEqual([q.id, field, b[field]]);
      }
      expect(q.typical.toLowerCase()).toBe(item!.about.toLowerCase());
    });
  });

  it('the fridge runs about half the time at 25 °C in both (45 % at 20 °C, +3 % a degree: 51.75 %)', () => {
    const fridge = LOAD_CATALOGUE.find((l) => l.id === 'fridge')!;
    expect(fridge.load.dutyPct).toBe(45);
    expect(CATALOGUE.find((c) => c.id === 'compressor-fridge')!.dutyPct).toBe(45);
  });
});
