// The absolute hourly grid of a trip (forecast-engine.md, "Timeline" and "Time and grid"):
// rows exactly 3600 s apart from the first arrival, each owned by the last stop that has
// arrived by the row's start and labelled in that stop's local time with its UTC offset.
import { dayNumber, formatLocal, HOUR_MS, localToInstant, offsetsAlong } from './tz';

interface StopTime {
  timeZone: string;
  arrive: string;
  nights: number;
  arriveHour: number;
}
interface DriveTime {
  date: string;
  startHour: number;
  hours: number;
}

/** Instants that frame a trip: start, end, arrivals and drives (ms since the epoch, UTC). */
export interface TripTimeline {
  startMs: number;
  /** End of the last row (start + hours·3600 s): the first grid instant at or after 11:00 local on the last morning. */
  endMs: number;
  hours: number;
  arrivals: number[];
  drives: { startMs: number; endMs: number; day: number }[];
}

/** Computes the trip's frame: first arrival, end instant, row count, arrival and drive instants. */
export function planTimeline(stops: StopTime[], drives: DriveTime[]): TripTimeline {
  const arrivals = stops.map((s) => localToInstant(s.timeZone, dayNumber(s.arrive), s.arriveHour));
  const startMs = arrivals[0]!;
  const last = stops[stops.length - 1]!;
  const endLocal = localToInstant(last.timeZone, dayNumber(last.arrive) + last.nights, 11);
  const hours = Math.max(1, Math.ceil((endLocal - startMs) / HOUR_MS));
  const arriveDays = stops.map((s) => dayNumber(s.arrive));
  const driveTimes = drives.map((d) => {
    const day = dayNumber(d.date);
    // A drive's clock time is read in the zone of the stop that owns that instant: start from
    // the last stop that has arrived by that date and walk back while it has not yet arrived.
    let s = stops.length - 1;
    while (s > 0 && arriveDays[s]! > day) s--;
    let t = localToInstant(stops[s]!.timeZone, day, d.startHour);
    while (s > 0 && t < arrivals[s]!) {
      s--;
      t = localToInstant(stops[s]!.timeZone, day, d.startHour);
    }
    return { startMs: t, endMs: t + d.hours * HOUR_MS, day };
  });
  return { startMs, endMs: startMs + hours * HOUR_MS, hours, arrivals, drives: driveTimes };
}

/** One trip's rows, as parallel typed arrays (row r covers [startMs + r·1h, startMs + (r+1)·1h)). */
export interface Grid {
  timeline: TripTimeline;
  n: number;
  startMs: number;
  /** Owning stop index. */
  stop: Uint16Array;
  /** UTC offset of the owning stop's zone at the row start, minutes. */
  offsetMin: Int32Array;
  /** Local day number (days since 1970-01-01) of the row start in the owning zone. */
  localDay: Int32Array;
  /** Local clock hour 0..23 of the row start. */
  localHour: Uint8Array;
  /** 1 when the row's start falls inside a drive. */
  driving: Uint8Array;
  /** 1 when the row's local date is a drive's date (a drive day for loads). */
  driveDay: Uint8Array;
  /** ISO 8601 label with offset, e.g. `2027-10-21T15:00-06:00`. */
  time: string[];
}

/** Builds the hourly grid: ownership, offsets, local labels, drive hours and drive days. */
export function buildGrid(stops: StopTime[], drives: DriveTime[]): Grid {
  const timeline = planTimeline(stops, drives);
  const n = timeline.hours;
  const startMs = timeline.startMs;
  const stop = new Uint16Array(n);
  const offsetMin = new Int32Array(n);
  const localDay = new Int32Array(n);
  const localHour = new Uint8Array(n);
  const driving = new Uint8Array(n);
  const driveDay = new Uint8Array(n);
  const time: string[] = new Array<string>(n);

  // The owner is the last stop whose arrival instant is at or before the row's start.
  let s = 0;
  for (let i = 0; i < n; i++) {
    const t = startMs + i * HOUR_MS;
    while (s + 1 < stops.length && timeline.arrivals[s + 1]! <= t) s++;
    stop[i] = s;
  }
  // Offsets are looked up per run of rows owned by one stop (sampled, see offsetsAlong).
  for (let a = 0; a < n; ) {
    let b = a + 1;
    while (b < n && stop[b] === stop[a]) b++;
    offsetsAlong(stops[stop[a]!]!.timeZone, startMs + a * HOUR_MS, HOUR_MS, b - a, offsetMin, a);
    a = b;
  }

  const driveDays = new Set(timeline.drives.map((d) => d.day));
  for (let i = 0; i < n; i++) {
    const t = startMs + i * HOUR_MS;
    const local = t + offsetMin[i]! * 60_000;
    const day = Math.floor(local / 86_400_000);
    localDay[i] = day;
    localHour[i] = Math.floor((local - day * 86_400_000) / HOUR_MS);
    time[i] = formatLocal(t, offsetMin[i]!);
    for (const d of timeline.drives) {
      if (t >= d.startMs && t < d.endMs) {
        driving[i] = 1;
        break;
      }
    }
    driveDay[i] = driveDays.has(day) ? 1 : 0;
  }
  return { timeline, n, startMs, stop, offsetMin, localDay, localHour, driving, driveDay, time };
}
