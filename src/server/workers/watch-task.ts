// Trip watch, the CPU-heavy part of one run (in the worker pool): the engine run of the trip with
// fresh weather — from the latest check-in's state of charge once the trip is under way — and the
// advice that goes into the e-mail when the answer changed.
import { forecast, validatePlan, type Forecast, type Plan, type ResolvedPlan } from '../../engine';
import { advise } from '../../domain/advice/advice';
import { CAUTIONS } from '../../domain/advice/cautions';
import { reforecastFrom } from '../../domain/checkins/reforecast';
import type { Units } from '../../lib/units';

export interface WatchRunTask {
  /** The trip's plan with the fresh weather filled in, not yet checked (the check runs here too). */
  plan: Plan;
  reserveSocPct: number | null;
  /** The latest check-in during the trip: the run starts at its hour with its state of charge. */
  from: { atMs: number; socPct: number } | null;
}

/** `adviceImperial`: the same advice with temperatures in °F, for people who chose imperial units (the same list when it names none). */
export type WatchRunOutcome = { ok: true; plan: ResolvedPlan; forecast: Forecast; advice: string[]; adviceImperial: string[] } | { ok: false; message: string };

/** The advice in a few lines: the changes that matter most (with their cautions) and the cold-weather fix. */
export function adviceLines(plan: ResolvedPlan, f: Forecast, reserveSocPct: number | null, units: Units = 'metric'): string[] {
  try {
    const a = advise(plan, f, reserveSocPct, units);
    const lines = a.changes.map((c) => `${c.title}: ${c.effect}${c.caution ? ` (${c.caution})` : ''}`);
    if (a.cold) lines.push(a.cold.alone);
    // Sizing and generator advice carries the short cautions (product.md, Safety).
    if (lines.length > 0) lines.push(CAUTIONS.estimate);
    return lines;
  } catch {
    return [];
  }
}

export function runWatchTask(task: WatchRunTask): WatchRunOutcome {
  const checked = validatePlan(task.plan);
  if (!checked.ok) return { ok: false, message: `This trip cannot be forecast: ${checked.envelope.error.message}` };
  const plan = checked.plan;
  if (task.from) {
    const re = reforecastFrom(plan, task.from.atMs, task.from.socPct);
    if (!re.ok) return { ok: false, message: `The latest check-in ${re.message}` };
    // The advice measures changes over the whole trip; from a check-in it would compare different spans.
    return { ok: true, plan, forecast: re.forecast, advice: [], adviceImperial: [] };
  }
  const f = forecast(plan);
  const advice = adviceLines(plan, f, task.reserveSocPct);
  // The advice is worked out again in °F only when it states a temperature (a cold trip's fixes).
  const adviceImperial = advice.some((line) => line.includes('°C')) ? adviceLines(plan, f, task.reserveSocPct, 'imperial') : advice;
  return { ok: true, plan, forecast: f, advice, adviceImperial };
}
