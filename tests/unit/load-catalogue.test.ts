import { describe, expect, it } from 'vitest';
import { loadInputSchema } from '../../src/domain/loads/loads.schema';
import { CATALOGUE, catalogueToLoad } from '../../src/domain/loads/catalogue';
import { loadFormSchema, loadToForm, blankLoad } from '../../src/domain/loads/load-form';
import { loadWhPerDay, whToAh } from '../../src/domain/loads/energy';

describe('appliance catalogue', () => {
  it('has unique ids and a typical value inside each range', () => {
    expect(new Set(CATALOGUE.map((i) => i.id)).size).toBe(CATALOGUE.length);
    for (const item of CATALOGUE) {
      expect(item.minWatts).toBeLessThanOrEqual(item.watts);
      expect(item.watts).toBeLessThanOrEqual(item.maxWatts);
    }
  });

  it.each(CATALOGUE.map((i) => [i.name, i] as const))('%s is a valid load', (_name, item) => {
    expect(loadInputSchema.safeParse(catalogueToLoad(item)).success).toBe(true);
  });

  // trade-notes.md, Loads table, "typical Ah/day" column [meas/cp]: each typical entry, at 12 V,
  // lands inside the trade's daily range (temperature response aside).
  it.each([
    ['compressor-fridge', 25, 60],
    ['standby', 25, 30],
    ['led-lights', 2, 10],
    ['vent-fan-low', 8, 18],
    ['vent-fan-medium', 8, 18],
    ['vent-fan-high', 8, 18],
    ['tv-receiver', 6, 20],
    ['cpap-dry', 3, 8],
    ['cpap-humid', 18, 30],
    ['water-pump', 1, 4],
    ['microwave', 5, 15],
    ['coffee', 10, 20],
  ])('%s: between %d and %d Ah a day at 12 V', (id, lo, hi) => {
    const item = CATALOGUE.find((i) => i.id === id)!;
    const ah = whToAh(loadWhPerDay(catalogueToLoad(item) as Parameters<typeof loadWhPerDay>[0], { inverter: null }), 12);
    expect(ah).toBeGreaterThanOrEqual(lo);
    expect(ah).toBeLessThanOrEqual(hi);
  });
});

describe('load form', () => {
  it('reads the typed schedule into hour pairs', () => {
    const out = loadFormSchema.parse({ ...blankLoad(), name: 'Lights', watts: 6, windows: '18-23; 6-8' });
    expect(out.windows).toEqual([[18, 23], [6, 8]]);
  });

  it('names a bad schedule and bad watts', () => {
    const r = loadFormSchema.safeParse({ ...blankLoad(), name: '', watts: -3, windows: '18-' });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join('.')).sort();
    expect(paths).toEqual(['name', 'watts', 'windows']);
  });

  it('runs standby draw all day, every day, at full duty', () => {
    const out = loadFormSchema.parse({ ...blankLoad(), name: 'Detectors', watts: 0.2, windows: '18-23', dutyPct: 40, days: 'camp', standby: true });
    expect(out).toMatchObject({ windows: [[0, 24]], dutyPct: 100, days: 'all', standby: true });
  });

  it('turns a catalogue item into form values and back without change', () => {
    for (const item of CATALOGUE) {
      const load = catalogueToLoad(item);
      const out = loadFormSchema.parse(loadToForm(load));
      expect(out.windows).toEqual(load.windows);
      expect(out.watts).toBe(load.watts);
    }
  });
});
