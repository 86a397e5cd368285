import { describe, expect, it } from 'vitest';
import { demoPlan, validatePlan, type ResolvedPlan } from '../../src/engine';
import { defaultCables, mainFeedCurrent } from '../../src/domain/proposals/proposals';
import { documentTotals, quoteNumber, validUntil, wiringLines } from '../../src/domain/proposals/document';
import { checkCable } from '../../src/domain/proposals/cable';

// Each run is sized by the current that can really flow on it, and says which; the cable check's
// parts and the document's sums. Figures below are worked by hand from the invented demo plan.

function demo(edit: (p: ResolvedPlan) => ResolvedPlan = (p) => p): ResolvedPlan {
  const v = validatePlan(demoPlan());
  if (!v.ok) throw new Error('demo plan does not validate');
  return edit(v.plan);
}

describe('the main battery feed is sized by what can really flow on it', () => {
  it('the demo van: chargers 30 A DC-DC + 30 A solar controller = 60 A, more than the inverter’s 60 W laptop (6.3 A at 10.5 V) — not the bank’s charge limit', () => {
    const plan = demo();
    const feed = mainFeedCurrent(plan);
    // 60 W ÷ 0.90 ÷ 10.5 V = 6.35 A (no rated continuous watts: the AC loads together).
    expect(feed.side).toBe('charging');
    expect(feed.amps).toBeCloseTo(60, 9);
    expect(feed.amps).toBeLessThan(plan.bank.maxChargeAmps);
    expect(feed.basis).toBe('Sized for the chargers together (DC-DC 30 A + solar 30 A) = 60 A, the larger of the two; the inverter\'s continuous input at 10.5 V (60 W of AC loads together ÷ 90 % ÷ 10.5 V) = 6.3 A.');
    const [row] = defaultCables(plan, { bank: { chemistry: 'lifepo4', capacityAh: 400 }, panel: null, dcdcAmps: null, generatorHours: null, generatorStartHour: 8, generatorAmps: 30 } as never);
    expect(row!.source).toEqual({ kind: 'current', amps: 60 });
    expect(row!.basis).toBe(feed.basis);
  });

  it('a 2,000 W inverter wins over the chargers: 2000 ÷ 0.90 ÷ 10.5 = 211.6 A, said so', () => {
    const plan = demo((p) => ({ ...p, inverter: { ...p.inverter, continuousWatts: 2000 } }));
    const feed = mainFeedCurrent(plan);
    expect(feed.side).toBe('inverter');
    expect(feed.amps).toBeCloseTo(211.64, 2);
    expect(feed.basis).toMatch(/^Sized for the inverter's continuous input at 10\.5 V \(2,000 W rated continuous ÷ 90 % ÷ 10\.5 V\) = 211\.6 A, the larger of the two; charging brings 60 A\.$/);
  });

  it('shore and generator feed one converter/charger: the larger counts once, added to DC-DC and solar', () => {
    const plan = demo((p) => ({ ...p, chargers: [...p.chargers, { kind: 'shore', amps: 45, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0 }, { kind: 'generator', amps: 35, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 }] }));
    // 30 + 30 + max(45, 35) = 105 A.
    expect(mainFeedCurrent(plan).amps).toBeCloseTo(105, 9);
  });
});

describe('the cable check’s parts and the document’s sums', () => {
  it('prices a run’s cable by its area over the round trip, its fuse, and one pair of bus bars', () => {
    const input = { label: 'Charger', source: { kind: 'charger' as const, amps: 40 }, oneWayM: 3, circuit: 'critical' as const, nominalVolts: 12, table: 'abyc-105c' as const, chosenAwg: null };
    const cables = [{ input: { ...input, method: 'abyc-20c' as const, sizes: 'awg' as const }, result: checkCable(input) }];
    const lines = wiringLines(cables, { cablePerMm2M: 0.1, fuse: 12, busBars: 30 });
    // 6 AWG = 26,240 cmil × 5.067075e-4 = 13.296 mm² → 1.33 per metre; 6 m → 7.98.
    expect(lines.map((l) => [l.kind, l.quantity, l.unitPrice, l.amount])).toEqual([
      ['cable', 6, 1.33, 7.98],
      ['fuse', 1, 12, 12],
      ['bus-bars', 1, 30, 30],
    ]);
  });

  it('sums parts, wiring, labour, removals less trade-ins, then tax', () => {
    const t = documentTotals([{ quantity: 2, unitPrice: 99.995 }], [{ amount: 10 }], {
      labour: [{ name: 'Fit', hours: 1.5, rate: 80 }],
      removals: [{ name: 'Old bank', kind: 'removal', amount: 30 }, { name: 'Old charger', kind: 'trade-in', amount: 50 }],
      taxRatePct: 10,
    });
    // 2 × 99.995 = 199.99; + 10 + 120 + (30 − 50) = 309.99; tax 31.00 (30.999 → 31.00); total 340.99.
    expect(t).toEqual({ parts: 199.99, wiring: 10, labour: 120, removals: -20, subtotal: 309.99, taxRatePct: 10, tax: 31, total: 340.99 });
  });

  it('numbers quotes per year and dates their validity', () => {
    expect(quoteNumber(2026, 7)).toBe('Q-2026-007');
    expect(validUntil('2026-12-20', 30)).toBe('2027-01-19');
  });
});
