import { describe, expect, it } from 'vitest';
import { addDaysIso, formatAh, formatBytes, formatDate, formatHour, formatLitres, formatMoney, formatNumber, formatWatts, formatWh, pct, plural, rigSummary, whPerDay } from '../../src/lib/format';

describe('display formatting', () => {
  it('formats energy and power with units', () => {
    expect(formatWh(1234.4)).toBe('1,234 Wh');
    expect(formatAh(42.1875)).toBe('42.2 Ah');
    expect(formatAh(149.1)).toBe('149 Ah');
    expect(formatWatts(0.2)).toBe('0.2 W');
    expect(formatWatts(1050)).toBe('1,050 W');
    expect(formatNumber(Number.NaN)).toBe('—');
  });

  it('formats hours and dates', () => {
    expect(formatHour(6)).toBe('06:00');
    expect(formatHour(24)).toBe('24:00');
    expect(formatDate('2027-10-21')).toBe('Thu 21 Oct 2027');
    expect(formatDate('2027-10-21', false)).toBe('Thu 21 Oct');
    expect(formatDate('not a date')).toBe('not a date');
    expect(addDaysIso('2027-12-31', 1)).toBe('2028-01-01');
    expect(addDaysIso('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDaysIso('2027-03-14', 1)).toBe('2027-03-15');
  });

  // product.md demo rigs: "300 Ah LiFePO4 bank, 2 × 200 W flat roof panels"; "two 6 V flooded … (225 Ah at 12 V) and a 100 W portable panel".
  it('summarises a rig in one line', () => {
    expect(rigSummary({ bank: { chemistry: 'lifepo4', capacityAh: 300 }, arrays: [{ ratedWatts: 200 }, { ratedWatts: 200 }] })).toBe('300 Ah LiFePO4 · 400 W solar');
    expect(rigSummary({ bank: { chemistry: 'flooded', capacityAh: 225, nominalVolts: 12 }, arrays: [{ ratedWatts: 100 }] })).toBe('225 Ah flooded · 100 W solar');
    expect(rigSummary({ bank: { chemistry: 'lifepo4', capacityAh: 200, nominalVolts: 25.6 }, arrays: [] })).toBe('200 Ah 25.6 V LiFePO4 · no solar');
  });

  it('pluralises', () => {
    expect(plural(1, 'night')).toBe('1 night');
    expect(plural(5, 'night')).toBe('5 nights');
    expect(plural(2, 'battery', 'batteries')).toBe('2 batteries');
  });

  it('formats the figures the forecast, advice, proposals and logs show (one module for all)', () => {
    expect(whPerDay(1234.4)).toBe('1,234 Wh/day');
    expect(pct(40.6)).toBe('41 %');
    expect(formatLitres(1.25)).toBe('1.3 L');
    expect(formatLitres(12)).toBe('12 L');
    expect(formatMoney(1234.5, 'USD')).toBe('$1,234.50');
    expect(formatBytes(340 * 1024)).toBe('340 KB');
    expect(formatBytes(1.25 * 1024 * 1024)).toBe('1.3 MB');
  });
});
