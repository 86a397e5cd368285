import { describe, expect, it } from 'vitest';
import { flippedSign } from '../../src/components/ui/SignToggle';
import { parseTypedNumber } from '../../src/components/ui/form';

describe('flippedSign: the ± button beside a signed number box', () => {
  it('puts a minus in front and takes it off again', () => {
    expect(flippedSign('109.55')).toBe('-109.55');
    expect(flippedSign('-109.55')).toBe('109.55');
    expect(flippedSign(flippedSign('4'))).toBe('4');
  });
  it('takes off a typographic minus and replaces a plus', () => {
    expect(flippedSign('−4')).toBe('4');
    expect(flippedSign('+12')).toBe('-12');
  });
  it('starts an empty box with the minus, ready for the digits', () => {
    expect(flippedSign('')).toBe('-');
  });
  it('keeps what the locale reader makes of the digits: "1.234,5" in de-DE becomes −1234.5', () => {
    expect(parseTypedNumber(flippedSign('1.234,5'), 'de-DE')).toEqual({ kind: 'number', value: -1234.5 });
    expect(parseTypedNumber(flippedSign('1,200'), 'en-US')).toEqual({ kind: 'number', value: -1200 });
  });
});
