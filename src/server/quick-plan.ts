import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import { loadInputSchema } from '../domain/loads/loads.schema';
import { rigInputSchema } from '../domain/rigs/rigs.schema';
import { tripInputSchema } from '../domain/trips/trips.schema';
import { parseWith } from './http';
import { createForecast } from './forecasts';
import { importLoads } from './loads';
import { createRig } from './rigs';
import { createTrip } from './trips';

/** A quick plan split into what it saves as (quickPlanToRigAndTrip). */
export interface QuickPlanParts {
  rig: unknown;
  loads: unknown[];
  trip: Record<string, unknown>;
}

/**
 * Saves a quick plan's parts as a rig (with its loads), a trip and the trip's first saved forecast (the
 * plan the camper just saw, run again by the same engine) in the crew, all in one transaction; a part the
 * rig, load or trip schema refuses is a 400 `invalid_plan` and saves nothing.
 */
export async function keepQuickPlan(db: Kysely<DB>, userId: string, crewId: string, parts: QuickPlanParts): Promise<{ rigId: string; tripId: string; forecastId: string }> {
  const rig = parseWith(rigInputSchema, parts.rig, 'invalid_plan');
  const loads = parts.loads.map((l) => parseWith(loadInputSchema, l, 'invalid_plan'));
  return db.transaction().execute(async (trx) => {
    const r = await createRig(trx, userId, crewId, rig);
    const kept = loads.length ? await importLoads(trx, r.id, userId, loads) : [];
    const trip = parseWith(tripInputSchema, { ...parts.trip, rigId: r.id }, 'invalid_plan');
    const t = await createTrip(trx, userId, { id: r.id, crew_id: crewId }, trip);
    const f = await createForecast(trx, { rig: r, loads: kept, trip: t, userId, name: 'From the quick plan' });
    return { rigId: r.id, tripId: t.id, forecastId: f.id };
  });
}
