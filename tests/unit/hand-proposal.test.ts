// A proposal from an after-plan edited by hand (issue #19 item 4, carried on to the proposal):
// what it changes against the demo van, priced from the invented test list, worked out by hand.
import { describe, expect, it } from 'vitest';
import { demoPlan, validatePlan, type Plan, type ResolvedPlan } from '../../src/engine';
import { priceListSchema } from '../../src/domain/proposals/proposals.schema';
import { handProposal, mountingOf } from '../../src/domain/proposals/hand-proposal';
import { handPlanApplied, handPlanOf, type HandPlan } from '../../src/domain/proposals/sweep-edit';
import { TEST_PRICES } from '../helpers/prices';

function resolved(p: Plan): ResolvedPlan {
  const v = validatePlan(p);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}
const PRICES = priceListSchema.parse(TEST_PRICES);
// The demo van: 300 Ah LiFePO4, "Roof (2 × 200 W)" flat on MPPT, a 30 A DC-DC charger, no generator, no shore charger.
const van = resolved(demoPlan());
const propose = (edit: (h: HandPlan) => HandPlan) => {
  const e = edit(handPlanOf(van));
  return handProposal(van, e, handPlanApplied(van, e, 20).plan, PRICES);
};
const lines = (h: ReturnType<typeof propose>) => h.items.map((i) => [i.name, i.amount]);

describe('a hand-edited after-plan as a proposal', () => {
  it('the van as it is changes nothing and has no parts', () => {
    const h = propose((x) => x);
    expect(h.changed).toBe(false);
    expect(h.label).toBe('As it is');
    expect(h.items).toEqual([]);
  });

  it('panels added to an existing array are priced per watt, with no second controller', () => {
    const h = propose((x) => ({ ...x, arrays: [{ ...x.arrays[0]!, ratedWatts: 600 }] }));
    // 200 W more × 1 a watt = 200.
    expect(lines(h)).toEqual([['Panels added to “Roof (2 × 200 W)”, 200 W (400 W → 600 W)', 200]]);
    expect(h.changes.panel).toEqual({ watts: 200, mounting: 'flat' });
    expect(h.label).toBe('“Roof (2 × 200 W)” +200 W');
  });

  it('re-aiming a fixed array is a re-mount at its mounting’s price; a change of controller is a part to price', () => {
    const h = propose((x) => ({ ...x, arrays: [{ ...x.arrays[0]!, tiltDeg: 30, controller: 'pwm' }] }));
    expect(lines(h)).toEqual([
      ['Re-mounting “Roof (2 × 200 W)”: tilt 30°, facing 180° (tilted)', 260],
      ['PWM controller for “Roof (2 × 200 W)” in place of its MPPT (price to enter)', 0],
    ]);
    expect(h.changes.panel).toBeNull();
    expect(h.changed).toBe(true);
  });

  it('taking off the DC-DC charger and the array are removals at 0, in the installation', () => {
    const h = propose((x) => ({ ...x, arrays: [], dcdcAmps: 0 }));
    expect(lines(h)).toEqual([
      ['Removal of “Roof (2 × 200 W)”, 400 W (in the installation)', 0],
      ['Removal of the 30 A DC-DC charger (in the installation)', 0],
    ]);
    expect(h.label).toBe('“Roof (2 × 200 W)” removed · no DC-DC charger');
  });

  it('a bigger DC-DC charger replaces the old one as a sweep option does; a floor alone is a setting, not a bank', () => {
    const h = propose((x) => ({ ...x, dcdcAmps: 40, bank: { ...x.bank, floorSocPct: 15 } }));
    // 40 A × 8 = 320, installation 120, the old one's removal 0.
    expect(lines(h)).toEqual([
      ['DC-DC charger, 40 A (replaces the rig’s 30 A)', 320],
      ['DC-DC charger installation', 120],
      ['Removal of the old 30 A DC-DC charger (in the installation)', 0],
    ]);
    expect(h.changes.bank).toBeNull();
    expect(h.label).toBe('40 A DC-DC charger instead of the 30 A · the bank’s floor at 15 %');
  });

  it('names a mounting from the aim and tilt', () => {
    expect(mountingOf({ aim: 'follow', tiltDeg: 0 })).toBe('portable');
    expect(mountingOf({ aim: 'fixed', tiltDeg: 4 })).toBe('flat');
    expect(mountingOf({ aim: 'fixed', tiltDeg: 5 })).toBe('tilted');
  });
});
