import { describe, expect, it } from 'vitest';
import { daysLeft, describeDeletion, purgeBefore, RESTORE_DAYS } from '../../src/domain/shared/deletion';

const DAY = 86_400_000;
const at = Date.parse('2026-12-04T12:00:00.000Z');

describe('what goes with a deletion, in words', () => {
  it('names each kind with its count, singular and plural, and leaves out what there is none of', () => {
    expect(describeDeletion({ trips: 2, forecasts: 5, checkIns: 3 })).toBe('2 trips, 5 saved forecasts, 3 check-ins');
    expect(describeDeletion({ loads: 1, trips: 1, forecasts: 1, checkIns: 1, logs: 1 })).toBe(
      '1 load, 1 trip, 1 saved forecast, 1 check-in, 1 monitor log',
    );
    expect(describeDeletion({ loads: 4, trips: 0, forecasts: 0, checkIns: 0, logs: 0 })).toBe('4 loads');
    expect(describeDeletion({ forecasts: 0, checkIns: 0 })).toBe('nothing else');
  });
});

describe('the restore window', () => {
  it('is 30 days: 30 left on the day of deleting, 1 on the last day, 0 after', () => {
    expect(RESTORE_DAYS).toBe(30);
    expect(daysLeft(new Date(at).toISOString(), at)).toBe(30);
    expect(daysLeft(new Date(at - 29.5 * DAY).toISOString(), at)).toBe(1);
    expect(daysLeft(new Date(at - 30 * DAY).toISOString(), at)).toBe(0);
    expect(daysLeft(new Date(at - 45 * DAY).toISOString(), at)).toBe(0);
    expect(daysLeft('not a date', at)).toBe(0);
  });

  it('purges what was deleted before 30 days ago', () => {
    expect(purgeBefore(at)).toBe('2026-11-04T12:00:00.000Z');
  });
});
