import { describe, expect, it } from 'vitest';
import {
  cToF,
  fToC,
  formatLength,
  formatTemp,
  formatTempDelta,
  fromDisplayLength,
  fromDisplayTemp,
  ftToM,
  lengthUnit,
  mToFt,
  tempRangeMessage,
  tempUnit,
  toDisplayLength,
  toDisplayTemp,
  toUnits,
} from '../../src/lib/units';

describe('temperature conversion', () => {
  // Fixed points of the Celsius and Fahrenheit scales (definition of the scales).
  it.each([
    [0, 32],
    [100, 212],
    [-40, -40],
    [37, 98.6],
    [-18, -0.4],
  ])('%d °C is %d °F', (c, f) => {
    expect(cToF(c)).toBeCloseTo(f, 10);
    expect(fToC(f)).toBeCloseTo(c, 10);
  });

  it('shows stored °C in the user units, one decimal', () => {
    expect(toDisplayTemp(-2, 'metric')).toBe(-2);
    expect(toDisplayTemp(-2, 'imperial')).toBe(28.4);
    expect(toDisplayTemp(18.333, 'metric')).toBe(18.3);
  });

  it('stores what a user typed in °F as °C rounded to 0.01, and shows it back as typed', () => {
    expect(fromDisplayTemp(28, 'imperial')).toBe(-2.22);
    expect(fromDisplayTemp(28, 'metric')).toBe(28);
    for (const f of [-40, -3.5, 0, 28, 32, 45.5, 68, 104.9]) {
      expect(toDisplayTemp(fromDisplayTemp(f, 'imperial'), 'imperial')).toBe(f);
    }
  });

  it('never returns −0', () => {
    expect(Object.is(toDisplayTemp(-0.01, 'metric'), -0)).toBe(false);
    expect(Object.is(fromDisplayTemp(32, 'imperial'), -0)).toBe(false);
  });

  it('formats readings with a true minus sign and whole degrees', () => {
    expect(formatTemp(-2, 'metric')).toBe('−2 °C');
    expect(formatTemp(-2, 'imperial')).toBe('28 °F');
    expect(formatTemp(-20, 'imperial')).toBe('−4 °F');
    expect(formatTemp(-0.2, 'metric')).toBe('0 °C');
  });

  it('converts a temperature difference without the 32° offset', () => {
    expect(formatTempDelta(25, 'metric')).toBe('25 °C');
    expect(formatTempDelta(25, 'imperial')).toBe('45 °F');
  });

  it('states range messages in the user units', () => {
    expect(tempRangeMessage(-60, 60, 'metric')).toBe('must be between −60 °C and 60 °C');
    expect(tempRangeMessage(-60, 60, 'imperial')).toBe('must be between −76 °F and 140 °F');
  });
});

describe('length conversion', () => {
  // The international foot is exactly 0.3048 m (1959 international yard and pound agreement).
  it('uses the international foot', () => {
    expect(ftToM(1)).toBe(0.3048);
    expect(mToFt(0.3048)).toBeCloseTo(1, 12);
    expect(mToFt(6.1)).toBeCloseTo(20.013, 3);
  });

  it('round-trips through the display units', () => {
    expect(toDisplayLength(6.1, 'imperial')).toBe(20);
    expect(toDisplayLength(6.1, 'metric')).toBe(6.1);
    expect(fromDisplayLength(20, 'imperial')).toBe(6.096);
    expect(fromDisplayLength(3, 'metric')).toBe(3);
    expect(formatLength(6.1, 'metric')).toBe('6.1 m');
    expect(formatLength(6.1, 'imperial')).toBe('20.0 ft');
  });
});

describe('unit system', () => {
  it('names the symbols', () => {
    expect(tempUnit('metric')).toBe('°C');
    expect(tempUnit('imperial')).toBe('°F');
    expect(lengthUnit('metric')).toBe('m');
    expect(lengthUnit('imperial')).toBe('ft');
  });

  it('reads anything unknown as metric', () => {
    expect(toUnits('imperial')).toBe('imperial');
    expect(toUnits('metric')).toBe('metric');
    expect(toUnits('Imperial')).toBe('metric');
    expect(toUnits(undefined)).toBe('metric');
    expect(toUnits(null)).toBe('metric');
  });
});
