// The app's one clock for instants (when something was saved, edited, shared, checked in).
// Every formatter here takes the zone it shows the time in, and date-fns computes in that zone
// through @date-fns/tz, so the server and the browser print the same text for the same zone:
// the runtime's own zone (the server's UTC, the phone's camp time) never enters.
//
// Policy: times of trip events (arrivals, cutoffs, hourly rows) are shown in the stop's zone
// (`format.ts` reads them from their ISO offset); times of app events are shown in the user's zone
// from their settings (`useUserZone`), and e-mails name the zone in plain words (`withZoneName`).
//
// A zone's rules come from the runtime's time zone database, and the server's and the browser's
// can differ (Chromium 156 already has British Columbia on year-round UTC−7 from November 2026,
// Node 20's ICU still the old rule). So a page hands its islands a `ZoneClock`: the zone's UTC
// offsets as the server knows them, over the years around now. Formatting with it is plain
// arithmetic on a fixed offset, the same text in both renders.
import { format } from 'date-fns';
import { tz, tzOffset, tzScan } from '@date-fns/tz';

/** The zone shown before the user's own is known (also the server's clock). */
export const FALLBACK_ZONE = 'UTC';

const valid = new Map<string, boolean>();

/** True for a time zone name the runtime knows ("America/Vancouver", "UTC"). */
export function isTimeZone(zone: unknown): zone is string {
  if (typeof zone !== 'string' || zone.length === 0 || zone.length > 64) return false;
  let ok = valid.get(zone);
  if (ok === undefined) {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone: zone });
      ok = true;
    } catch {
      ok = false;
    }
    valid.set(zone, ok);
  }
  return ok;
}

/** The zone to show times in: the given one when it is a real zone, else UTC. */
export function zoneOr(zone: string | null | undefined): string {
  return isTimeZone(zone) ? zone : FALLBACK_ZONE;
}

/** The browser's (or runtime's) own zone; only for telling the server once, never for display. */
export function deviceZone(): string {
  try {
    return zoneOr(Intl.DateTimeFormat().resolvedOptions().timeZone);
  } catch {
    return FALLBACK_ZONE;
  }
}

const PATTERNS = {
  /** "03:08" */
  time: 'HH:mm',
  /** "Fri 4 Dec" */
  day: 'EEE d MMM',
  /** "Fri 4 Dec, 03:08" */
  dayTime: 'EEE d MMM, HH:mm',
  /** "Fri 4 Dec 2026, 03:08" */
  dayTimeYear: 'EEE d MMM yyyy, HH:mm',
  /** "4 Dec 2026" */
  date: 'd MMM yyyy',
  /** "Fri 4 Dec 2026" */
  dayDate: 'EEE d MMM yyyy',
  /** "2026-12-04" (a key for grouping by the day in that zone) */
  dayKey: 'yyyy-MM-dd',
} as const;
export type InstantStyle = keyof typeof PATTERNS;

function toMs(when: string | number | Date): number {
  return typeof when === 'number' ? when : typeof when === 'string' ? Date.parse(when) : when.getTime();
}

/** A zone with its UTC offsets as one runtime knows them, to format with elsewhere (plain JSON). */
export interface ZoneClock {
  zone: string;
  /** Minutes east of UTC before the first change. */
  offset: number;
  /** Each change in the covered years: [instant in ms, minutes east of UTC from then on]. */
  changes: [number, number][];
}

const YEAR_MS = 365.25 * 86_400_000;
const clocks = new Map<string, ZoneClock>();

/** The zone's offsets from 3 years before `now` to 2 years after, by this runtime's rules (cached per zone and day). */
export function zoneClock(zone: string, now = Date.now()): ZoneClock {
  const z = zoneOr(zone);
  const day = Math.floor(now / 86_400_000);
  const key = `${z}|${day}`;
  let c = clocks.get(key);
  if (!c) {
    const start = new Date(day * 86_400_000 - 3 * YEAR_MS);
    const end = new Date(day * 86_400_000 + 2 * YEAR_MS);
    c = { zone: z, offset: tzOffset(z, start), changes: tzScan(z, { start, end }).map((x) => [x.date.getTime(), x.offset]) };
    if (clocks.size > 500) clocks.clear();
    clocks.set(key, c);
  }
  return c;
}

/** Minutes east of UTC at an instant, by the clock's rules. */
export function offsetAt(clock: ZoneClock, ms: number): number {
  let off = clock.offset;
  for (const [t, o] of clock.changes) {
    if (t > ms) break;
    off = o;
  }
  return off;
}

function offsetText(minutes: number): string {
  const a = Math.abs(minutes);
  return `${minutes < 0 ? '-' : '+'}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
}

/** The fixed-offset context for an instant: from the clock's table, or (a zone name) the runtime's own rules. */
function contextAt(ms: number, zone: string | ZoneClock) {
  return typeof zone === 'string' ? tz(zoneOr(zone)) : tz(offsetText(offsetAt(zone, ms)));
}

/**
 * An instant (ISO string, ms or Date) as text in a zone; an unreadable instant comes back as "—".
 * Islands pass a `ZoneClock` (the same text on server and browser); server-only text (e-mails) may pass the zone name.
 */
export function formatInstant(when: string | number | Date, zone: string | ZoneClock, style: InstantStyle = 'dayTime'): string {
  const ms = toMs(when);
  if (!Number.isFinite(ms)) return '—';
  // The text depends only on these three; date-fns in a zone costs about 0.2 ms a call.
  const key = `${ms}|${style}|${typeof zone === 'string' ? zoneOr(zone) : offsetAt(zone, ms)}`;
  let text = formatted.get(key);
  if (text === undefined) {
    text = format(ms, PATTERNS[style], { in: contextAt(ms, zone) });
    if (formatted.size >= 2000) formatted.clear();
    formatted.set(key, text);
  }
  return text;
}
const formatted = new Map<string, string>();

/** "UTC−08:00" for the zone's offset at that instant (a real minus sign). */
export function zoneOffset(when: string | number | Date, zone: string | ZoneClock): string {
  const ms = toMs(when);
  if (!Number.isFinite(ms)) return 'UTC';
  const xxx = format(ms, 'xxx', { in: contextAt(ms, zone) });
  return xxx === '+00:00' ? 'UTC' : `UTC${xxx[0] === '-' ? '−' : '+'}${xxx.slice(1)}`;
}

/** A zone in plain words: "Vancouver time", "Los Angeles time", "UTC" (offset-only zones as "UTC−07:00"). */
export function zonePlainName(zone: string, when: string | number | Date = 0): string {
  const z = zoneOr(zone);
  if (z === 'UTC' || z === 'Etc/UTC' || z === 'Etc/GMT' || z === 'GMT') return 'UTC';
  if (z.startsWith('Etc/')) return zoneOffset(when, z);
  const city = z.slice(z.lastIndexOf('/') + 1).replace(/_/g, ' ');
  return `${city} time`;
}

/** An instant with its zone named, for e-mails and anything read away from the app: "Fri 4 Dec, 03:00 Vancouver time (UTC−08:00)". */
export function withZoneName(when: string | number | Date, zone: string, style: InstantStyle = 'dayTime'): string {
  const z = zoneOr(zone);
  const name = zonePlainName(z, when);
  return name === 'UTC' || name.startsWith('UTC')
    ? `${formatInstant(when, z, style)} ${name}`
    : `${formatInstant(when, z, style)} ${name} (${zoneOffset(when, z)})`;
}

/** The clock a page hands its islands for the signed-in user: their zone's offsets, or null while they have none. */
export function userClock(user: { timeZone?: string | null } | null | undefined): ZoneClock | null {
  return user && isTimeZone(user.timeZone) ? zoneClock(user.timeZone) : null;
}
