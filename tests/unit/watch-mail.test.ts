// The watch e-mail carries the new verdict, the cutoff in the stop's local time (the row's own offset,
// not the server's zone), the day and stop whose weather changed, the advice and the unsubscribe link.
import { describe, expect, it } from 'vitest';
import { watchMail } from '../../src/domain/watch/mail';

describe('watch e-mail', () => {
  it('says what changed, when in local time, where and why', () => {
    const { subject, text } = watchMail({
      tripName: 'Juniper loop',
      headline: 'Runs out Fri 11 Dec at 03:00 at Ridge camp — 5 hours short',
      cutoffAt: '2026-12-11T03:00:00-07:00',
      cutoffStop: 'Ridge camp',
      cutoffZone: 'America/Denver',
      reasons: ['verdict', 'cutoff-appeared'],
      changedDay: { date: '2026-12-10', stop: 'Ridge camp' },
      advice: ['Run the generator 2 hours on Thu afternoon.'],
      tripUrl: 'http://x/trips/1',
      unsubscribeUrl: 'http://x/watch/unsubscribe?t=abc',
    });
    expect(subject).toBe('Juniper loop: Runs out Fri 11 Dec at 03:00 at Ridge camp — 5 hours short');
    expect(text).toContain('03:00 local time at Ridge camp');
    // E-mails name the zone (issue 16, item 12): the stop's zone in words beside the row's own offset.
    expect(text).toContain('Cutoff: Fri 11 Dec, 03:00 local time at Ridge camp (Denver time, UTC−07:00).');
    expect(text).not.toContain('10:00');
    expect(text).toContain('the verdict changed; the bank now cuts off');
    expect(text).toContain('Ridge camp changed the most');
    expect(text).toContain('- Run the generator 2 hours on Thu afternoon.');
    expect(text).toContain('http://x/watch/unsubscribe?t=abc');
  });
  it('says plainly when the bank no longer cuts off', () => {
    const { text } = watchMail({
      tripName: 'T',
      headline: 'Makes it',
      cutoffAt: null,
      cutoffStop: null,
      reasons: ['cutoff-gone'],
      changedDay: null,
      advice: [],
      tripUrl: 'u',
      unsubscribeUrl: 'v',
    });
    expect(text).toContain('The bank does not cut off.');
    expect(text).toContain('the bank no longer cuts off');
  });
  it("names the offset alone when the stop's zone is not known", () => {
    const { text } = watchMail({
      tripName: 'T',
      headline: 'Runs out',
      cutoffAt: '2026-12-11T03:00:00+13:00',
      cutoffStop: 'Bay camp',
      reasons: ['verdict'],
      changedDay: null,
      advice: [],
      tripUrl: 'u',
      unsubscribeUrl: 'v',
    });
    expect(text).toContain('Cutoff: Fri 11 Dec, 03:00 local time at Bay camp (UTC+13:00).');
  });
});
