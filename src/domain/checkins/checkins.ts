// The check-in computed on the phone, with the same engine and rules the server uses, so the
// camper sees the new cutoff at once — with or without signal. Pure.
import type { Forecast, ResolvedPlan } from '../../engine';
import { socFromRestingVolts } from '../../checkin/ocv';
import { outcomeOf, reforecastFrom } from '../../checkin/reforecast';
import type { CheckInOutcome, PreviousOutcome } from '../../checkin/schema';

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
export function previousOf(b: Basis): PreviousOutcome {
  const s = b.forecast.summary;
  return { forecastId: b.forecastId, name: b.name, firstCutoffAt: s.firstCutoffAt, minSocPct: s.minSocPct, minSocAt: s.minSocAt, endSocPct: s.endSocPct };
}

/** Re-forecasts the rest of the trip from a reading, on the phone. */
export function computeCheckIn(basis: Basis, at: string, reading: { socPct: number } | { restingVolts: number }): LocalCheckIn {
  let socPct: number;
  let note: string | null = null;
  if ('restingVolts' in reading) {
    const r = socFromRestingVolts(basis.plan.bank.chemistry, basis.plan.bank.nominalVolts, reading.restingVolts);
    if (!r.ok) return { ok: false, path: 'restingVolts', message: r.message };
    socPct = r.socPct;
    note = r.note;
  } else socPct = reading.socPct;
  const re = reforecastFrom(basis.plan, Date.parse(at), socPct);
  if (!re.ok) return { ok: false, path: 'at', message: `The time ${re.message}` };
  return { ok: true, socPct, outcome: outcomeOf(re.forecast), previous: previousOf(basis), note, forecast: re.forecast };
}

/** The saved forecast from the re-forecast's first hour on, so both lines start together on a chart. */
export function fromHour(f: Forecast, startAt: string): Forecast | null {
  const start = Date.parse(startAt);
  const k = f.hourly.findIndex((r) => Date.parse(r.time) === start);
  if (k < 0) return null;
  const hourly = f.hourly.slice(k);
  const startSoc = k === 0 ? f.summary.startSocPct : f.hourly[k - 1].socPct;
  const cut = f.summary.firstCutoffAt && Date.parse(f.summary.firstCutoffAt) >= start ? f.summary.firstCutoffAt : null;
  return { ...f, hourly, summary: { ...f.summary, startSocPct: startSoc, firstCutoffAt: cut } };
}

/** A v4 UUID for a new check-in (crypto.randomUUID where the browser has it). */
export function newCheckInId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6] & 0x0f) | 0x40;
  b[8] = (b[8] & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** "2027-10-22T07:30" (a datetime-local value, the phone's clock) → ISO with the phone's offset at that time. */
export function localInputToIso(value: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(value);
  if (!m) return null;
  const d = new Date(+m[1], +m[2] - 1, +m[3], +m[4], +m[5]);
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
