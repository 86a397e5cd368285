// The hourly grid: start and end, stop ownership, moves between zones, drives and drive days.
import { describe, expect, it } from 'vitest';
import { buildGrid } from '../../../src/engine/timeline';
import { dayNumber, formatLocal, localToInstant, offsetMinutes, parseIsoDate } from '../../../src/engine/tz';
import { constantWeather, resolved, run } from '../../reference/plan-helpers';
import type { Plan } from '../../../src/engine/index';

const twoStops = (over: Partial<Plan> = {}): Plan => ({
  bank: { chemistry: 'lifepo4', capacityAh: 300 },
  stops: [
    { name: 'Juniper Mesa', lat: 38.6, lon: -109.8, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 3, weather: constantWeather('2027-10-21', 3, 10) },
    { name: 'Cinder Flat', lat: 35.4, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-24', nights: 2, weather: constantWeather('2027-10-24', 2, 10) },
  ],
  ...over,
});

describe('tz helpers', () => {
  it('parses and rejects dates', () => {
    expect(parseIsoDate('2028-02-29')).toEqual({ y: 2028, m: 2, d: 29 });
    expect(parseIsoDate('2027-02-29')).toBeNull();
    expect(parseIsoDate('2027-13-01')).toBeNull();
    expect(parseIsoDate('27-01-01')).toBeNull();
  });

  it('formats labels with the offset, minutes included', () => {
    expect(formatLocal(Date.UTC(2027, 9, 21, 21), -360)).toBe('2027-10-21T15:00-06:00');
    expect(formatLocal(Date.UTC(2027, 9, 21, 21), 345)).toBe('2027-10-22T02:45+05:45');
    expect(formatLocal(Date.UTC(2027, 9, 21, 21), 0)).toBe('2027-10-21T21:00+00:00');
  });

  it('reads offsets from the platform zone data', () => {
    expect(offsetMinutes('America/Denver', Date.UTC(2027, 9, 21))).toBe(-360);
    expect(offsetMinutes('America/Phoenix', Date.UTC(2027, 9, 21))).toBe(-420);
    expect(offsetMinutes('Asia/Kathmandu', Date.UTC(2027, 9, 21))).toBe(345);
    expect(offsetMinutes('UTC', Date.UTC(2027, 9, 21))).toBe(0);
  });

  it('turns a local wall time into an instant', () => {
    expect(localToInstant('America/Denver', dayNumber('2027-10-21'), 15)).toBe(Date.UTC(2027, 9, 21, 21));
    expect(localToInstant('Asia/Kathmandu', dayNumber('2027-10-21'), 15)).toBe(Date.UTC(2027, 9, 21, 9, 15));
  });
});

describe('grid', () => {
  const f = run(twoStops());
  const times = f.hourly.map((h) => h.time);

  it('starts at the first arrival and ends at the first grid instant at or after 11:00 on the last morning', () => {
    expect(times[0]).toBe('2027-10-21T15:00-06:00');
    expect(times[times.length - 1]).toBe('2027-10-26T10:00-07:00');
    // 2027-10-21 21:00 UTC → 2027-10-26 18:00 UTC.
    expect(f.summary.hoursSimulated).toBe(117);
  });

  it('hands the rows to the next stop at its arrival instant; moving west repeats a clock hour', () => {
    const i = times.indexOf('2027-10-24T15:00-06:00');
    expect(f.hourly[i]!.stop).toBe(0);
    expect(times[i + 1]).toBe('2027-10-24T15:00-07:00');
    expect(f.hourly[i + 1]!.stop).toBe(1);
    expect(f.stops.map((s) => s.name)).toEqual(['Juniper Mesa', 'Cinder Flat']);
  });

  it('moving east skips a clock hour', () => {
    const g = run(
      twoStops({
        stops: [
          { name: 'West', lat: 35.4, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-21', nights: 2 },
          { name: 'East', lat: 38.6, lon: -109.8, timeZone: 'America/Denver', arrive: '2027-10-23', nights: 1 },
        ],
      }),
    );
    const t = g.hourly.map((h) => h.time);
    // East arrives 15:00 MDT = 14:00 MST: the row after 13:00 MST is 15:00 MDT; 14:00 is skipped.
    const i = t.indexOf('2027-10-23T13:00-07:00');
    expect(i).toBeGreaterThan(0);
    expect(t[i + 1]).toBe('2027-10-23T15:00-06:00');
    for (let r = 1; r < t.length; r++) expect(Date.parse(t[r]!) - Date.parse(t[r - 1]!)).toBe(3_600_000);
  });

  it('a zone with a non-whole-hour offset labels rows with minutes after moving into it', () => {
    const g = run({
      bank: { chemistry: 'lifepo4', capacityAh: 100 },
      stops: [
        { name: 'Delhi', lat: 28.6, lon: 77.2, timeZone: 'Asia/Kolkata', arrive: '2027-10-21', nights: 1 },
        { name: 'Pokhara', lat: 28.2, lon: 84, timeZone: 'Asia/Kathmandu', arrive: '2027-10-22', nights: 1 },
      ],
    });
    expect(g.hourly[0]!.time).toBe('2027-10-21T15:00+05:30');
    expect(g.hourly.some((h) => h.time.endsWith(':15+05:45'))).toBe(true);
  });

  it('marks drive hours in the zone of the stop that owns the drive start', () => {
    // The second stop arrives 15:00 MST; a drive at 16:00 that day is read in Phoenix time.
    const g = run(twoStops({ drives: [{ date: '2027-10-24', startHour: 16, hours: 2 }] }));
    const driving = g.hourly.filter((h) => h.driving).map((h) => h.time);
    expect(driving).toEqual(['2027-10-24T16:00-07:00', '2027-10-24T17:00-07:00']);
    // A morning drive that day is read in the first stop's zone (Denver).
    const m = run(twoStops({ drives: [{ date: '2027-10-24', startHour: 9, hours: 1 }] }));
    expect(m.hourly.filter((h) => h.driving).map((h) => h.time)).toEqual(['2027-10-24T09:00-06:00']);
  });

  it('a drive may run past midnight; only its date is a drive day', () => {
    const p = resolved(twoStops({ drives: [{ date: '2027-10-22', startHour: 22, hours: 4 }] }));
    const grid = buildGrid(p.stops, p.drives);
    const drivingRows = [...grid.driving.keys()].filter((r) => grid.driving[r] === 1).map((r) => grid.time[r]);
    expect(drivingRows).toEqual(['2027-10-22T22:00-06:00', '2027-10-22T23:00-06:00', '2027-10-23T00:00-06:00', '2027-10-23T01:00-06:00']);
    for (let r = 0; r < grid.n; r++) expect(grid.driveDay[r] === 1).toBe(grid.time[r]!.startsWith('2027-10-22'));
  });

  it('days are local dates of the owning stop, ascending, with partial first and last days', () => {
    expect(f.days.map((d) => d.date)).toEqual(['2027-10-21', '2027-10-22', '2027-10-23', '2027-10-24', '2027-10-25', '2027-10-26']);
    const perDay = new Map<string, number>();
    for (const h of f.hourly) perDay.set(h.time.slice(0, 10), (perDay.get(h.time.slice(0, 10)) ?? 0) + 1);
    expect(perDay.get('2027-10-21')).toBe(9);
    expect(perDay.get('2027-10-24')).toBe(25); // the repeated 15:00 hour
    expect(perDay.get('2027-10-26')).toBe(11);
  });
});
