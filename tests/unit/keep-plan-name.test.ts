import { describe, expect, it } from 'vitest';
import { keptTripName } from '../../src/domain/quick-plan/quick-plan';

describe('the name of a kept quick plan’s trip', () => {
  it('is the place and the month it starts', () => {
    expect(keptTripName('Lake Verna', '2026-12-11')).toBe('Lake Verna, December 2026');
    expect(keptTripName('Lake Verna, Ontario', '2027-01-01')).toBe('Lake Verna, January 2027');
  });

  it('falls back plainly for the placeholder place, no place, or no date', () => {
    expect(keptTripName('Your camp', '2026-12-11')).toBe('My trip, December 2026');
    expect(keptTripName('  ', '2026-05-30')).toBe('My trip, May 2026');
    expect(keptTripName(undefined, undefined)).toBe('My trip');
    expect(keptTripName('Mesa camp', 'soon')).toBe('Mesa camp');
  });

  it('fits the trip name’s 80 characters', () => {
    expect(keptTripName('x'.repeat(100), '2026-12-11').length).toBe(80);
  });
});
