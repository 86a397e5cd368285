import { describe, expect, it } from 'vitest';
import { socFromRestingVolts } from '../../src/domain/checkins/ocv';

// Resting voltage → SOC against the open-circuit tables of forecast-engine.md ("Precise rules"),
// which are common practice (the same figures as trade-notes.md: flooded 12.7 / 12.4 / 12.2 /
// 12.0 / 11.8 V at 100 / 75 / 50 / 25 / 0 %, rested ≥ 4 h [cp]); linear between points,
// scaled by nominal/12 (lead-acid) or nominal/12.8 (LiFePO4).

const soc = (chem: 'lifepo4' | 'flooded' | 'agm' | 'gel', nominal: number, v: number) => {
  const r = socFromRestingVolts(chem, nominal, v);
  if (!r.ok) throw new Error(r.message);
  return r.socPct;
};

describe.each([
  // chemistry, nominal, volts, SOC % — table points (common practice, forecast-engine.md)
  ['flooded', 12, 12.7, 100],
  ['flooded', 12, 12.4, 75],
  ['flooded', 12, 12.2, 50],
  ['flooded', 12, 12.0, 25],
  ['agm', 12, 12.6, 75],
  ['agm', 12, 12.3, 50],
  ['gel', 12, 12.0, 25],
  ['lifepo4', 12.8, 13.25, 70],
  ['lifepo4', 12.8, 13.13, 40],
  ['lifepo4', 12.8, 13.0, 20],
  ['lifepo4', 12.8, 12.8, 14],
  ['lifepo4', 12.8, 12.5, 9],
  // linear between points
  ['flooded', 12, 12.3, 62.5],
  ['agm', 12, 12.45, 62.5],
  // scaled banks: 24 V lead-acid (×2), 25.6 V LiFePO4 (×2)
  ['flooded', 24, 24.8, 75],
  ['lifepo4', 25.6, 26.26, 40],
] as const)('%s %s V bank at %s V', (chem, nominal, volts, expected) => {
  it(`reads ${expected} %`, () => {
    expect(soc(chem, nominal, volts)).toBeCloseTo(expected, 1);
  });
});

describe('readings off the table', () => {
  it('above full: 100 % with a surface-charge note', () => {
    const r = socFromRestingVolts('flooded', 12, 12.9);
    expect(r).toMatchObject({ ok: true, socPct: 100, note: expect.stringContaining('surface charge') });
  });
  it('below empty: 0 % with a note', () => {
    expect(socFromRestingVolts('agm', 12, 11.5)).toMatchObject({ ok: true, socPct: 0, note: expect.stringContaining('0 %') });
  });
  it('a reading no bank of that voltage can give is refused', () => {
    expect(socFromRestingVolts('agm', 24, 12.6)).toMatchObject({ ok: false, message: expect.stringContaining('24 V bank') });
    expect(socFromRestingVolts('lifepo4', 12.8, 130)).toMatchObject({ ok: false });
  });
  it('LiFePO4’s flat middle gives a wide range and says a monitor is better; lead-acid does not', () => {
    const flat = socFromRestingVolts('lifepo4', 12.8, 13.2);
    expect(flat.ok && flat.rangePct[1] - flat.rangePct[0]).toBeGreaterThanOrEqual(8);
    expect(flat.ok && flat.note).toMatch(/battery monitor/);
    const lead = socFromRestingVolts('flooded', 12, 12.3);
    expect(lead.ok && lead.rangePct[1] - lead.rangePct[0]).toBeLessThan(8);
    expect(lead.ok && lead.note).toBeNull();
  });
});
