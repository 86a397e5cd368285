import { validatePlan, type Plan } from '../../../engine';
import { quickPlanToRigAndTrip } from '../../../features/quick-plan/quick-plan';
import { loadInputSchema } from '../../../domain/loads/loads.schema';
import { rigInputSchema } from '../../../domain/rigs/rigs.schema';
import { tripInputSchema } from '../../../domain/trips/trips.schema';
import { crewForNewRig } from '../../../server/access';
import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { importLoads } from '../../../server/loads';
import { createRig } from '../../../server/rigs';
import { createTrip } from '../../../server/trips';

export const prerender = false;

/** Saves a quick plan as the signed-in camper's rig (with its loads) and trip, all in one transaction. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const body = await readJson(ctx.request, 256 * 1024, 'invalid_plan');
  const checked = validatePlan(body);
  if (!checked.ok) return json(checked.envelope, 400);
  const parts = quickPlanToRigAndTrip(body as Plan);
  const rig = parseWith(rigInputSchema, parts.rig, 'invalid_plan');
  const loads = parts.loads.map((l) => parseWith(loadInputSchema, l, 'invalid_plan'));
  const crewId = await crewForNewRig(db, user);
  const saved = await db.transaction().execute(async (trx) => {
    const r = await createRig(trx, user.id, crewId, rig);
    if (loads.length) await importLoads(trx, r.id, user.id, loads);
    const trip = parseWith(tripInputSchema, { ...parts.trip, rigId: r.id }, 'invalid_plan');
    const t = await createTrip(trx, user.id, { id: r.id, crew_id: crewId }, trip);
    return { rigId: r.id, tripId: t.id };
  });
  return json(saved, 201, { location: `/trips/${saved.tripId}` });
});
