// Voltage drop by the two methods the installer chooses between, against hand calculations.
//
// Sources and flags:
// - Copper at 20 °C: IACS annealed copper, ρ = 1/58 Ω·mm²/m = 1.7241 × 10⁻⁸ Ω·m (FROM MEMORY);
//   1 cmil = 5.067075 × 10⁻¹⁰ m² (COMPUTED from the definition, π/4 · (0.0254 mm)²);
//   K = ρ / 1 cmil × 0.3048 m/ft = 10.371 Ω·cmil/ft (COMPUTED).
// - ABYC E-11 circular-mil formula CM = K·I·L/E with its printed K = 10.75 (check-values.md §10b,
//   VERIFIED secondary).
// - NEC Chapter 9 Table 8, stranded copper at 75 °C: 6 AWG 0.491 Ω/kft, 4 AWG 0.308 Ω/kft,
//   26,240 cmil for 6 AWG (check-values.md §10a, VERIFIED secondary).
// - IEC 60228 class 5 plain copper at 20 °C: 16 mm² 1.21 Ω/km, 10 mm² 1.91 Ω/km (VERIFIED secondary:
//   mycableengineering.com "IEC 60228 DC resistance"; uecables.com IEC 60228 table).
// - Copper α = 0.00393 /°C at 20 °C (FROM MEMORY; check-values.md §10a temperature note).
import { describe, expect, it } from 'vitest';
import { ABYC_K, checkCable, conductor, COPPER_K_20C, preferredSizes, runDrop, type CableInput } from '../../src/domain/proposals/cable';

// The run: 12 V, 40 A, 3 m one way, critical (3 % = 0.36 V).
const run: CableInput = { label: 'DC-DC charger to bank', source: { kind: 'charger', amps: 40 }, oneWayM: 3, circuit: 'critical', nominalVolts: 12, table: 'abyc-105c', chosenAwg: '6' };

describe('copper at 20 °C by the circular-mil formula', () => {
  it('K for annealed copper at 20 °C is 10.371 Ω·cmil/ft (1.7241e-8 / 5.067075e-10 × 0.3048, by hand)', () => {
    expect(COPPER_K_20C).toBeCloseTo(10.371, 3);
  });

  it('12 V, 40 A, 3 m one way on 6 AWG drops 2.59 % at 20 °C', () => {
    // By hand: round trip 6 m = 19.685 ft; R = 10.371 × 19.685 / 26,240 = 0.0077803 Ω;
    // V = 40 × 0.0077803 = 0.31121 V; 0.31121 / 12 = 2.593 %.
    const r = checkCable({ ...run, method: 'abyc-20c' });
    expect(r.chosen!.dropV).toBeCloseTo(0.3112, 4);
    expect(r.chosen!.dropPct).toBeCloseTo(2.593, 3);
    expect(r.chosen!.dropOk).toBe(true);
    expect(r.method).toBe('abyc-20c');
    expect(r.suggested!.awg).toBe('6');
  });

  it('ABYC’s printed K = 10.75 gives 2.69 % on the same run (copper near 29 °C), also under 3 %', () => {
    // By hand: 10.75 × 19.685 / 26,240 = 0.0080646 Ω; × 40 A = 0.32258 V; / 12 V = 2.688 %.
    const ohms = (ABYC_K * (6 / 0.3048)) / 26_240;
    expect((40 * ohms * 100) / 12).toBeCloseTo(2.688, 3);
  });

  it('is the default method: the ABYC limits are judged with the ABYC-style resistance', () => {
    expect(checkCable(run).method).toBe('abyc-20c');
  });
});

describe('NEC Chapter 9 Table 8 at 75 °C', () => {
  it('the same run on 6 AWG drops 3.22 %, over the 3 % limit, so 4 AWG is suggested', () => {
    // By hand: 0.491 Ω/kft × 19.685 ft / 1000 = 0.0096654 Ω; × 40 A = 0.38662 V; / 12 V = 3.222 %.
    // 4 AWG: 0.308 × 19.685 / 1000 × 40 = 0.24252 V = 2.021 %.
    const r = checkCable({ ...run, method: 'nec-75c' });
    expect(r.chosen!.dropPct).toBeCloseTo(3.222, 3);
    expect(r.chosen!.dropOk).toBe(false);
    expect(r.suggested!.awg).toBe('4');
    expect(r.suggested!.dropPct).toBeCloseTo(2.021, 3);
    expect(r.notes.join(' ')).toMatch(/6 AWG loses 3\.2 %/);
  });
});

describe('metric sizes (IEC 60228 class 5)', () => {
  it('16 mm² at 20 °C: 1.21 Ω/km × 6 m × 40 A = 0.2904 V = 2.42 %; 10 mm² 3.82 % fails; so 16 mm² is suggested', () => {
    const r = checkCable({ ...run, chosenAwg: null, sizes: 'metric', method: 'abyc-20c' });
    expect(r.suggested!.awg).toBe('16 mm²');
    expect(r.suggested!.dropPct).toBeCloseTo(2.42, 3);
    expect(runDrop(40, conductor('10 mm²')!, 'abyc-20c', 3) / 12 * 100).toBeCloseTo(3.82, 3);
  });

  it('at 75 °C the IEC value grows by 1 + 0.00393 × 55 = 1.21615: 16 mm² drops 2.943 %', () => {
    // By hand: 0.2904 V × 1.21615 = 0.35317 V; / 12 V = 2.943 %.
    const r = checkCable({ ...run, chosenAwg: '16 mm²', sizes: 'metric', method: 'nec-75c' });
    expect(r.chosen!.dropPct).toBeCloseTo(2.943, 3);
  });

  it('takes the ampacity of the largest AWG not bigger in area: 16 mm² (31,576 cmil) as 6 AWG, 95 mm² as 3/0', () => {
    // 16 / 5.067075e-4 = 31,576 cmil: above 6 AWG (26,240), below 4 AWG (41,740).
    expect(conductor('16 mm²')!.ampacityAwg).toBe('6');
    expect(conductor('95 mm²')!.ampacityAwg).toBe('3/0');
    expect(conductor('6 mm²')!.ampacityAwg).toBe('10');
  });

  it('offers metric first for a euro or pound price list, AWG for US and Canadian dollars or a user who set imperial units', () => {
    expect(preferredSizes('EUR', 'metric')).toBe('metric');
    expect(preferredSizes('gbp', null)).toBe('metric');
    expect(preferredSizes('USD', 'metric')).toBe('awg');
    expect(preferredSizes('CAD', null)).toBe('awg');
    expect(preferredSizes('EUR', 'imperial')).toBe('awg');
  });
});
