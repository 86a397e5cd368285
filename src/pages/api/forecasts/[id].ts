import { db } from '../../../server/db';
import { deleteForecast, forecastAccess, savedForecast } from '../../../server/forecasts';
import { json, requireUser, route } from '../../../server/http';

export const prerender = false;

/** A saved forecast: its plan snapshot and its full result. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  await forecastAccess(db, user, ctx.params.id!, 'read');
  const { crewId: _crew, ...dto } = await savedForecast(db, ctx.params.id!);
  return json(dto);
});

/** Removes a saved forecast (forecasts are snapshots, never edited, so no version is needed). */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  await forecastAccess(db, user, ctx.params.id!, 'write');
  await deleteForecast(db, ctx.params.id!);
  return new Response(null, { status: 204 });
});
