// Calendar arithmetic and IANA time-zone offsets, with no clock and no Node-only API.
// Offsets come from the platform's Intl (ICU tzdata). Civil-date math is integer arithmetic
// (Howard Hinnant's days_from_civil / civil_from_days), so labels need no Date parsing.

/** One hour and one day in milliseconds. */
export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;

/** A local calendar date. */
export interface CivilDate {
  y: number;
  m: number; // 1..12
  d: number; // 1..31
}

/** Days since 1970-01-01 of a proleptic Gregorian date (Hinnant, "chrono-compatible date algorithms"). */
export function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const mp = (m + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Calendar date of a day count since 1970-01-01 (inverse of daysFromCivil). */
export function civilFromDays(z: number): CivilDate {
  const zz = z + 719468;
  const era = Math.floor(zz / 146097);
  const doe = zz - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  return { y: era * 400 + yoe + (m <= 2 ? 1 : 0), m, d };
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Parses `YYYY-MM-DD` into a civil date, or null when malformed or not a real calendar day. */
export function parseIsoDate(s: string): CivilDate | null {
  const m = DATE_RE.exec(s);
  if (!m) return null;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  if (mo < 1 || mo > 12 || d < 1 || d > 31) return null;
  const back = civilFromDays(daysFromCivil(y, mo, d));
  if (back.y !== y || back.m !== mo || back.d !== d) return null;
  return { y, m: mo, d };
}

/** Day number (since 1970-01-01) of a `YYYY-MM-DD` string; the caller has validated it. */
export function dayNumber(iso: string): number {
  const c = parseIsoDate(iso);
  if (!c) throw new RangeError(`not a date: ${iso}`);
  return daysFromCivil(c.y, c.m, c.d);
}

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/** `YYYY-MM-DD` of a day number. */
export function isoDate(day: number): string {
  const c = civilFromDays(day);
  return `${String(c.y).padStart(4, '0')}-${pad2(c.m)}-${pad2(c.d)}`;
}

/** Day of the year (1..366) of a day number. */
export function dayOfYear(day: number): number {
  const c = civilFromDays(day);
  return day - daysFromCivil(c.y, 1, 1) + 1;
}

/** `±HH:MM` for an offset in minutes. */
export function formatOffset(offsetMin: number): string {
  const sign = offsetMin < 0 ? '-' : '+';
  const a = Math.abs(offsetMin);
  return `${sign}${pad2(Math.floor(a / 60))}:${pad2(a % 60)}`;
}

/** ISO 8601 local label with offset, e.g. `2027-10-21T15:00-06:00`, of an instant in a zone offset. */
export function formatLocal(ms: number, offsetMin: number): string {
  const localMs = ms + offsetMin * 60_000;
  const day = Math.floor(localMs / DAY_MS);
  const minOfDay = Math.floor((localMs - day * DAY_MS) / 60_000);
  return `${isoDate(day)}T${pad2(Math.floor(minOfDay / 60))}:${pad2(minOfDay % 60)}${formatOffset(offsetMin)}`;
}

// One formatter per zone; creating one costs far more than using it. The cache holds pure
// results (a zone's formatter), so it does not break determinism.
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' });
    formatters.set(timeZone, f);
  }
  return f;
}

const OFFSET_RE = /GMT(?:([+-])(\d{1,2})(?::?(\d{2}))?)?/;

/** True when the platform knows this IANA zone name. */
export function isValidTimeZone(timeZone: string): boolean {
  if (typeof timeZone !== 'string' || !/^[A-Za-z][A-Za-z0-9_+-]*(\/[A-Za-z0-9_+-]+)*$/.test(timeZone)) return false;
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

/** UTC offset in minutes (local − UTC) of a zone at an instant, from Intl's `longOffset` name. */
export function offsetMinutes(timeZone: string, ms: number): number {
  const s = formatterFor(timeZone).format(new Date(ms));
  const m = OFFSET_RE.exec(s);
  if (!m || !m[1]) return 0;
  const v = Number(m[2]) * 60 + Number(m[3] ?? 0);
  return m[1] === '-' ? -v : v;
}

// Answers of localToInstant by zone, day, hour and minute: a zone's offsets never change for one
// wall time, and the same arrivals and drives are converted again on every check of the same trip.
const instants = new Map<string, number>();
const MAX_INSTANTS = 10_000;

/**
 * The instant of a local wall-clock time in a zone. A time inside a DST gap gives the first
 * instant after the gap; a time inside an overlap gives the earlier instant (forecast-engine.md).
 */
export function localToInstant(timeZone: string, day: number, hour: number, minute = 0): number {
  const key = `${timeZone}|${day}|${hour}|${minute}`;
  const kept = instants.get(key);
  if (kept !== undefined) return kept;
  const t = findInstant(timeZone, day, hour, minute);
  if (instants.size >= MAX_INSTANTS) instants.clear();
  instants.set(key, t);
  return t;
}

function findInstant(timeZone: string, day: number, hour: number, minute: number): number {
  const wall = day * DAY_MS + hour * HOUR_MS + minute * 60_000;
  // Zone offsets change at most once within ±36 h in practice: try the offsets on both sides.
  const oBefore = offsetMinutes(timeZone, wall - 36 * HOUR_MS);
  const oAfter = offsetMinutes(timeZone, wall + 36 * HOUR_MS);
  const candidates: number[] = [];
  for (const o of oBefore === oAfter ? [oBefore] : [oBefore, oAfter]) {
    const t = wall - o * 60_000;
    if (offsetMinutes(timeZone, t) === o) candidates.push(t);
  }
  if (candidates.length === 0) {
    // Neither offset reproduces the wall time: a second try with the offset found at the
    // naive instant covers zones whose offset changed more than once nearby.
    const o = offsetMinutes(timeZone, wall);
    const t = wall - o * 60_000;
    if (offsetMinutes(timeZone, t) === o) return t;
    // Inside a gap: the answer is the transition instant, between the two readings.
    let lo = wall - oAfter * 60_000;
    let hi = wall - oBefore * 60_000;
    if (lo > hi) [lo, hi] = [hi, lo];
    const oLo = offsetMinutes(timeZone, lo);
    while (hi - lo > 60_000) {
      const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000;
      if (mid <= lo || mid >= hi) break;
      if (offsetMinutes(timeZone, mid) === oLo) lo = mid;
      else hi = mid;
    }
    return hi;
  }
  return Math.min(...candidates);
}

/**
 * Offsets (minutes) of a zone at `count` instants `start + i·step`. Samples once a day and only
 * looks at each instant where two samples differ, since one Intl call costs microseconds.
 */
export function offsetsAlong(timeZone: string, start: number, step: number, count: number, out: Int32Array, outStart = 0): void {
  if (count <= 0) return;
  const stride = Math.max(1, Math.floor(DAY_MS / step));
  let prevIdx = 0;
  let prevOff = offsetMinutes(timeZone, start);
  out[outStart] = prevOff;
  while (prevIdx < count - 1) {
    const nextIdx = Math.min(count - 1, prevIdx + stride);
    const nextOff = offsetMinutes(timeZone, start + nextIdx * step);
    if (nextOff === prevOff) {
      for (let i = prevIdx + 1; i <= nextIdx; i++) out[outStart + i] = prevOff;
    } else {
      for (let i = prevIdx + 1; i < nextIdx; i++) out[outStart + i] = offsetMinutes(timeZone, start + i * step);
      out[outStart + nextIdx] = nextOff;
    }
    prevIdx = nextIdx;
    prevOff = nextOff;
  }
}
