// Local times of forecast rows. A row's `time` is ISO 8601 with the owning stop's UTC offset
// ("2027-10-23T03:00-06:00"), so its wall-clock date and hour are read straight from the string:
// the browser's own zone never enters, and the camp's local time is what the camper sees.

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'] as const;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const;

/** The wall-clock parts of a row time. */
export interface LocalParts {
  /** Local date, YYYY-MM-DD. */
  date: string;
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  /** "-06:00", "+10:30" or "Z". */
  offset: string;
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** Reads the wall-clock parts of an ISO time with offset; null when it is not one. */
export function localParts(iso: string): LocalParts | null {
  const m = ISO.exec(iso);
  if (!m) return null;
  const off = m[6] === 'Z' ? 'Z' : m[6].length === 5 ? `${m[6].slice(0, 3)}:${m[6].slice(3)}` : m[6];
  return {
    date: `${m[1]}-${m[2]}-${m[3]}`,
    year: Number(m[1]),
    month: Number(m[2]),
    day: Number(m[3]),
    hour: Number(m[4]),
    minute: Number(m[5]),
    offset: off,
  };
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

/** "Thu 23 Oct" for a YYYY-MM-DD date (the weekday of that calendar date, zone-free). */
export function formatDay(date: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) return date;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  const wd = new Date(Date.UTC(y, mo - 1, d)).getUTCDay();
  return `${WEEKDAYS[wd]} ${d} ${MONTHS[mo - 1]}`;
}

/** "Thu" for a YYYY-MM-DD date. */
export function formatWeekday(date: string): string {
  return formatDay(date).split(' ')[0];
}

/** "03:00" for a row time. */
export function formatClock(iso: string): string {
  const p = localParts(iso);
  return p ? `${pad(p.hour)}:${pad(p.minute)}` : iso;
}

/** "Thu 23 Oct, 03:00" for a row time, in the stop's local time. */
export function formatRowTime(iso: string): string {
  const p = localParts(iso);
  return p ? `${formatDay(p.date)}, ${pad(p.hour)}:${pad(p.minute)}` : iso;
}

/** "UTC−06:00" (with a real minus sign) for a row time's offset. */
export function formatOffset(iso: string): string {
  const p = localParts(iso);
  if (!p) return '';
  if (p.offset === 'Z') return 'UTC';
  return `UTC${p.offset[0] === '-' ? '−' : '+'}${p.offset.slice(1)}`;
}

/** The instant (ms since epoch) of a row time. */
export function instantOf(iso: string): number {
  const p = localParts(iso);
  if (!p) return NaN;
  const utc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute);
  if (p.offset === 'Z') return utc;
  const sign = p.offset[0] === '-' ? -1 : 1;
  const mins = Number(p.offset.slice(1, 3)) * 60 + Number(p.offset.slice(4, 6));
  return utc - sign * mins * 60_000;
}

const abbrCache = new Map<string, Intl.DateTimeFormat>();

/**
 * The zone's short name at that instant ("MDT"), when the locale data has a letter abbreviation;
 * otherwise null, and the caller shows the UTC offset alone.
 */
export function zoneAbbreviation(iso: string, timeZone: string): string | null {
  const t = instantOf(iso);
  if (!Number.isFinite(t)) return null;
  try {
    let f = abbrCache.get(timeZone);
    if (!f) {
      f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'short' });
      abbrCache.set(timeZone, f);
    }
    const name = f.formatToParts(new Date(t)).find((x) => x.type === 'timeZoneName')?.value ?? '';
    return /^[A-Z]{2,5}$/.test(name) ? name : null;
  } catch {
    return null;
  }
}

/** "Thu 23 Oct, 03:00 MDT (UTC−06:00)": a row time with its zone, for tooltips and tables. */
export function formatRowTimeWithZone(iso: string, timeZone: string | undefined): string {
  const abbr = timeZone ? zoneAbbreviation(iso, timeZone) : null;
  const off = formatOffset(iso);
  return abbr ? `${formatRowTime(iso)} ${abbr} (${off})` : `${formatRowTime(iso)} (${off})`;
}
