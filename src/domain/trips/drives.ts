// Where a drive may lie in a trip. Pure (no I/O), zod-free; used by the trip schema (form and API)
// and by the server's itinerary check on the trip as a PATCH would leave it.
//
// The model: a stop owns the hours from its arrival to the next stop's arrival (the engine's
// timeline), and a drive adds alternator charging in its hours. So a drive lies inside one stop's
// time: it starts inside the trip and ends by the next stop's arrival (the drive itself is the
// approach to that stop; running past the arrival would charge through the next camp's hours and
// nights). The last stop has no next arrival: a drive there ends by the trip's end (11:00 on the
// last morning), except the drive home that starts on that last morning, whose hours past the end
// the forecast ignores. Two drives may not overlap.
import { dayNumber, HOUR_MS, isoDate, isValidTimeZone, planTimeline } from '../../engine/light';
import { formatDate } from '../../lib/format';

export interface DriveStop {
  name?: string | undefined;
  timeZone: string;
  arrive: string;
  nights: number;
  arriveHour?: number | undefined;
}

export interface DriveTime {
  date: string;
  startHour: number;
  hours: number;
}

export interface DriveIssue {
  path: (string | number)[];
  message: string;
}

const ISO = /^\d{4}-\d{2}-\d{2}$/;
const isDate = (s: unknown): s is string => typeof s === 'string' && ISO.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`));

const clock = (hour: number) => `${String(hour).padStart(2, '0')}:00`;
const when = (hour: number, date: string) => `${clock(hour)} on ${formatDate(date, false)}`;
const hoursWord = (n: number) => `${n} ${n === 1 ? 'hour' : 'hours'}`;

/** True when the stops can be laid on a timeline: readable dates and zones, each arriving after the one before has left. */
function readable(stops: readonly DriveStop[]): boolean {
  if (stops.length === 0) return false;
  return stops.every((s, i) => {
    if (!isDate(s.arrive) || !Number.isInteger(s.nights) || s.nights < 1 || !isValidTimeZone(s.timeZone)) return false;
    const prev = stops[i - 1];
    return !prev || dayNumber(s.arrive) >= dayNumber(prev.arrive) + prev.nights;
  });
}

/**
 * The problems with a trip's drives, each naming its field (`drives.0.hours`) in plain words; empty
 * when every drive lies inside the trip, ends by the next stop's arrival and overlaps no other drive.
 * Stops that are out of order or unreadable are left to the stop rules (no drive issues then).
 */
export function driveIssues(stops: readonly DriveStop[], drives: readonly DriveTime[]): DriveIssue[] {
  if (drives.length === 0 || !readable(stops)) return [];
  if (!drives.every((d) => isDate(d.date) && Number.isInteger(d.startHour) && Number.isInteger(d.hours) && d.hours >= 1)) return [];
  const withHours = stops.map((s) => ({ ...s, arriveHour: s.arriveHour ?? 15 }));
  const tl = planTimeline(withHours, drives as DriveTime[]);
  const first = withHours[0]!;
  const last = withHours[withHours.length - 1]!;
  const lastMorning = isoDate(dayNumber(last.arrive) + last.nights);
  const issues: DriveIssue[] = [];

  tl.drives.forEach((t, i) => {
    const d = drives[i]!;
    const label = `Drive ${i + 1}`;
    const starts = when(d.startHour, d.date);
    if (t.startMs < tl.startMs) {
      issues.push({ path: ['drives', i, 'date'], message: `${label} starts at ${starts}, before the trip begins (arrival at ${first.name || 'the first stop'} at ${when(first.arriveHour, first.arrive)}): a drive must start inside the trip.` });
      return;
    }
    if (t.startMs >= tl.endMs) {
      issues.push({ path: ['drives', i, 'date'], message: `${label} starts at ${starts}, after the trip ends (11:00 on ${formatDate(lastMorning, false)}): a drive must start inside the trip.` });
      return;
    }
    const next = tl.arrivals.findIndex((a, k) => k > 0 && a > t.startMs);
    if (next > 0) {
      const arrival = tl.arrivals[next]!;
      if (t.endMs > arrival) {
        const stop = withHours[next]!;
        const most = Math.floor((arrival - t.startMs) / HOUR_MS);
        const fix = most >= 1 ? `at most ${hoursWord(most)} from ${clock(d.startHour)}` : 'start it earlier';
        issues.push({
          path: ['drives', i, 'hours'],
          message: `${label} would still be on the road when you arrive at ${stop.name || `stop ${next + 1}`} (${when(stop.arriveHour, stop.arrive)}): a drive ends by the next stop's arrival, so ${fix}.`,
        });
      }
    } else if (t.endMs > tl.endMs && d.date !== lastMorning) {
      const most = Math.floor((tl.endMs - t.startMs) / HOUR_MS);
      issues.push({
        path: ['drives', i, 'hours'],
        message: `${label} runs past the end of the trip (11:00 on ${formatDate(lastMorning, false)}): only the drive home on that morning may, so ${most >= 1 ? `at most ${hoursWord(most)} from ${clock(d.startHour)}` : 'start it earlier'}.`,
      });
    }
  });

  // Overlaps: the later-starting drive of a pair carries the issue.
  const order = tl.drives.map((t, i) => ({ ...t, i })).sort((a, b) => a.startMs - b.startMs || a.i - b.i);
  for (let k = 1; k < order.length; k++) {
    const cur = order[k]!;
    const earlier = order.slice(0, k).find((o) => o.endMs > cur.startMs);
    if (!earlier) continue;
    const e = drives[earlier.i]!;
    const c = drives[cur.i]!;
    issues.push({
      path: ['drives', cur.i, 'startHour'],
      message: `Drive ${cur.i + 1} starts at ${when(c.startHour, c.date)} while drive ${earlier.i + 1} (${when(e.startHour, e.date)}, ${hoursWord(e.hours)}) is still on the road. Two drives cannot overlap.`,
    });
  }
  return issues;
}
