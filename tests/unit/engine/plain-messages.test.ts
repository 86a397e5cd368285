// Messages a camper reads say things in plain words: no "IANA", no date format codes or year ranges,
// and cloud cover in oktas only beside a plain sky name.
import { describe, expect, it } from 'vitest';
import { stopSchema } from '../../../src/engine/schema';
import { assumedMessage } from '../../../src/engine/weather';

const STOP = { name: 'Mesa camp', lat: 36.1, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-20', nights: 2 };

function messagesOf(input: unknown): string[] {
  const r = stopSchema.safeParse(input);
  return r.success ? [] : r.error.issues.map((i) => i.message);
}

describe('plain words in messages', () => {
  it('an unknown time zone is named without "IANA"', () => {
    const [message] = messagesOf({ ...STOP, timeZone: 'Mars/Olympus' });
    expect(message).toBe('must be a time zone we know, such as America/Denver');
  });
  it('an impossible date gives an example instead of a format code and a year range', () => {
    expect(messagesOf({ ...STOP, arrive: '2027-02-30' })).toEqual(['must be a real calendar date, such as 2027-10-21']);
    expect(messagesOf({ ...STOP, arrive: '1890-06-01' })).toEqual(['must be a real calendar date, such as 2027-10-21']);
    expect(messagesOf({ ...STOP, arrive: 20271020 })).toEqual(['must be a date, such as 2027-10-21']);
  });
  it('the assumed-weather note names the sky before its oktas', () => {
    expect(assumedMessage('Test camp', 0)).toBe('No weather given for Test camp on 1970-01-01: assumed partly cloudy skies (4 oktas), a high of 20 °C and a low of 10 °C.');
  });
});
