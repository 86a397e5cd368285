// The watch e-mail's unsubscribe token: it names one person and one trip, and only the app's secret makes one.
import { describe, expect, it } from 'vitest';
import { readUnsubscribe, signUnsubscribe } from '../../src/server/watch';

const secret = 'a-test-secret-of-at-least-thirty-two-chars';
const claim = { tripId: 'trip-7', userId: 'user-3' };

describe('unsubscribe token', () => {
  it('reads back the person and trip it was signed for', () => {
    expect(readUnsubscribe(secret, signUnsubscribe(secret, claim))).toEqual(claim);
  });
  it('refuses a token signed with another secret', () => {
    expect(readUnsubscribe(secret, signUnsubscribe('another-secret-of-at-least-thirty-two', claim))).toBeNull();
  });
  it('refuses a token whose trip was changed', () => {
    const [, sig] = signUnsubscribe(secret, claim).split('.');
    const forged = `${Buffer.from(JSON.stringify(['trip-8', 'user-3'])).toString('base64url')}.${sig}`;
    expect(readUnsubscribe(secret, forged)).toBeNull();
  });
  it('refuses malformed tokens without throwing', () => {
    for (const t of ['', 'abc', 'a.b.c', '.', 'x'.repeat(700)]) expect(readUnsubscribe(secret, t)).toBeNull();
  });
});
