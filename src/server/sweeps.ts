import type { HandPlan, HandPlanResult } from '../domain/proposals/sweep-edit';
import { HttpError } from './errors';
import type { ForecastDto } from './forecasts';
import { oneAtATime } from './workers/per-user';
import { handPlanInPool } from './workers/pool';

// The sweep's hand-edited after-plan: the installer changes the bank, arrays, chargers or generator
// by hand and runs it again against the saved forecast's trip, in the worker pool like a sweep.

/** Runs a hand-edited after-plan of a saved forecast (counted with the installer's sweeps); a plan the engine refuses is a 400 naming its fields. */
export async function tryHandPlan(installerId: string, forecast: ForecastDto, edit: HandPlan): Promise<HandPlanResult> {
  const r = await oneAtATime(installerId, () => handPlanInPool({ plan: forecast.plan, reserveSocPct: forecast.reserveSocPct, edit }));
  if (!r.ok) throw new HttpError('invalid_request', `This plan cannot be forecast: ${r.message}`, r.issues);
  return r.result;
}
