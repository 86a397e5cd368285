import { describe, expect, it } from 'vitest';
import {
  abycCircularMils,
  ampacity,
  checkCable,
  cmilToMm2,
  fuseFor,
  gauge,
  inverterCurrent,
  maxProtection,
  nextStandardFuse,
  NEC_TABLE_8,
  systemVolts,
  voltageDrop,
  type CableInput,
} from '../../src/domain/proposals/cable';

const FT = 0.3048;

describe('NEC Chapter 9 Table 8, stranded uncoated copper at 75 °C (check-values.md §10a, VERIFIED secondary)', () => {
  // Ω/1000 ft, stranded column of §10a, with 3, 1 and 3/0 AWG from the notes under the table.
  it.each([
    ['14', 3.14],
    ['12', 1.98],
    ['10', 1.24],
    ['8', 0.778],
    ['6', 0.491],
    ['4', 0.308],
    ['3', 0.245],
    ['2', 0.194],
    ['1', 0.154],
    ['1/0', 0.122],
    ['2/0', 0.0967],
    ['3/0', 0.0766],
    ['4/0', 0.0608],
  ])('%s AWG is %f Ω/kft', (awg, ohm) => {
    expect(gauge(awg).ohmPerKft).toBe(ohm);
  });

  // Areas of §10a's table (cmil): the gauge list is in order and the areas grow.
  it.each([
    ['14', 4110],
    ['12', 6530],
    ['10', 10380],
    ['8', 16510],
    ['6', 26240],
    ['4', 41740],
    ['2', 66360],
    ['1/0', 105600],
    ['2/0', 133100],
    ['4/0', 211600],
  ])('%s AWG has %i cmil', (awg, cmil) => {
    expect(gauge(awg).cmil).toBe(cmil);
  });

  it('lists gauges smallest first, each with less resistance than the one before', () => {
    for (let i = 1; i < NEC_TABLE_8.length; i++) {
      expect(NEC_TABLE_8[i]!.cmil).toBeGreaterThan(NEC_TABLE_8[i - 1]!.cmil);
      expect(NEC_TABLE_8[i]!.ohmPerKft).toBeLessThan(NEC_TABLE_8[i - 1]!.ohmPerKft);
    }
  });

  it('converts Table 8 areas to mm² (§10a: 4 AWG ≈ 21.2 mm², COMPUTED 1 cmil = 5.067e-4 mm²)', () => {
    expect(cmilToMm2(41_740)).toBeCloseTo(21.15, 2);
    expect(cmilToMm2(211_600)).toBeCloseTo(107.2, 1);
  });
});

describe('voltage drop, round trip (check-values.md §10a worked cases, COMPUTED from Table 8)', () => {
  it.each([
    // gauge, current A, one-way ft, drop V, % of 12 V
    ['10', 20, 10, 0.496, 4.13],
    ['4', 100, 5, 0.308, 2.57],
    ['2/0', 150, 6, 0.174, 1.45],
    ['12', 10, 25, 0.99, 8.25],
  ])('%s AWG, %i A, %i ft one way: %f V, %f % of 12 V', (awg, amps, ft, volts, pct) => {
    const v = voltageDrop(amps, gauge(awg).ohmPerKft, ft);
    expect(v).toBeCloseTo(volts, 3);
    expect((v / 12) * 100).toBeCloseTo(pct, 2);
  });

  it('takes the percentage of the 12 V class for a 12.8 V LiFePO4 bank (§10a gives 3.88 % of 12.8 V for the first case; we use 12 V: 4.13 %)', () => {
    const r = checkCable({ label: 'x', source: { kind: 'current', amps: 20 }, oneWayM: 10 * FT, circuit: 'critical', nominalVolts: 12.8, table: 'abyc-105c', chosenAwg: '10', method: 'nec-75c' });
    expect(r.systemVolts).toBe(12);
    expect(r.chosen!.dropPct).toBeCloseTo(4.13, 2);
    expect((r.chosen!.dropV / 12.8) * 100).toBeCloseTo(3.875, 3); // §10a rounds this to 3.88 %
  });

  it('knows the 12, 24 and 48 V classes', () => {
    expect([systemVolts(12), systemVolts(12.8), systemVolts(25.6), systemVolts(24), systemVolts(51.2)]).toEqual([12, 12, 24, 24, 48]);
  });
});

describe('ABYC E-11 limits and sizing formula (check-values.md §10b, VERIFIED secondary / COMPUTED)', () => {
  it('CM = K·I·L/E: 10 A over 21 ft round trip at 3 % of 12 V needs 6,271 cmil, so 12 AWG (6,530) by area', () => {
    const cm = abycCircularMils(10, 21, 0.36);
    expect(Math.round(cm)).toBe(6271);
    expect(NEC_TABLE_8.find((g) => g.cmil >= cm)!.awg).toBe('12');
  });

  it('with the 75 °C resistance of Table 8 the same run needs 10 AWG: 12 AWG drops 3.47 %, above 3 % (our method is the stricter one)', () => {
    const r = checkCable({ label: 'Bilge blower', source: { kind: 'current', amps: 10 }, oneWayM: 10.5 * FT, circuit: 'critical', nominalVolts: 12, table: 'abyc-105c', chosenAwg: '12', method: 'nec-75c' });
    expect(r.chosen!.dropPct).toBeCloseTo(3.465, 3);
    expect(r.chosen!.dropOk).toBe(false);
    expect(r.byDrop).toBe('10');
    expect(r.suggested!.awg).toBe('10');
  });

  it('uses 3 % for critical circuits and 10 % for the rest', () => {
    const base: CableInput = { label: 'Lights', source: { kind: 'current', amps: 10 }, oneWayM: 25 * FT, circuit: 'non-critical', nominalVolts: 12, table: 'abyc-105c', chosenAwg: '12', method: 'nec-75c' };
    // 12 AWG, 10 A, 25 ft: 8.25 % (§10a) — passes 10 %, fails 3 %.
    expect(checkCable(base).chosen!.dropOk).toBe(true);
    expect(checkCable({ ...base, circuit: 'critical' }).chosen!.dropOk).toBe(false);
    expect(checkCable({ ...base, circuit: 'critical' }).limitPct).toBe(3);
  });
});

describe('fuses: ≥ 125 % of the continuous current, next NEC 240.6(A) standard size (common practice)', () => {
  it.each([
    [8, 10],
    [12, 15],
    [16, 20],
    [20, 25],
    [30, 40],
    [40, 50],
    [60, 80],
    [100, 125],
    [150, 200],
    [211.6, 300],
  ])('%f A continuous → %i A', (amps, fuse) => {
    expect(fuseFor(amps)).toBe(fuse);
  });

  it('takes an exact standard size as it is and gives up above 600 A', () => {
    expect(nextStandardFuse(125)).toBe(125);
    expect(nextStandardFuse(601)).toBeNull();
  });

  it('never puts a fuse above what the cable may be protected at', () => {
    // NEC 240.4(D): 14/12/10 AWG copper at 15/20/30 A, below their Table 310.16 75 °C ampacity of 20/25/35 A (VERIFIED secondary).
    expect(maxProtection('14', 'nec-310.16-75c')).toBe(15);
    expect(maxProtection('12', 'nec-310.16-75c')).toBe(20);
    expect(maxProtection('10', 'nec-310.16-75c')).toBe(30);
    expect(maxProtection('8', 'nec-310.16-75c')).toBe(50);
    expect(ampacity('4/0', 'nec-310.16-75c')).toBe(230);
    // 33 CFR 183.425 Table E, 105 °C outside engine spaces (VERIFIED secondary: Ancor, Jamestown Distributors).
    expect(ampacity('4', 'abyc-105c')).toBe(160);
    expect(ampacity('2/0', 'abyc-105c')).toBe(330);
    expect(ampacity('4/0', 'abyc-105c-engine')).toBe(378);
  });
});

describe('checkCable: the smallest gauge that passes the drop and carries the fuse', () => {
  it('a 40 A DC-DC charger 2 m from the bank: 50 A fuse, 6 AWG by drop and fuse', () => {
    const r = checkCable({ label: 'DC-DC charger to bank', source: { kind: 'charger', amps: 40 }, oneWayM: 2, circuit: 'critical', nominalVolts: 12.8, table: 'abyc-105c', chosenAwg: null, method: 'nec-75c' });
    expect(r.fuseA).toBe(50);
    // 40 A × R × 2 × 6.56 ft / 1000 ≤ 0.36 V → R ≤ 0.686 Ω/kft → 6 AWG (0.491).
    expect(r.byDrop).toBe('6');
    expect(r.suggested!.awg).toBe('6');
    expect(r.suggested!.dropPct).toBeCloseTo((40 * 0.491 * 2 * (2 / FT)) / 1000 / 12 * 100, 6);
    expect(r.estimate).toBe(true);
  });

  it('a 2000 W inverter at 90 % and 10.5 V draws 211.6 A: 300 A fuse; 1 AWG passes the drop, 2/0 carries the fuse (105 °C table); NEC 310.16 has no single conductor', () => {
    const amps = inverterCurrent(2000, 90, 10.5);
    expect(amps).toBeCloseTo(211.64, 2);
    const input: CableInput = { label: 'Main feed to inverter', source: { kind: 'inverter', watts: 2000, efficiencyPct: 90, lowestVolts: 10.5 }, oneWayM: 1.5, circuit: 'critical', nominalVolts: 12.8, table: 'abyc-105c', chosenAwg: null, method: 'nec-75c' };
    const r = checkCable(input);
    expect(r.fuseA).toBe(300);
    expect(r.byFuse).toBe('2/0'); // 330 A ≥ 300 A
    // R ≤ 0.36 V / (211.6 A × 2 × 4.92 ft / 1000) = 0.173 Ω/kft: 2 AWG (0.194) fails, 1 AWG (0.154) passes.
    expect(r.byDrop).toBe('1');
    expect(r.suggested!.awg).toBe('2/0');
    const nec = checkCable({ ...input, table: 'nec-310.16-75c' });
    expect(nec.suggested).toBeNull();
    expect(nec.notes.join(' ')).toMatch(/parallel conductors/);
  });

  it('names a chosen gauge that is too small, and why', () => {
    const r = checkCable({ label: 'Solar to bank', source: { kind: 'current', amps: 30 }, oneWayM: 3, circuit: 'critical', nominalVolts: 12, table: 'abyc-105c', chosenAwg: '10', method: 'nec-75c' });
    expect(r.chosen!.ok).toBe(false);
    expect(r.notes.some((n) => n.startsWith('10 AWG loses'))).toBe(true);
    expect(r.suggested!.ok).toBe(true);
  });
});
