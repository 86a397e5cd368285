// The trip watch's rules (issue #20): thresholds are the issue's own (verdict change, cutoff ≥ 3 h,
// lowest SOC ≥ 10 points, one mail per person per 12 h, watch from 16 days before arrival).
import { describe, expect, it } from 'vitest';
import { dueForRun, inWatchWindow, mayMail, watchChanges, watchedByDefault, type WatchAnswer } from '../../src/domain/watch/change';

const H = 3_600_000;
const D = 24 * H;
const t0 = Date.UTC(2026, 11, 10, 3, 0);
const base: WatchAnswer = { status: 'runs-out', cutoffAtMs: t0, lowestPct: 20 };

describe('watchChanges', () => {
  it('says nothing with no answer seen yet', () => {
    expect(watchChanges(null, base)).toEqual([]);
  });
  it('says nothing when the answer is the same or moved a little', () => {
    expect(watchChanges(base, { ...base })).toEqual([]);
    expect(watchChanges(base, { ...base, cutoffAtMs: t0 + 2 * H, lowestPct: 29 })).toEqual([]);
  });
  it('tells a verdict change', () => {
    expect(watchChanges({ status: 'makes-it', cutoffAtMs: null, lowestPct: 41 }, base)).toEqual([
      'verdict',
      'cutoff-appeared',
      'lowest-moved',
    ]);
    expect(watchChanges(base, { ...base, status: 'below-reserve' })).toEqual(['verdict']);
  });
  it('tells a cutoff moving 3 hours or more, either way', () => {
    expect(watchChanges(base, { ...base, cutoffAtMs: t0 + 3 * H })).toEqual(['cutoff-moved']);
    expect(watchChanges(base, { ...base, cutoffAtMs: t0 - 5 * H })).toEqual(['cutoff-moved']);
  });
  it('tells a cutoff disappearing', () => {
    expect(watchChanges(base, { ...base, cutoffAtMs: null })).toEqual(['cutoff-gone']);
  });
  it('tells the lowest SOC moving 10 points or more', () => {
    expect(watchChanges(base, { ...base, lowestPct: 30 })).toEqual(['lowest-moved']);
    expect(watchChanges(base, { ...base, lowestPct: 9.5 })).toEqual(['lowest-moved']);
  });
  it('never reports a change from a figure that is not a number', () => {
    expect(watchChanges(base, { ...base, lowestPct: Number.NaN })).toEqual([]);
  });
});

describe('mail gap, window and schedule', () => {
  it('mails once per 12 hours at most', () => {
    expect(mayMail(null, t0)).toBe(true);
    expect(mayMail(t0, t0 + 11 * H + 59 * 60_000)).toBe(false);
    expect(mayMail(t0, t0 + 12 * H)).toBe(true);
  });
  it('watches from 16 days before the first arrival until the trip ends', () => {
    const arrive = t0 + 20 * D;
    const end = arrive + 5 * D;
    expect(inWatchWindow(arrive, end, arrive - 16 * D - 1)).toBe(false);
    expect(inWatchWindow(arrive, end, arrive - 16 * D)).toBe(true);
    expect(inWatchWindow(arrive, end, end - 1)).toBe(true);
    expect(inWatchWindow(arrive, end, end)).toBe(false);
  });
  it('is on by default for trips starting within 21 days that have not ended', () => {
    const arrive = t0 + 21 * D;
    expect(watchedByDefault(arrive, arrive + D, t0)).toBe(true);
    expect(watchedByDefault(arrive + 1, arrive + D, t0)).toBe(false);
    expect(watchedByDefault(t0 - 2 * D, t0 - D, t0)).toBe(false);
  });
  it('is due after the interval has passed', () => {
    expect(dueForRun(null, t0, 360)).toBe(true);
    expect(dueForRun(t0, t0 + 359 * 60_000, 360)).toBe(false);
    expect(dueForRun(t0, t0 + 360 * 60_000, 360)).toBe(true);
  });
});
