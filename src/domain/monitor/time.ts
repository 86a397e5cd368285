import { daysFromCivil, localToInstant, offsetMinutes } from '../../engine/light';
import type { TimeFormat } from './monitor.schema';
import { at } from '../../lib/invariant';

// Reading the time of a reading. Times with an offset (ISO with Z or ±hh:mm) and epoch numbers
// are instants; any other time is the wall clock of the log's time zone.

const HOUR = 3_600_000;
const MIN_MS = Date.UTC(2000, 0, 1);
const MAX_MS = Date.UTC(2100, 0, 1);

export type TimeResult = { ok: true; ms: number } | { ok: false; message: string };

interface Wall {
  y: number;
  mo: number;
  d: number;
  h: number;
  mi: number;
  s: number;
  ms: number;
  /** Minutes east of UTC when the text carries an offset. */
  offset?: number;
}

const ISO_RE = /^(\d{4})-(\d{1,2})-(\d{1,2})[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;
const DM_RE = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4}|\d{2})(?:[,\sT]+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?\s*([ap]\.?m\.?)?$/i;
const YMD_RE = /^(\d{4})[/.](\d{1,2})[/.](\d{1,2})(?:[,\sT]+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?$/;
const EPOCH_S_RE = /^\d{9,10}(?:\.\d+)?$/;
const EPOCH_MS_RE = /^\d{12,13}$/;

function fraction(s: string | undefined): number {
  return s ? Math.round(Number(`0.${s}`) * 1000) : 0;
}

function offsetOf(s: string | undefined): number | undefined {
  if (!s) return undefined;
  if (s.toUpperCase() === 'Z') return 0;
  const sign = s[0] === '-' ? -1 : 1;
  const digits = s.slice(1).replace(':', '');
  return sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4) || 0));
}

function hour12(h: number, ampm: string | undefined): number | null {
  if (!ampm) return h;
  if (h < 1 || h > 12) return null;
  const pm = ampm.toLowerCase().startsWith('p');
  return (h % 12) + (pm ? 12 : 0);
}

/** The wall-clock parts of a text time in one of the written formats; null when it does not match. */
function wallOf(text: string, format: TimeFormat): Wall | null {
  if (format === 'iso') {
    const m = ISO_RE.exec(text);
    if (!m) return null;
    return { y: Number(m[1]), mo: Number(m[2]), d: Number(m[3]), h: Number(m[4]), mi: Number(m[5]), s: Number(m[6] ?? 0), ms: fraction(m[7]), offset: offsetOf(m[8]) };
  }
  if (format === 'ymd') {
    const m = YMD_RE.exec(text);
    if (!m) return null;
    return { y: Number(m[1]), mo: Number(m[2]), d: Number(m[3]), h: Number(m[4]), mi: Number(m[5]), s: Number(m[6] ?? 0), ms: fraction(m[7]) };
  }
  if (format === 'dmy' || format === 'mdy') {
    const m = DM_RE.exec(text);
    if (!m) return null;
    const [a, b] = [Number(m[1]), Number(m[2])];
    const y = m[3]?.length === 2 ? 2000 + Number(m[3]) : Number(m[3]);
    const h = hour12(Number(m[4]), m[8]);
    if (h === null) return { y, mo: 0, d: 0, h: -1, mi: 0, s: 0, ms: 0 };
    return { y, mo: format === 'dmy' ? b : a, d: format === 'dmy' ? a : b, h, mi: Number(m[5]), s: Number(m[6] ?? 0), ms: fraction(m[7]) };
  }
  return null;
}

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function wallProblem(w: Wall, format: TimeFormat): string | null {
  if (w.mo < 1 || w.mo > 12) return format === 'dmy' ? 'the month (second number) must be 1 to 12 — is the date month first?' : format === 'mdy' ? 'the month (first number) must be 1 to 12 — is the date day first?' : 'the month must be 1 to 12';
  const leap = (w.y % 4 === 0 && w.y % 100 !== 0) || w.y % 400 === 0;
  const dim = w.mo === 2 && !leap ? 28 : at(DAYS_IN_MONTH, w.mo - 1, 'month');
  if (w.d < 1 || w.d > dim) return `day ${w.d} does not exist in that month`;
  if (w.h < 0 || w.h > 23) return 'the hour must be 0 to 23 (or 1 to 12 with AM/PM)';
  if (w.mi > 59 || w.s > 59) return 'minutes and seconds must be 0 to 59';
  return null;
}

const EXAMPLE: Record<TimeFormat, string> = {
  iso: '2027-10-21 14:05:00',
  dmy: '21/10/2027 14:05',
  mdy: '10/21/2027 2:05 PM',
  ymd: '2027/10/21 14:05',
  'epoch-s': '1824559500 (seconds since 1970)',
  'epoch-ms': '1824559500000 (milliseconds since 1970)',
};

/** What a time in `format` looks like, for messages and the mapping form. */
export function timeExample(format: TimeFormat): string {
  return EXAMPLE[format];
}

/**
 * Turns wall-clock times of one zone into instants. Offsets are looked up once per local hour
 * (a log has thousands of readings per hour at most a few zones), so a large file stays fast.
 */
export function localResolver(timeZone: string): (y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number) => number {
  const cache = new Map<number, number>();
  return (y, mo, d, h, mi, s, ms) => {
    const day = daysFromCivil(y, mo, d);
    const key = day * 24 + h;
    let start = cache.get(key);
    if (start === undefined) {
      start = localToInstant(timeZone, day, h, 0);
      cache.set(key, start);
    }
    return start + mi * 60_000 + s * 1000 + ms;
  };
}

/** The instant of a time cell, or why it cannot be read in `format`. */
export function parseTimeCell(text: string, format: TimeFormat, resolve: ReturnType<typeof localResolver>): TimeResult {
  const s = text.trim();
  if (s === '') return { ok: false, message: 'the time is empty' };
  let ms: number;
  if (format === 'epoch-s' || format === 'epoch-ms') {
    if (!(format === 'epoch-s' ? EPOCH_S_RE : EPOCH_MS_RE).test(s)) return { ok: false, message: `"${s.slice(0, 30)}" is not a time like ${EXAMPLE[format]}` };
    ms = format === 'epoch-s' ? Math.round(Number(s) * 1000) : Number(s);
  } else {
    const w = wallOf(s, format);
    if (!w) return { ok: false, message: `"${s.slice(0, 30)}" is not a time like ${EXAMPLE[format]}` };
    const problem = wallProblem(w, format);
    if (problem) return { ok: false, message: `"${s.slice(0, 30)}": ${problem}` };
    ms = w.offset !== undefined ? Date.UTC(w.y, w.mo - 1, w.d, w.h, w.mi, w.s, w.ms) - w.offset * 60_000 : resolve(w.y, w.mo, w.d, w.h, w.mi, w.s, w.ms);
  }
  if (!(ms >= MIN_MS && ms < MAX_MS)) return { ok: false, message: `"${s.slice(0, 30)}" is not between the years 2000 and 2099` };
  return { ok: true, ms };
}

/** Whether a cell looks like a time in `format` (shape only; used to find the time column). */
export function looksLike(text: string, format: TimeFormat): boolean {
  const s = text.trim();
  if (format === 'epoch-s') return EPOCH_S_RE.test(s) && Number(s) >= MIN_MS / 1000 && Number(s) < MAX_MS / 1000;
  if (format === 'epoch-ms') return EPOCH_MS_RE.test(s) && Number(s) >= MIN_MS && Number(s) < MAX_MS;
  const w = wallOf(s, format);
  return w !== null && wallProblem(w, format) === null;
}

/** The hour of day (0–23) and local date key of an instant in a zone, with per-hour offset caching. */
export function localClock(timeZone: string): (ms: number) => { day: number; hour: number; minute: number } {
  const cache = new Map<number, number>();
  return (ms) => {
    const key = Math.floor(ms / HOUR);
    let off = cache.get(key);
    if (off === undefined) {
      off = offsetMinutes(timeZone, ms);
      cache.set(key, off);
    }
    const local = ms + off * 60_000;
    const day = Math.floor(local / 86_400_000);
    const minOfDay = Math.floor((local - day * 86_400_000) / 60_000);
    return { day, hour: Math.floor(minOfDay / 60), minute: minOfDay % 60 };
  };
}
