import { afterAll, describe, expect, it } from 'vitest';
import {
  formatInstant,
  isTimeZone,
  offsetAt,
  userClock,
  withZoneName,
  zoneClock,
  zoneOffset,
  zoneOr,
  zonePlainName,
  type ZoneClock,
} from '../../src/lib/clock';

// Instants shown in an explicit zone. Check values from the IANA tz database's rules (COMPUTED by
// hand): Vancouver is UTC−8 in winter (PST) and UTC−7 from 02:00 local on the second Sunday of
// March (8 Mar 2026, 10:00 UTC); Auckland is UTC+13 in the southern summer (NZDT); India UTC+05:30.

const saved = process.env.TZ;
afterAll(() => {
  if (saved === undefined) delete process.env.TZ;
  else process.env.TZ = saved;
});

describe('formatInstant', () => {
  it('keeps each text apart by instant, style and zone: the same instant asked again in another zone or style is not the first answer', () => {
    const at = '2026-01-15T20:30:00Z';
    // 20:30 UTC − 8 h = 12:30 in Vancouver (PST); + 13 h = 09:30 next day in Auckland (NZDT); + 5:30 = 02:00 next day in India.
    for (let round = 0; round < 2; round++) {
      expect(formatInstant(at, 'America/Vancouver', 'time')).toBe('12:30');
      expect(formatInstant(at, 'Pacific/Auckland', 'time')).toBe('09:30');
      expect(formatInstant(at, zoneClock('Asia/Kolkata', Date.parse(at)), 'time')).toBe('02:00');
      expect(formatInstant(at, zoneClock('America/Vancouver', Date.parse(at)), 'dayTime')).toBe('Thu 15 Jan, 12:30');
      expect(formatInstant(at, zoneClock('Pacific/Auckland', Date.parse(at)), 'dayTime')).toBe('Fri 16 Jan, 09:30');
    }
  });

  it('shows an instant in the zone asked for, whatever the runtime’s own zone', () => {
    for (const runtime of ['UTC', 'Asia/Tokyo', 'America/Vancouver']) {
      process.env.TZ = runtime;
      // 11:08 UTC − 8 h = 03:08 in Vancouver; + 13 h = 00:08 next day in Auckland.
      expect(formatInstant('2025-12-04T11:08:00Z', 'America/Vancouver', 'time')).toBe('03:08');
      expect(formatInstant('2025-12-04T11:08:00Z', 'America/Vancouver')).toBe('Thu 4 Dec, 03:08');
      expect(formatInstant('2025-12-04T11:08:00Z', 'Pacific/Auckland', 'dayTimeYear')).toBe('Fri 5 Dec 2025, 00:08');
      expect(formatInstant('2025-12-04T11:08:00Z', 'UTC', 'time')).toBe('11:08');
    }
  });

  it('follows daylight saving: 10:00 UTC is 02:00 PST the day before the change and 03:00 PDT on it', () => {
    expect(formatInstant('2026-03-07T10:00:00Z', 'America/Vancouver', 'time')).toBe('02:00');
    expect(formatInstant('2026-03-08T10:00:00Z', 'America/Vancouver', 'time')).toBe('03:00');
    expect(zoneOffset('2026-03-08T10:00:00Z', 'America/Vancouver')).toBe('UTC−07:00');
    expect(zoneOffset('2026-03-07T10:00:00Z', 'America/Vancouver')).toBe('UTC−08:00');
  });

  it('groups by the day in the zone (a late-evening save in Vancouver is the next day in UTC; December 2025, before any change of its rules)', () => {
    // 2026-12-05 05:30 UTC − 8 h = 4 Dec 21:30 in Vancouver.
    expect(formatInstant('2025-12-05T05:30:00Z', 'America/Vancouver', 'dayKey')).toBe('2025-12-04');
    expect(formatInstant('2025-12-05T05:30:00Z', 'UTC', 'dayKey')).toBe('2025-12-05');
  });

  it('reads ms and ISO strings with offsets alike, and shows "—" for nonsense', () => {
    expect(formatInstant(Date.UTC(2025, 11, 4, 11, 8), 'Asia/Kolkata', 'time')).toBe('16:38');
    expect(formatInstant('2025-12-04T03:08-08:00', 'UTC', 'time')).toBe('11:08');
    expect(formatInstant('not a time', 'UTC')).toBe('—');
  });
});

describe('zones', () => {
  it('knows real zone names and falls back to UTC for anything else', () => {
    expect(isTimeZone('America/Vancouver')).toBe(true);
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
    expect(isTimeZone('')).toBe(false);
    expect(isTimeZone(42)).toBe(false);
    expect(zoneOr('Mars/Olympus_Mons')).toBe('UTC');
    expect(zoneOr(null)).toBe('UTC');
  });

  it('names a zone in plain words for e-mails', () => {
    expect(zonePlainName('America/Los_Angeles')).toBe('Los Angeles time');
    expect(zonePlainName('UTC')).toBe('UTC');
    expect(zonePlainName('Etc/GMT+7')).toBe('UTC−07:00'); // POSIX sign: Etc/GMT+7 is seven hours behind UTC.
    expect(withZoneName('2025-12-04T11:00:00Z', 'America/Vancouver')).toBe('Thu 4 Dec, 03:00 Vancouver time (UTC−08:00)');
    expect(withZoneName('2026-12-04T11:00:00Z', 'UTC', 'time')).toBe('11:00 UTC');
  });
});

describe('ZoneClock: a zone’s offsets as one runtime knows them, used by another', () => {
  it('lists the changes around now: Vancouver springs forward at 10:00 UTC on 8 Mar 2026 and falls back at 09:00 UTC on 1 Nov 2026', () => {
    const c = zoneClock('America/Vancouver', Date.parse('2026-06-01T00:00:00Z'));
    expect(c.zone).toBe('America/Vancouver');
    expect(c.changes).toContainEqual([Date.parse('2026-03-08T10:00:00Z'), -420]);
    expect(offsetAt(c, Date.parse('2026-03-08T09:59:00Z'))).toBe(-480);
    expect(offsetAt(c, Date.parse('2026-03-08T10:00:00Z'))).toBe(-420);
    expect(formatInstant('2026-03-08T10:00:00Z', c, 'time')).toBe('03:00');
    expect(zoneClock('Asia/Kolkata', Date.parse('2026-06-01T00:00:00Z'))).toEqual({ zone: 'Asia/Kolkata', offset: 330, changes: [] });
  });

  it('formats by its own table, not the runtime’s rules (a browser whose zone data differs from the server’s)', () => {
    // A table saying Vancouver stays on UTC−7 after 8 Mar 2026 (as a newer zone database might):
    // 21:28 UTC on 4 Dec is then 14:28, whatever this runtime's own rules say.
    const newer: ZoneClock = { zone: 'America/Vancouver', offset: -480, changes: [[Date.parse('2026-03-08T10:00:00Z'), -420]] };
    expect(formatInstant('2026-12-04T21:28:00Z', newer)).toBe('Fri 4 Dec, 14:28');
    expect(zoneOffset('2026-12-04T21:28:00Z', newer)).toBe('UTC−07:00');
  });

  it('is made for a signed-in user with a known zone only', () => {
    expect(userClock(null)).toBeNull();
    expect(userClock({ timeZone: null })).toBeNull();
    expect(userClock({ timeZone: 'Not/A_Zone' })).toBeNull();
    expect(userClock({ timeZone: 'Europe/Berlin' })?.zone).toBe('Europe/Berlin');
  });
});
