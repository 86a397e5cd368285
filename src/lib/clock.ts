// The app's one clock for instants (when something was saved, edited, shared, checked in).
// Every formatter here takes the zone it shows the time in, and date-fns computes in that zone
// through @date-fns/tz, so the server and the browser print the same text for the same zone:
// the runtime's own zone (the server's UTC, the phone's camp time) never enters.
//
// Policy: times of trip events (arrivals, cutoffs, hourly rows) are shown in the stop's zone
// (`format.ts` reads them from their ISO offset); times of app events are shown in the user's zone
// from their settings (`useUserZone`), and e-mails name the zone in plain words (`withZoneName`).
import { format } from 'date-fns';
import { tz } from '@date-fns/tz';

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

/** An instant (ISO string, ms or Date) as text in `zone`; an unreadable instant comes back as "—". */
export function formatInstant(when: string | number | Date, zone: string, style: InstantStyle = 'dayTime'): string {
  const ms = toMs(when);
  if (!Number.isFinite(ms)) return '—';
  return format(ms, PATTERNS[style], { in: tz(zoneOr(zone)) });
}

/** "UTC−08:00" for the zone's offset at that instant (a real minus sign). */
export function zoneOffset(when: string | number | Date, zone: string): string {
  const ms = toMs(when);
  if (!Number.isFinite(ms)) return 'UTC';
  const xxx = format(ms, 'xxx', { in: tz(zoneOr(zone)) });
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
