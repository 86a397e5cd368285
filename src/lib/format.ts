// The app's one formatters module: numbers with units, percentages, hours, dates, forecast row
// times, monitor-log reading times, bank summaries. Pure (Intl and date-fns only).
import { format } from 'date-fns';
import { CHEMISTRY_DEFAULTS, type Chemistry } from '../engine/light';

const LOCALE = 'en-US';

// One formatter per number of decimals: toLocaleString with options builds a new one on every call,
// which adds up over the hundreds of figures a form or forecast renders.
const NUMBER_FORMATS = new Map<number, Intl.NumberFormat>();

/** A number with thousands separators and at most `digits` decimals. */
export function formatNumber(n: number, digits = 0): string {
  if (!Number.isFinite(n)) return '—';
  let f = NUMBER_FORMATS.get(digits);
  if (!f) NUMBER_FORMATS.set(digits, (f = new Intl.NumberFormat(LOCALE, { maximumFractionDigits: digits, minimumFractionDigits: 0 })));
  return f.format(n);
}

/** Watt-hours, whole: "1,234 Wh". */
export function formatWh(wh: number): string {
  return `${formatNumber(Math.round(wh))} Wh`;
}

/** Energy per day: "1,234 Wh/day". */
export function whPerDay(x: number): string {
  return `${formatWh(x)}/day`;
}

/** Litres of fuel, to a tenth: "1.2 L". */
export function formatLitres(l: number): string {
  return `${formatNumber(l, 1)} L`;
}

/** A percentage for sentences: whole numbers, "41 %". */
export function pct(x: number): string {
  return `${Math.round(x)} %`;
}

/** "US$1,234.50" in the installer's currency (any well-formed ISO 4217 code). */
export function formatMoney(amount: number, currency: string): string {
  try {
    return new Intl.NumberFormat('en-US', { style: 'currency', currency, currencyDisplay: 'symbol' }).format(amount);
  } catch {
    return `${amount.toFixed(2)} ${currency}`;
  }
}

/** Amp-hours: one decimal below 100, whole above: "8.3 Ah", "142 Ah". */
export function formatAh(ah: number): string {
  return `${formatNumber(ah, Math.abs(ah) < 100 ? 1 : 0)} Ah`;
}

/** Watts: "45 W", "0.2 W". */
export function formatWatts(w: number): string {
  return `${formatNumber(w, Math.abs(w) < 10 ? 1 : 0)} W`;
}

/** A clock hour 0–24 as "06:00" (24 is the end of the day, "24:00"). */
export function formatHour(h: number): string {
  return `${String(h).padStart(2, '0')}:00`;
}

/** A `YYYY-MM-DD` date as "Thu 21 Oct 2027" (or without the year: "Thu 21 Oct"). */
export function formatDate(iso: string, withYear = true): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!m) return iso;
  const d = new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  return format(d, withYear ? 'EEE d MMM yyyy' : 'EEE d MMM');
}

/** Adds whole days to a `YYYY-MM-DD` date (calendar arithmetic, no time zones involved). */
export function addDaysIso(iso: string, days: number): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!m) return iso;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + days));
  return d.toISOString().slice(0, 10);
}

export const CHEMISTRY_LABELS: Record<Chemistry, string> = {
  lifepo4: 'LiFePO4',
  agm: 'AGM',
  flooded: 'Flooded lead-acid',
  gel: 'Gel',
};

const SHORT_CHEMISTRY: Record<Chemistry, string> = { lifepo4: 'LiFePO4', agm: 'AGM', flooded: 'flooded', gel: 'gel' };

interface BankLike {
  chemistry: Chemistry;
  capacityAh: number;
  nominalVolts?: number | null;
}

/** The bank's nominal volts, the chemistry's default when the rig leaves it out. */
export function nominalVoltsOf(bank: BankLike): number {
  return bank.nominalVolts ?? CHEMISTRY_DEFAULTS[bank.chemistry].nominalVolts;
}

/** "300 Ah LiFePO4 · 400 W solar" — a rig's bank and panels in one line. */
export function rigSummary(rig: { bank: BankLike; arrays: { ratedWatts: number }[] }): string {
  const v = nominalVoltsOf(rig.bank);
  const volts = Math.abs(v - 12) < 1.5 ? '' : ` ${formatNumber(v, 1)} V`;
  const parts = [`${formatNumber(rig.bank.capacityAh)} Ah${volts} ${SHORT_CHEMISTRY[rig.bank.chemistry]}`];
  const solar = rig.arrays.reduce((s, a) => s + a.ratedWatts, 0);
  parts.push(solar > 0 ? `${formatNumber(solar)} W solar` : 'no solar');
  return parts.join(' · ');
}

/** "3 nights" / "1 night". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatNumber(n)} ${n === 1 ? one : many}`;
}

// ---------------------------------------------------------------------------------------------
// Forecast row times. A row's `time` is ISO 8601 with the owning stop's UTC offset
// ("2027-10-23T03:00-06:00"), so its wall-clock date and hour are read straight from the string:
// the browser's own zone never enters, and the camp's local time is what the camper sees.
// (`localParts` and `instantOf` read such a time; the formatters below are built on them.)

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
  const [, y, mo, d, h, mi, zone = 'Z'] = m;
  const off = zone === 'Z' ? 'Z' : zone.length === 5 ? `${zone.slice(0, 3)}:${zone.slice(3)}` : zone;
  return {
    date: `${y}-${mo}-${d}`,
    year: Number(y),
    month: Number(mo),
    day: Number(d),
    hour: Number(h),
    minute: Number(mi),
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

// ---------------------------------------------------------------------------------------------
// Monitor-log readings: instants shown in the log's own time zone.

const readingFormats = new Map<string, Intl.DateTimeFormat>();

function readingFormat(timeZone: string, withYear: boolean): Intl.DateTimeFormat {
  const key = `${timeZone}|${withYear}`;
  let f = readingFormats.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short', ...(withYear ? { year: 'numeric' } : {}), hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    readingFormats.set(key, f);
  }
  return f;
}

/** "Thu 21 Oct, 14:05" for an instant, in the log's zone. */
export function formatReadingTime(ms: number, timeZone: string, withYear = false): string {
  const parts = readingFormat(timeZone, withYear).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('weekday')} ${get('day')} ${get('month')}${withYear ? ` ${get('year')}` : ''}, ${get('hour')}:${get('minute')}`;
}

/** "1.2 MB" / "340 KB". */
export function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${(n / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(n / 1024))} KB`;
}

/** A typed number read back without thousands separators ("1200", "1,2" in de-DE), so it cannot be misread. */
export function formatTypedReading(n: number, locale: string): string {
  try {
    return new Intl.NumberFormat(locale, { useGrouping: false, maximumFractionDigits: 6 }).format(n);
  } catch {
    return String(n);
  }
}
