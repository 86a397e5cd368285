import { describe, expect, it } from 'vitest';
import { driveIssues } from '../../src/domain/trips/drives';
import { tripInputSchema } from '../../src/domain/trips/trips.schema';

// The invented two-stop trip of the trips tests: Mesa camp (Denver time, MDT = UTC−6 in October)
// for 3 nights from Thu 21 Oct 2027, then Canyon rim (Phoenix time, MST = UTC−7) from 16:00 on Sun 24 Oct.
const stops = [
  { name: 'Mesa camp', lat: 35.6, lon: -105.9, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 3 },
  { name: 'Canyon rim', lat: 36.06, lon: -112.14, timeZone: 'America/Phoenix', arrive: '2027-10-24', nights: 2, arriveHour: 16 },
];
const trip = (drives: { date: string; startHour: number; hours: number }[]) => ({ rigId: 'rig-1', name: 'October high desert', stops, drives });
const issuesOf = (drives: { date: string; startHour: number; hours: number }[]) => {
  const r = tripInputSchema.safeParse(trip(drives));
  return r.success ? [] : r.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
};

describe('where a drive may lie in a trip', () => {
  it('refuses a 30-hour drive that would run past the next stop’s arrival, naming drives.0.hours in plain words', () => {
    const issues = issuesOf([{ date: '2027-10-24', startHour: 9, hours: 30 }]);
    expect(issues.map((i) => i.path)).toEqual(['drives.0.hours']);
    // 09:00 MDT = 15:00 UTC; arrival 16:00 MST = 23:00 UTC: 8 hours between them.
    expect(issues[0]!.message).toContain('Drive 1 would still be on the road when you arrive at Canyon rim (16:00 on Sun 24 Oct)');
    expect(issues[0]!.message).toContain('at most 8 hours from 09:00');
  });

  it('accepts a drive that ends at the arrival, refuses one hour more', () => {
    expect(issuesOf([{ date: '2027-10-24', startHour: 9, hours: 4 }])).toEqual([]);
    expect(issuesOf([{ date: '2027-10-24', startHour: 9, hours: 8 }])).toEqual([]);
    expect(issuesOf([{ date: '2027-10-24', startHour: 9, hours: 9 }]).map((i) => i.path)).toEqual(['drives.0.hours']);
  });

  it('refuses a drive starting before the first arrival or after the trip, on drives.N.date', () => {
    const before = issuesOf([{ date: '2027-10-21', startHour: 10, hours: 2 }]);
    expect(before.map((i) => i.path)).toEqual(['drives.0.date']);
    expect(before[0]!.message).toContain('before the trip begins (arrival at Mesa camp at 15:00 on Thu 21 Oct)');
    const after = issuesOf([{ date: '2027-10-26', startHour: 12, hours: 2 }]);
    expect(after.map((i) => i.path)).toEqual(['drives.0.date']);
    expect(after[0]!.message).toContain('after the trip ends (11:00 on Tue 26 Oct)');
  });

  it('lets only the drive home on the last morning run past the trip’s end', () => {
    expect(issuesOf([{ date: '2027-10-26', startHour: 9, hours: 30 }])).toEqual([]);
    // 20:00 on Mon 25 Oct at Canyon rim to the end at 11:00 on Tue 26 Oct: 15 hours.
    const late = issuesOf([{ date: '2027-10-25', startHour: 20, hours: 20 }]);
    expect(late.map((i) => i.path)).toEqual(['drives.0.hours']);
    expect(late[0]!.message).toContain('at most 15 hours from 20:00');
  });

  it('refuses two drives that overlap, on the later one’s start', () => {
    const issues = issuesOf([
      { date: '2027-10-22', startHour: 9, hours: 4 },
      { date: '2027-10-22', startHour: 11, hours: 2 },
    ]);
    expect(issues.map((i) => i.path)).toEqual(['drives.1.startHour']);
    expect(issues[0]!.message).toContain('drive 1 (09:00 on Fri 22 Oct, 4 hours) is still on the road');
    expect(issuesOf([
      { date: '2027-10-22', startHour: 9, hours: 4 },
      { date: '2027-10-22', startHour: 13, hours: 2 },
    ])).toEqual([]);
  });

  it('leaves stops out of order to the stop rules', () => {
    const swapped = [stops[1]!, stops[0]!];
    expect(driveIssues(swapped, [{ date: '2027-10-24', startHour: 9, hours: 30 }])).toEqual([]);
  });
});
