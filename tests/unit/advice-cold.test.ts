// The cold fixes of the advice (Revision 2), checked as relations the rules guarantee and against
// hand calculations — never against the engine's own output pasted in:
//  - each fix's figures are those of a forecast of the plan with only that change, built
//    independently from the plan JSON;
//  - the "alone" sentence names exactly the fixes whose own forecast keeps the trip above floor
//    and reserve;
//  - with the bank connected all trip, moving a cold outdoor LiFePO4 bank into the heated cabin
//    never lowers the minimum usable charge (the cabin is never colder than the air while the
//    furnace has power, and a warmer battery strands less charge: forecast-engine.md Revision 2).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { forecast, prepareTrip, validatePlan, type Forecast, type Plan, type ResolvedPlan } from '../../src/engine';
import { advise, assumedPanelWatts, coldAdvice, coldChanges, COLD_TRIP_C, loadUse } from '../../src/domain/advice/advice';
import { coldAloneText } from '../../src/domain/advice/advice-text';
import { CAUTIONS } from '../../src/domain/advice/cautions';

function resolve(plan: Plan): ResolvedPlan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

const makesIt = (f: Forecast, reservePct: number) => f.summary.firstCutoffAt === null && f.summary.minSocPct >= reservePct;

/**
 * "Frost camp", an invented late-November scenario: a 150 Ah LiFePO4 bank in an outside box, 400 W
 * of flat roof panels, a furnace blower at 18 °C through the night, a compressor fridge in the
 * cabin and the standby draw; three nights with lows of −14 °C and highs of −2 °C.
 */
function frostCamp(over: { capacityAh?: number; lowC?: number; highC?: number; cloudOktas?: number; furnaceDutyPct?: number } = {}): Plan {
  return {
    bank: { chemistry: 'lifepo4', capacityAh: over.capacityAh ?? 150, floorSocPct: 10 },
    arrays: [{ name: 'Roof', ratedWatts: 400 }],
    loads: [
      { name: 'Furnace blower', watts: 60, response: 'heating', setpointC: 18, windows: [[18, 8]], dutyPct: over.furnaceDutyPct ?? 40 },
      { name: 'Fridge', watts: 45, dutyPct: 50, response: 'cooling' },
      { name: 'Standby', watts: 13 },
    ],
    stops: [{
      name: 'Frost camp', lat: 39, lon: -106, timeZone: 'America/Denver', arrive: '2027-11-20', nights: 3,
      weather: [{ date: '2027-11-20', cloudOktas: over.cloudOktas ?? 1, highC: over.highC ?? -2, lowC: over.lowC ?? -14 }],
    }],
  };
}

describe('cold fixes: each one measured on its own forecast', () => {
  const raw = frostCamp();
  const plan = resolve(raw);
  const base = forecast(plan);
  const cold = coldAdvice(plan, base, plan.bank.floorSocPct)!;
  const byKind = new Map(cold.fixes.map((f) => [f.kind, f]));

  it('Frost camp is a cold trip that runs out as planned, and every cold fix applies to its rig', () => {
    expect(base.summary.firstCutoffAt).not.toBeNull();
    expect([...byKind.keys()].sort()).toEqual(['bank-cabin', 'more-capacity', 'more-solar', 'self-heating', 'setpoint']);
  });

  it('each fix is the forecast of the plan with only that change, built from the plan JSON', () => {
    const cases: [string, Plan][] = [
      ['bank-cabin', { ...raw, bank: { ...raw.bank, location: 'cabin' } }],
      ['self-heating', { ...raw, bank: { ...raw.bank, selfHeating: true } }],
      // +100 Ah: 250 Ah with the LiFePO4 charge limit 0.5 C of it (the plan leaves it to the default: 125 A).
      ['more-capacity', { ...raw, bank: { ...raw.bank, capacityAh: 250, maxChargeAmps: 125 } }],
      // 400 W read as 2 × 200 W panels: one more makes 600 W.
      ['more-solar', { ...raw, arrays: [{ name: 'Roof', ratedWatts: 600 }] }],
      ['setpoint', { ...raw, loads: raw.loads!.map((l) => (l.response === 'heating' ? { ...l, setpointC: 15 } : l)) }],
    ];
    for (const [kind, changed] of cases) {
      const alt = forecast(resolve(changed));
      const fix = byKind.get(kind as never)!;
      expect(fix.forecast.summary, kind).toEqual(alt.summary);
      expect(fix.fixes, kind).toBe(makesIt(alt, plan.bank.floorSocPct));
    }
  });

  it('the sentence names exactly the fixes that alone make the trip', () => {
    const alone = cold.fixes.filter((f) => makesIt(f.forecast, plan.bank.floorSocPct)).map((f) => f.short);
    expect(cold.alone).toBe(coldAloneText(false, cold.fixes));
    for (const s of alone) expect(cold.alone).toContain(s);
    for (const f of cold.fixes.filter((x) => !alone.includes(x.short))) expect(cold.alone).not.toContain(f.short);
  });

  it('sizing and wiring fixes carry the wiring caution, self-heating the cold-charging one', () => {
    for (const k of ['bank-cabin', 'more-capacity', 'more-solar'] as const) expect(byKind.get(k)!.caution).toContain(CAUTIONS.wiring);
    expect(byKind.get('self-heating')!.caution).toBe(CAUTIONS.cold);
    expect(CAUTIONS.wiring).toMatch(/Disconnect shore power.*fuse every positive/);
  });

  it('a flooded bank moved inside also gets the vented-box caution', () => {
    const flooded = resolve({ ...raw, bank: { chemistry: 'flooded', capacityAh: 225 } });
    const move = coldChanges(flooded).find((c) => c.kind === 'bank-cabin')!;
    expect(move.caution).toContain(CAUTIONS.ventedBox);
    // No self-heating fix for lead-acid, and none for a bank already in the cabin.
    expect(coldChanges(flooded).some((c) => c.kind === 'self-heating')).toBe(false);
    expect(coldChanges(resolve({ ...raw, bank: { ...raw.bank, location: 'cabin' } })).some((c) => c.kind === 'bank-cabin')).toBe(false);
  });

  it('the advice carries the cold fixes alongside the other changes', () => {
    const advice = advise(plan, base);
    expect(advice.cold?.fixes.map((f) => f.kind).sort()).toEqual([...byKind.keys()].sort());
  });
});

describe('cold fixes: hand calculations', () => {
  it('setpoint −3 °C: at a steady −7 °C a 60 W blower at 100 % duty runs (18 + 7)/25 = 100 % of the time, at 15 °C (15 + 7)/25 = 88 %', () => {
    // Heating duty = clamp((setpoint − T)/25, 0, 1) × dutyPct/100 (forecast-engine.md, Loads).
    // All-day window, 48 h trip (arrive 11:00, 2 nights): 60 × 1.00 × 24 = 1,440 Wh/day → 60 × 0.88 × 24 = 1,267.2 Wh/day.
    const plan = resolve({
      bank: { chemistry: 'lifepo4', capacityAh: 400 },
      loads: [{ name: 'Furnace blower', watts: 60, response: 'heating', setpointC: 18 }],
      stops: [{ name: 'Steady cold', lat: 39, lon: -106, timeZone: 'America/Denver', arrive: '2027-11-20', nights: 2, arriveHour: 11, weather: [{ date: '2027-11-20', cloudOktas: 8, highC: -7, lowC: -7 }] }],
    });
    const lower = coldChanges(plan).find((c) => c.kind === 'setpoint')!;
    expect(lower.plan.loads[0]!.setpointC).toBe(15);
    expect(loadUse(prepareTrip(plan)).totalWhPerDay).toBeCloseTo(1440, 6);
    expect(loadUse(prepareTrip(lower.plan)).totalWhPerDay).toBeCloseTo(1267.2, 6);
  });

  it('one more panel like the ones on the rig: 400 W read as 2 × 200 W, 100 W as 1 × 100 W, 300 W as 2 × 150 W', () => {
    expect(assumedPanelWatts(400)).toEqual({ panelWatts: 200, panels: 2 });
    expect(assumedPanelWatts(100)).toEqual({ panelWatts: 100, panels: 1 });
    expect(assumedPanelWatts(300)).toEqual({ panelWatts: 150, panels: 2 });
  });

  it('a warm trip gets no cold fixes; a trip with an hour at the cold threshold does', () => {
    const warm = resolve({ ...frostCamp(), stops: [{ ...frostCamp().stops![0]!, weather: [{ date: '2027-11-20', cloudOktas: 1, highC: 25, lowC: 15 }] }] });
    expect(coldAdvice(warm, forecast(warm), 10)).toBeNull();
    const chilly = resolve(frostCamp({ lowC: COLD_TRIP_C - 1, highC: 15 }));
    expect(coldAdvice(chilly, forecast(chilly), 10)).not.toBeNull();
  });

  it('the sentence for a trip that already makes it, for none, one, and all', () => {
    const f = (short: string, fixes: boolean) => ({ short, fixes });
    expect(coldAloneText(true, [f('a', true)])).toMatch(/makes it as planned/);
    expect(coldAloneText(false, [f('a', false), f('b', false)])).toBe('None of these alone makes the trip: combine them, add charging or use less.');
    expect(coldAloneText(false, [f('the bank in the heated cabin', true), f('b', false)])).toBe('On its own, only the bank in the heated cabin makes the trip.');
    expect(coldAloneText(false, [f('a', true), f('b', true)])).toBe('Any one of these alone makes the trip.');
    expect(coldAloneText(false, [f('a', true), f('b', true), f('c', false)])).toBe('On its own, each of these makes the trip: a and b.');
  });
});

describe('moving a cold outdoor LiFePO4 bank into the heated cabin never lowers the minimum usable charge', () => {
  it('Frost camp with a bank big enough to stay connected, over lows, highs, skies and furnace duty', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -25, max: 5 }),
        fc.integer({ min: 0, max: 15 }),
        fc.integer({ min: 0, max: 8 }),
        fc.integer({ min: 10, max: 60 }),
        (lowC, spread, cloudOktas, furnaceDutyPct) => {
          const plan = resolve(frostCamp({ capacityAh: 600, lowC, highC: lowC + spread, cloudOktas, furnaceDutyPct }));
          const base = forecast(plan);
          // The rule holds while the bank is connected all trip (after a cutoff the furnace stops).
          fc.pre(base.summary.firstCutoffAt === null);
          const inCabin = coldChanges(plan).find((c) => c.kind === 'bank-cabin')!;
          const alt = forecast(inCabin.plan);
          expect(alt.summary.minUsablePct).toBeGreaterThanOrEqual(base.summary.minUsablePct);
          expect(alt.summary.firstCutoffAt).toBeNull();
        },
      ),
      { numRuns: 40, seed: 20271120 },
    );
  });
});
