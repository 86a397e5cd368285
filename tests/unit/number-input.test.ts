// Numbers typed by campers in their own locale: thousands and decimal separators come from
// Intl.NumberFormat's parts for that locale, and a number that could be read two ways is refused.
import { describe, expect, it } from 'vitest';
import { asNumber, parseTypedNumber, separatorsOf } from '../../src/components/ui/form';
import { typedReading } from '../../src/components/ui/NumberField';

const value = (s: string, locale: string) => {
  const r = parseTypedNumber(s, locale);
  return r.kind === 'number' ? r.value : r.kind;
};

describe('separators from Intl', () => {
  it('knows en-US, de-DE and fr-FR', () => {
    expect(separatorsOf('en-US')).toEqual({ group: ',', decimal: '.' });
    expect(separatorsOf('de-DE')).toEqual({ group: '.', decimal: ',' });
    expect(separatorsOf('fr-FR')).toEqual({ group: ' ', decimal: ',' });
  });
});

describe('en-US', () => {
  it('reads a comma as thousands, a dot as the decimal sign', () => {
    expect(value('1,200', 'en-US')).toBe(1200);
    expect(value('12,345,678', 'en-US')).toBe(12345678);
    expect(value('1,200.5', 'en-US')).toBe(1200.5);
    expect(value('1.2', 'en-US')).toBe(1.2);
    expect(value('.5', 'en-US')).toBe(0.5);
    expect(value('-12.5', 'en-US')).toBe(-12.5);
    expect(value('\u221212', 'en-US')).toBe(-12);
  });
  it('reads "1,5" (cannot be thousands) as one and a half', () => {
    expect(value('1,5', 'en-US')).toBe(1.5);
  });
  it('refuses what is not a number', () => {
    expect(value('1,20,0', 'en-US')).toBe('invalid');
    expect(value('12a', 'en-US')).toBe('invalid');
    expect(value('1.2.3,4', 'en-US')).toBe('invalid');
    expect(value('', 'en-US')).toBe('empty');
  });
  it('asNumber hands zod 1200 for "1,200" (it used to be 1.2)', () => {
    Object.defineProperty(globalThis, 'navigator', { value: { language: 'en-US', languages: ['en-US'] }, configurable: true });
    expect(asNumber('1,200')).toBe(1200);
  });
});

describe('de-DE', () => {
  it('reads a dot as thousands, a comma as the decimal sign', () => {
    expect(value('1.200', 'de-DE')).toBe(1200);
    expect(value('1,2', 'de-DE')).toBe(1.2);
    expect(value('1,200', 'de-DE')).toBe(1.2);
    expect(value('1.200,75', 'de-DE')).toBe(1200.75);
    expect(value('-3,5', 'de-DE')).toBe(-3.5);
  });
  it('reads "1.5" (cannot be thousands) as one and a half', () => {
    expect(value('1.5', 'de-DE')).toBe(1.5);
  });
});

describe('fr-FR', () => {
  it('reads spaces as thousands and a comma as the decimal sign', () => {
    expect(value('1 200', 'fr-FR')).toBe(1200);
    expect(value('1\u202f200', 'fr-FR')).toBe(1200);
    expect(value('1 200,5', 'fr-FR')).toBe(1200.5);
    expect(value('0,25', 'fr-FR')).toBe(0.25);
  });
  it('refuses "1.200" as ambiguous with both readings', () => {
    expect(parseTypedNumber('1.200', 'fr-FR')).toEqual({ kind: 'ambiguous', readings: [1200, 1.2] });
    expect(typedReading('1.200', 'W', 'fr-FR').ambiguous).toBe('Did you mean 1200 or 1,2? Type it as one of those.');
  });
  it('reads "1.25" (cannot be thousands) as a decimal', () => {
    expect(value('1.25', 'fr-FR')).toBe(1.25);
  });
  it('a grouping space is never a decimal', () => {
    expect(value('1 20', 'fr-FR')).toBe('invalid');
  });
});

describe('the reading shown beside the box', () => {
  it('shows the plain number when it differs from what was typed', () => {
    expect(typedReading('1,200', 'W', 'en-US')).toEqual({ reads: 'Reads as 1200 W' });
    expect(typedReading('1,200', 'W', 'de-DE')).toEqual({ reads: 'Reads as 1,2 W' });
    expect(typedReading('1200', 'W', 'en-US')).toEqual({});
  });
});
