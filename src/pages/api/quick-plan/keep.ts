import { validatePlan, type Plan } from '../../../engine';
import { quickPlanToRigAndTrip } from '../../../domain/quick-plan/quick-plan';
import { crewForNewRig } from '../../../server/access';
import { db } from '../../../server/db';
import { json, readJson, requireUser, route } from '../../../server/http';
import { keepQuickPlan } from '../../../server/quick-plan';

export const prerender = false;

/** Saves a quick plan as the signed-in camper's rig (with its loads) and trip, all in one transaction. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const body = await readJson(ctx.request, 256 * 1024, 'invalid_plan');
  const checked = validatePlan(body);
  if (!checked.ok) return json(checked.envelope, 400);
  const crewId = await crewForNewRig(db, user);
  const saved = await keepQuickPlan(db, user.id, crewId, quickPlanToRigAndTrip(body as Plan));
  return json(saved, 201, { location: `/trips/${saved.tripId}` });
});
