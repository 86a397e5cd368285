import { describe, expect, it } from 'vitest';
import { describeSpan, emptyTrip, newDrive, newStop, stopDays, tripFormSchema, tripSpan } from '../../src/domain/trips/trip-form';

const stop = (over: Record<string, unknown> = {}) => ({
  ...newStop(),
  name: 'Mesa camp',
  lat: 35.6,
  lon: -105.9,
  timeZone: 'America/Denver',
  arrive: '2027-10-21',
  nights: 3,
  ...over,
});

const trip = (over: Record<string, unknown> = {}) => ({ ...emptyTrip('rig-1'), name: 'High desert', ...over });
const issues = (v: unknown) => {
  const r = tripFormSchema.safeParse(v);
  return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
};

describe('trip planner rules', () => {
  it('accepts two stops in order with a drive between them', () => {
    const t = trip({
      stops: [stop(), stop({ name: 'Juniper flat', arrive: '2027-10-24', nights: 2 })],
      drives: [{ date: '2027-10-24', startHour: 10, hours: 3 }],
    });
    expect(issues(t)).toEqual([]);
  });

  it('names a stop that arrives before the one before it leaves', () => {
    const t = trip({ stops: [stop(), stop({ arrive: '2027-10-22' })] });
    expect(issues(t)).toEqual(['stops.1.arrive: overlaps the stop before, which you leave on Sun 24 Oct 2027.']);
  });

  it('names a stop out of order', () => {
    const t = trip({ stops: [stop(), stop({ arrive: '2027-10-20' })] });
    expect(issues(t)[0]).toMatch(/^stops\.1\.arrive: must be after the stop before/);
  });

  it('shows the order problem together with a field problem elsewhere', () => {
    const t = trip({
      stops: [stop({ weather: [{ date: '2027-10-21', cloudOktas: 0, highC: Number.NaN, lowC: -2 }] }), stop({ arrive: '2027-10-22' })],
    });
    const found = issues(t);
    expect(found.some((i) => i.startsWith('stops.0.weather.0.highC:'))).toBe(true);
    expect(found.some((i) => i.startsWith('stops.1.arrive: overlaps'))).toBe(true);
  });

  it('names a drive outside the trip, a low above the high, and generator hours backwards', () => {
    const t = trip({
      stops: [stop({ generatorHours: [20, 8], weather: [{ date: '2027-10-21', cloudOktas: 2, highC: 5, lowC: 9 }] })],
      drives: [{ date: '2027-11-01', startHour: 9, hours: 4 }],
    });
    expect(issues(t).sort()).toEqual([
      'drives.0.date: Drive 1 starts at 09:00 on Mon 1 Nov, after the trip ends (11:00 on Sun 24 Oct): a drive must start inside the trip.',
      'stops.0.generatorHours: Generator hours must start before they stop.',
      'stops.0.weather.0.lowC: must not be above the high',
    ]);
  });

  it('names missing coordinates, a bad time zone and no rig', () => {
    const t = trip({ rigId: '', stops: [stop({ lat: undefined, lon: Number.NaN, timeZone: 'Mars/Olympus' })] });
    const paths = issues(t).map((i) => i.split(':')[0]);
    expect(paths).toEqual(expect.arrayContaining(['rigId', 'stops.0.lat', 'stops.0.lon', 'stops.0.timeZone']));
  });
});

describe('itinerary helpers', () => {
  it('lists a stop’s days from arrival to the departure morning', () => {
    expect(stopDays('2027-10-30', 3)).toEqual(['2027-10-30', '2027-10-31', '2027-11-01', '2027-11-02']);
    expect(stopDays('', 3)).toEqual([]);
    expect(stopDays('2027-10-30', Number.NaN)).toEqual([]);
  });

  it('starts the next stop on the day the one before ends', () => {
    expect(newStop({ arrive: '2027-10-21', nights: 3 }).arrive).toBe('2027-10-24');
    expect(newStop({ arrive: '', nights: 3 }).arrive).toBe('');
    expect(newDrive([{ arrive: '2027-12-30', nights: 3 }])).toEqual({ date: '2028-01-02', startHour: 10, hours: 3 });
  });

  it('spans the trip from the first arrival to the last departure', () => {
    const stops = [stop(), stop({ arrive: '2027-10-24', nights: 2 })];
    expect(tripSpan(stops)).toEqual({ from: '2027-10-21', to: '2027-10-26', nights: 5 });
    expect(describeSpan(stops as { arrive: string; nights: number }[])).toBe('Thu 21 Oct – Tue 26 Oct 2027 · 5 nights');
    expect(tripSpan([])).toBeNull();
  });
});
