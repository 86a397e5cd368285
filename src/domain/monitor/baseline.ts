import { forecast as runEngine, validatePlan, type Plan } from '../../engine';
import type { Sample } from './parse';
import { localClock } from './time';
import { isoDate } from '../../engine/light';
import { at } from '../../lib/invariant';

// What a monitor log tells about the rig: the draw while nothing can charge (the night-time
// baseline), and each day's amp-hours taken out and put back. Pure.

const MIN = 60_000;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? at(s, m) : (at(s, m - 1) + at(s, m)) / 2;
}

export interface NightBaseline {
  /** Local hours [from, to) the baseline is read in. */
  fromHour: number;
  toHour: number;
  /** Median draw in the window, amps (positive = taken from the bank). */
  drawA: number;
  /** Median voltage in the window, when the log has voltage. */
  volts: number | null;
  /** Readings used, and readings left out because something was charging (shore power, a generator). */
  samples: number;
  excludedCharging: number;
  /** Each night's own median, by the local date of the morning. */
  nights: { date: string; drawA: number; samples: number }[];
}

export type BaselineResult = { ok: true; baseline: NightBaseline } | { ok: false; reason: string };

/** Readings below this are charging, not a draw (amps; a shunt's zero offset is smaller). */
const CHARGING_A = 0.05;

/**
 * The night-time baseline draw: the median current between `fromHour` and `toHour` local time
 * (01:00–05:00 by default, when no solar can charge), leaving out readings where something charged.
 */
export function nightBaseline(samples: Sample[], timeZone: string, fromHour = 1, toHour = 5): BaselineResult {
  const clock = localClock(timeZone);
  const withAmps = samples.filter((s) => s.amps !== null);
  if (withAmps.length === 0) return { ok: false, reason: 'The log has no current column, so the draw cannot be read from it.' };
  const byNight = new Map<number, number[]>();
  const volts: number[] = [];
  let excluded = 0;
  for (const s of withAmps) {
    const c = clock(s.t);
    if (c.hour < fromHour || c.hour >= toHour) continue;
    if ((s.amps as number) > CHARGING_A) {
      excluded++;
      continue;
    }
    const list = byNight.get(c.day) ?? [];
    list.push(-(s.amps as number));
    byNight.set(c.day, list);
    if (s.volts !== null) volts.push(s.volts);
  }
  const all = [...byNight.values()].flat();
  const window = `${String(fromHour).padStart(2, '0')}:00 and ${String(toHour).padStart(2, '0')}:00`;
  if (all.length < 6) {
    return {
      ok: false,
      reason:
        excluded > 0 && all.length === 0
          ? `Something was charging between ${window} on every night of the log (shore power or a generator), so the draw cannot be read.`
          : `The log has too few readings between ${window} local time to read a night-time draw (at least 6 are needed).`,
    };
  }
  const nights = [...byNight.entries()].sort((a, b) => a[0] - b[0]).map(([day, xs]) => ({ date: isoDate(day), drawA: round(median(xs), 3), samples: xs.length }));
  return {
    ok: true,
    baseline: { fromHour, toHour, drawA: round(median(all), 3), volts: volts.length ? round(median(volts), 2) : null, samples: all.length, excludedCharging: excluded, nights },
  };
}

export interface DayAh {
  /** Local date. */
  date: string;
  /** Amp-hours taken from the bank and put into it. */
  consumedAh: number;
  chargedAh: number;
  /** charged − consumed. */
  netAh: number;
  /** Hours of the day the log covers (gaps longer than the limit are not counted). */
  hoursCovered: number;
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f + 0;
}

/**
 * Amp-hours consumed and charged per local day. Each reading's current holds until the next
 * reading (as a logger's interval average does); a gap longer than `maxGapMs` (default: 15 min
 * or three typical intervals, whichever is longer) is left out rather than guessed.
 */
export function dailyAh(samples: Sample[], timeZone: string, maxGapMs?: number): DayAh[] {
  const s = samples.filter((x) => x.amps !== null);
  if (s.length < 2) return [];
  const steps: number[] = [];
  for (let i = 1; i < s.length && steps.length < 2000; i++) {
    const step = at(s, i).t - at(s, i - 1).t;
    if (step > 0) steps.push(step);
  }
  const gap = maxGapMs ?? Math.max(15 * MIN, 3 * (steps.length ? median(steps) : 0));
  const clock = localClock(timeZone);
  const days = new Map<number, { out: number; in: number; ms: number }>();
  const add = (day: number, amps: number, ms: number) => {
    const d = days.get(day) ?? { out: 0, in: 0, ms: 0 };
    const ah = (amps * ms) / 3_600_000;
    if (amps < 0) d.out -= ah;
    else d.in += ah;
    d.ms += ms;
    days.set(day, d);
  };
  for (let i = 0; i + 1 < s.length; i++) {
    const here = at(s, i);
    let a = here.t;
    const b = at(s, i + 1).t;
    if (b <= a || b - a > gap) continue;
    const amps = here.amps as number;
    // Split the interval at local midnights.
    while (a < b) {
      const c = clock(a);
      const msToMidnight = ((24 * 60 - (c.hour * 60 + c.minute)) * MIN) - (a % MIN);
      const end = Math.min(b, a + Math.max(1, msToMidnight));
      add(c.day, amps, end - a);
      a = end;
    }
  }
  return [...days.entries()]
    .sort((x, y) => x[0] - y[0])
    .map(([day, d]) => ({ date: isoDate(day), consumedAh: round(d.out, 1), chargedAh: round(d.in, 1), netAh: round(d.in - d.out, 1), hoursCovered: round(d.ms / 3_600_000, 1) }));
}

/** What the rest of the load list plans to draw in the baseline's hours. */
export interface PlannedNightDraw {
  /** Average watts from the bank in [fromHour, toHour), inverter losses and idle draw included. */
  watts: number;
  /** The ambient temperature the loads were run at (their cooling and heating response). */
  ambientC: number;
}

/**
 * The average draw the load list plans for the night window, measured by the engine itself on a
 * one-night plan at a constant temperature (no panels, no chargers), so the parasitic estimate
 * uses exactly the load rules the forecasts use.
 */
export function plannedNightDraw(input: { bank: Plan['bank']; inverter?: Plan['inverter'] | null; loads: Plan['loads'] }, ambientC: number, fromHour = 1, toHour = 5): PlannedNightDraw {
  const t = Math.round(Math.max(-40, Math.min(50, ambientC)) * 10) / 10;
  const date = '2027-01-04';
  const plan: Plan = {
    bank: { ...input.bank, initialSocPct: 100, floorSocPct: 0, cutoffVolts: null },
    ...(input.inverter ? { inverter: input.inverter } : {}),
    loads: input.loads,
    stops: [{ name: 'Night', lat: 0, lon: 0, timeZone: 'UTC', arrive: date, nights: 1, arriveHour: 0, weather: [{ date, cloudOktas: 8, highC: t, lowC: t }] }],
  } as Plan;
  const checked = validatePlan(plan);
  if (!checked.ok) return { watts: 0, ambientC: t };
  const f = runEngine(checked.plan);
  const rows = f.hourly.slice(fromHour, toHour);
  const watts = rows.length ? rows.reduce((s, r) => s + r.loadWatts + r.unmetWatts, 0) / rows.length : 0;
  return { watts: Math.round(watts * 10) / 10, ambientC: t };
}

/** The median temperature of the night window's readings, when the log has temperature. */
export function nightTemperature(samples: Sample[], timeZone: string, fromHour = 1, toHour = 5): number | null {
  const clock = localClock(timeZone);
  const temps = samples.filter((s) => s.tempC !== null && clock(s.t).hour >= fromHour && clock(s.t).hour < toHour).map((s) => s.tempC as number);
  return temps.length ? round(median(temps), 1) : null;
}

/** The parasitic draw to suggest: what the night draws beyond what the load list already plans, never below zero. */
export function suggestedParasiticWatts(baseline: NightBaseline, nominalVolts: number, planned: PlannedNightDraw): number {
  return Math.max(0, Math.round((baseline.drawA * nominalVolts - planned.watts) * 10) / 10);
}

/** The parasitic estimate with its working: measured night draw, what the loads already run then, the rest. */
export interface ParasiticWorking {
  /** The measured night baseline in watts (median amps × the bank's nominal volts). */
  measuredW: number;
  /** What the rig's other loads are scheduled to draw in the same hours. */
  scheduledW: number;
  /** measured − scheduled, never below zero. */
  parasiticW: number;
  /** The arithmetic in words, e.g. "2.20 A × 12.8 V = 28.2 W measured − 18.0 W scheduled = 10.2 W". */
  text: string;
}

const w1 = (x: number) => `${(Math.round(x * 10) / 10).toFixed(1)} W`;

export function parasiticWorking(baseline: NightBaseline, nominalVolts: number, planned: PlannedNightDraw): ParasiticWorking {
  const measuredW = Math.round(baseline.drawA * nominalVolts * 10) / 10;
  const parasiticW = suggestedParasiticWatts(baseline, nominalVolts, planned);
  const raw = measuredW - planned.watts;
  return {
    measuredW,
    scheduledW: planned.watts,
    parasiticW,
    text: `${baseline.drawA.toFixed(2)} A × ${nominalVolts} V = ${w1(measuredW)} measured − ${w1(planned.watts)} scheduled = ${raw < 0 ? `${w1(raw)}, so ${w1(0)}` : w1(parasiticW)}`,
  };
}

/**
 * The watts typed for the parasitic draw: a number from 0 to 5000; empty is refused, and 0 only
 * when the camper confirms the rig draws nothing with everything off (a 0 wipes the standby load).
 */
export function readParasiticWatts(typed: string, zeroConfirmed: boolean): { ok: true; watts: number } | { ok: false; message: string; needsConfirm?: true } {
  const t = typed.trim().replace(',', '.');
  if (t === '') return { ok: false, message: 'Enter the parasitic draw in watts.' };
  const n = Number(t);
  if (!Number.isFinite(n) || n < 0 || n > 5000) return { ok: false, message: 'Parasitic draw must be a number of watts from 0 to 5000.' };
  const watts = Math.round(n * 10) / 10;
  if (watts === 0 && !zeroConfirmed) return { ok: false, message: 'A parasitic draw of 0 W removes the standby load from every forecast. Tick the box if the rig really draws nothing with everything off.', needsConfirm: true };
  return { ok: true, watts };
}
