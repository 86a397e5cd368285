import { describe, expect, it } from 'vitest';
import { noBasisText, storedOnPhone, type StoredFacts } from '../../src/features/offline/stored';

// Issue 16, item 19: the trip page said the trip "and its latest forecast are saved on this phone" right
// above "no saved forecast on this phone". The sentence now follows what the service worker says it keeps.

const base: StoredFacts = { online: true, pages: [], savedCopy: false, tripId: 't1', latest: null, forecastCount: 0 };

describe('what the trip page says is kept on the phone', () => {
  it('never claims a forecast for a trip that has none', () => {
    const text = storedOnPhone({ ...base, pages: ['/trips', '/trips/t1'] });
    expect(text).toBe(
      'Kept on this phone for use without signal: this trip and its check-ins. It has no saved forecast yet — save one while you have signal to check in against it without signal.',
    );
    expect(text).not.toMatch(/latest/);
    expect(noBasisText(0)).toBe('This trip has no saved forecast yet, so a check-in is re-forecast when it reaches the server.');
  });

  it('names the latest saved forecast when its page is kept, and says older ones need signal', () => {
    const pages = ['/trips/t1', '/trips/t1/forecasts/f2'];
    expect(storedOnPhone({ ...base, pages, latest: { id: 'f2', name: 'Before leaving' }, forecastCount: 1 })).toBe(
      'Kept on this phone for use without signal: this trip, its check-ins and its latest saved forecast, “Before leaving”.',
    );
    expect(storedOnPhone({ ...base, pages, latest: { id: 'f2', name: 'Before leaving' }, forecastCount: 3 })).toMatch(
      /“Before leaving”\. Older saved forecasts open only with signal\.$/,
    );
  });

  it('says when the latest forecast or the trip itself is not on the phone', () => {
    expect(
      storedOnPhone({
        ...base,
        pages: ['/trips/t1', '/trips/t1/forecasts/f1'],
        latest: { id: 'f2', name: 'After lunch' },
        forecastCount: 2,
      }),
    ).toBe(
      'Kept on this phone for use without signal: this trip and its check-ins. Its latest saved forecast, “After lunch”, is not on this phone yet. Older saved forecasts open only with signal.',
    );
    expect(storedOnPhone({ ...base, pages: ['/trips/other'] })).toMatch(/^This trip is not kept on this phone/);
    expect(noBasisText(2)).toMatch(/^The latest saved forecast of this trip is not on this phone/);
  });

  it('says it is still keeping before the service worker answers, and what holds without signal', () => {
    expect(storedOnPhone({ ...base, pages: null })).toBe('Keeping this trip on this phone for use without signal…');
    expect(storedOnPhone({ ...base, pages: null, savedCopy: true })).toBe('This is the copy of the trip kept on this phone.');
    expect(storedOnPhone({ ...base, online: false, pages: null })).toMatch(/^No signal: check-ins are worked out on this phone/);
  });
});
