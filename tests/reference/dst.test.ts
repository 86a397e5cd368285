// Daylight saving time (forecast-engine.md, "Time and grid"): the grid is absolute, rows are
// exactly 3600 s apart, and labels carry the stop's offset, so a spring-forward night skips a
// clock hour and a fall-back night repeats one — every instant exactly once. Transition dates
// are the 2027 rules of the IANA tz database (US: second Sunday of March / first Sunday of
// November; EU: last Sundays of March and October; New South Wales: first Sundays of April and October).
import { describe, expect, it } from 'vitest';
import { basePlan, run } from './plan-helpers';

const HOUR = 3_600_000;

function trip(timeZone: string, arrive: string, arriveHour = 15) {
  return run(basePlan({ stop: { timeZone, arrive, nights: 2, arriveHour, lat: 40, lon: -105 } }));
}

function expectEveryInstantOnce(times: string[]) {
  const instants = times.map((t) => Date.parse(t));
  for (const x of instants) expect(Number.isFinite(x)).toBe(true);
  for (let i = 1; i < instants.length; i++) expect(instants[i]! - instants[i - 1]!).toBe(HOUR);
  expect(new Set(times).size).toBe(times.length);
}

describe('spring forward (America/Denver, 2027-03-14 02:00 MST → 03:00 MDT)', () => {
  const f = trip('America/Denver', '2027-03-13');
  const times = f.hourly.map((h) => h.time);

  it('rows are consecutive and exactly 3600 s apart, each instant once', () => {
    expectEveryInstantOnce(times);
    // 2027-03-13 15:00 MST (22:00 UTC) to 2027-03-15 11:00 MDT (17:00 UTC): 43 hours.
    expect(times[0]).toBe('2027-03-13T15:00-07:00');
    expect(times[times.length - 1]).toBe('2027-03-15T10:00-06:00');
    expect(f.summary.hoursSimulated).toBe(43);
  });

  it('skips the 02:00 clock hour and changes the offset', () => {
    const i = times.indexOf('2027-03-14T01:00-07:00');
    expect(i).toBeGreaterThan(0);
    expect(times[i + 1]).toBe('2027-03-14T03:00-06:00');
    expect(times.some((t) => t.startsWith('2027-03-14T02:'))).toBe(false);
  });

  it('the local day has 23 rows', () => {
    expect(times.filter((t) => t.startsWith('2027-03-14')).length).toBe(23);
  });

  it('an arrival hour inside the gap means the first instant after it', () => {
    const g = trip('America/Denver', '2027-03-14', 2);
    expect(g.hourly[0]!.time).toBe('2027-03-14T03:00-06:00');
  });
});

describe('fall back (America/Denver, 2027-11-07 02:00 MDT → 01:00 MST)', () => {
  const f = trip('America/Denver', '2027-11-06');
  const times = f.hourly.map((h) => h.time);

  it('rows are consecutive and exactly 3600 s apart, each instant once', () => {
    expectEveryInstantOnce(times);
    // 2027-11-06 15:00 MDT (21:00 UTC) to 2027-11-08 11:00 MST (18:00 UTC): 45 hours.
    expect(times[0]).toBe('2027-11-06T15:00-06:00');
    expect(times[times.length - 1]).toBe('2027-11-08T10:00-07:00');
    expect(f.summary.hoursSimulated).toBe(45);
  });

  it('repeats the 01:00 clock hour, once per offset', () => {
    const i = times.indexOf('2027-11-07T01:00-06:00');
    expect(i).toBeGreaterThan(0);
    expect(times[i + 1]).toBe('2027-11-07T01:00-07:00');
    expect(times[i + 2]).toBe('2027-11-07T02:00-07:00');
  });

  it('the local day has 25 rows, and both 01:00 rows use the same ASHRAE hour', () => {
    expect(times.filter((t) => t.startsWith('2027-11-07')).length).toBe(25);
    const i = times.indexOf('2027-11-07T01:00-06:00');
    expect(f.hourly[i]!.ambientC).toBe(f.hourly[i + 1]!.ambientC);
  });

  it('an arrival hour inside the overlap means the earlier instant', () => {
    const g = trip('America/Denver', '2027-11-07', 1);
    expect(g.hourly[0]!.time).toBe('2027-11-07T01:00-06:00');
    expect(g.hourly[1]!.time).toBe('2027-11-07T01:00-07:00');
  });
});

describe.each([
  ['Europe/Berlin', '2027-03-27', '2027-03-28', 23, '+01:00', '+02:00'],
  ['Europe/Berlin', '2027-10-30', '2027-10-31', 25, '+02:00', '+01:00'],
  ['Australia/Sydney', '2027-04-03', '2027-04-04', 25, '+11:00', '+10:00'],
  ['Australia/Sydney', '2027-10-02', '2027-10-03', 23, '+10:00', '+11:00'],
])('%s across %s night', (zone, arrive, day, rows, before, after) => {
  const f = trip(zone, arrive);
  const times = f.hourly.map((h) => h.time);
  it(`every instant once; ${day} has ${rows} rows; offset ${before} → ${after}`, () => {
    expectEveryInstantOnce(times);
    expect(times.filter((t) => t.startsWith(day)).length).toBe(rows);
    expect(times[0]!.endsWith(before)).toBe(true);
    expect(times[times.length - 1]!.endsWith(after)).toBe(true);
  });
});
