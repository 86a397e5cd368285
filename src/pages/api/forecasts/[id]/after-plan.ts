import { handPlanSchema } from '../../../../domain/proposals/sweep-edit';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { forecastForInstaller } from '../../../../server/proposals';
import { tryHandPlan } from '../../../../server/sweeps';
import { limitSweeps } from '../../../../server/workers/per-user';

export const prerender = false;

/**
 * A hand-edited after-plan (bank, arrays, chargers, generator) run against a saved forecast's trip
 * (installers with a grant on its rig), judged as a sweep option is: the plan as it is and after.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { forecast } = await forecastForInstaller(db, user, ctx.params.id!);
  const edit = parseWith(handPlanSchema, await readJson(ctx.request, 32 * 1024));
  await limitSweeps(user.id);
  return json(await tryHandPlan(user.id, forecast, edit));
});
