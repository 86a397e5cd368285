import { forecastRunSchema } from '../../../../domain/forecasts/forecasts.schema';
import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { forecastTrip, listForecasts } from '../../../../server/forecasts';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';

export const prerender = false;

/** Saved forecasts of a trip, newest first. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(await listForecasts(db, trip.id));
});

/** Runs the engine on the trip, its rig and the rig's loads as they are now, and saves the result. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, rig, canWrite } = await tripAccess(db, user, ctx.params.id!, 'write');
  const hasBody = (ctx.request.headers.get('content-length') ?? '0') !== '0' || ctx.request.headers.has('content-type');
  const body = hasBody ? parseWith(forecastRunSchema, await readJson(ctx.request, 16 * 1024)) : {};
  return json(await forecastTrip(db, { trip, rig, canWrite, userId: user.id, name: body.name }), 201);
});
