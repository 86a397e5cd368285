// Display formatting shared by the islands: numbers with units, hours, dates, bank summaries.
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
