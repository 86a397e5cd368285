import { sweepRequestSchema } from '../../../../domain/proposals/proposals.schema';
import { db } from '../../../../server/db';
import { parseWith, readJson, requireUser, route } from '../../../../server/http';
import { forecastForInstaller, sweepForecast } from '../../../../server/proposals';
import { limitSweeps } from '../../../../server/workers/per-user';

export const prerender = false;

/**
 * Upgrade sweep on a saved forecast (installers with a grant on its rig): every combination of the
 * candidates rerun with the engine, priced from the sent prices or the installer's saved list,
 * ranked by cost, each marked as keeping the whole trip above the reserve with no cutoff or not.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { forecast } = await forecastForInstaller(db, user, ctx.params.id!);
  const body = parseWith(sweepRequestSchema, await readJson(ctx.request, 64 * 1024));
  await limitSweeps(user.id);
  // Already JSON: the worker serialised the options, so this thread does not.
  return new Response(await sweepForecast(db, user.id, forecast, body), { status: 200, headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store' } });
});
