// A check-in's rule: reading → state of charge → the rest of the trip re-forecast. The server
// (storing a check-in) and the phone (showing the new cutoff at once, with or without signal)
// both call `reforecastReading`, so they compute the same thing with the same engine. Pure.
import type { Forecast, ResolvedPlan } from '../../engine';
import { socFromRestingVolts } from './ocv';
import { outcomeOf, reforecastFrom } from './reforecast';
import type { CheckInOutcome, PreviousOutcome } from './checkins.schema';
import { at } from '../../lib/invariant';

export interface Basis {
  forecastId: string;
  name: string;
  plan: ResolvedPlan;
  forecast: Forecast;
}

export type LocalCheckIn =
  | { ok: true; socPct: number; outcome: CheckInOutcome; previous: PreviousOutcome; note: string | null; forecast: Forecast }
  | { ok: false; path: 'at' | 'restingVolts'; message: string };

/** The previous outcome of a saved forecast, as the server records it beside a check-in. */
export function previousOf(b: Pick<Basis, 'forecastId' | 'name' | 'forecast'>): PreviousOutcome {
  const s = b.forecast.summary;
  return { forecastId: b.forecastId, name: b.name, firstCutoffAt: s.firstCutoffAt, minSocPct: s.minSocPct, minSocAt: s.minSocAt, endSocPct: s.endSocPct };
}

export type Reading = { socPct: number } | { restingVolts: number };

export type ReadingResult =
  | { ok: true; socPct: number; note: string | null; forecast: Forecast; outcome: CheckInOutcome }
  | { ok: false; path: 'at' | 'restingVolts'; message: string };

/**
 * Reading → state of charge (a resting voltage is read on the chemistry's curve) → the rest of
 * the trip from the reading's hour. A refused time comes back with `path: 'at'` and a message that
 * completes "The time …"; a refused voltage with `path: 'restingVolts'` and a whole sentence.
 */
export function reforecastReading(plan: ResolvedPlan, atMs: number, reading: Reading): ReadingResult {
  let socPct: number;
  let note: string | null = null;
  if ('restingVolts' in reading) {
    const r = socFromRestingVolts(plan.bank.chemistry, plan.bank.nominalVolts, reading.restingVolts);
    if (!r.ok) return { ok: false, path: 'restingVolts', message: r.message };
    socPct = r.socPct;
    note = r.note;
  } else socPct = reading.socPct;
  const re = reforecastFrom(plan, atMs, socPct);
  if (!re.ok) return { ok: false, path: re.path, message: re.message };
  return { ok: true, socPct, note, forecast: re.forecast, outcome: outcomeOf(re.forecast) };
}

/** Re-forecasts the rest of the trip from a reading, on the phone. */
export function computeCheckIn(basis: Basis, at: string, reading: Reading): LocalCheckIn {
  const r = reforecastReading(basis.plan, Date.parse(at), reading);
  if (!r.ok) return { ok: false, path: r.path, message: r.path === 'at' ? `The time ${r.message}` : r.message };
  return { ok: true, socPct: r.socPct, outcome: r.outcome, previous: previousOf(basis), note: r.note, forecast: r.forecast };
}

/** The saved forecast from the re-forecast's first hour on, so both lines start together on a chart. */
export function fromHour(f: Forecast, startAt: string): Forecast | null {
  const start = Date.parse(startAt);
  const k = f.hourly.findIndex((r) => Date.parse(r.time) === start);
  if (k < 0) return null;
  const hourly = f.hourly.slice(k);
  const before = f.hourly[k - 1];
  const startSoc = before ? before.socPct : f.summary.startSocPct;
  const cut = f.summary.firstCutoffAt && Date.parse(f.summary.firstCutoffAt) >= start ? f.summary.firstCutoffAt : null;
  return { ...f, hourly, summary: { ...f.summary, startSocPct: startSoc, firstCutoffAt: cut } };
}

/** A v4 UUID for a new check-in (crypto.randomUUID where the browser has it). */
export function newCheckInId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (at(b, 6) & 0x0f) | 0x40;
  b[8] = (at(b, 8) & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** "2027-10-22T07:30" (a datetime-local value, the phone's clock) → ISO with the phone's offset at that time. */
export function localInputToIso(value: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(value);
  if (!m) return null;
  const d = new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]), Number(m[4]), Number(m[5]));
  if (Number.isNaN(d.getTime())) return null;
  const off = -d.getTimezoneOffset();
  const sign = off < 0 ? '-' : '+';
  const a = Math.abs(off);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}${sign}${p(Math.floor(a / 60))}:${p(a % 60)}`;
}

/** Now as a datetime-local value on the phone's clock. */
export function nowInputValue(now = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}T${p(now.getHours())}:${p(now.getMinutes())}`;
}
