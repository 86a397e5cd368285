import { tripAccess } from '../../../server/access';
import { db } from '../../../server/db';
import { HttpError } from '../../../server/errors';
import { deleteForecast, forecastTripId, getForecast } from '../../../server/forecasts';
import { json, requireUser, route } from '../../../server/http';

export const prerender = false;

const notFound = () => new HttpError('not_found', "There is no saved forecast with this id among your crews' trips.");

/** A saved forecast: its plan snapshot and its full result. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const tripId = await forecastTripId(db, ctx.params.id!);
  if (!tripId) throw notFound();
  await tripAccess(db, user, tripId, 'read').catch((e) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound() : e;
  });
  const f = await getForecast(db, ctx.params.id!);
  if (!f) throw notFound();
  const { crewId: _crew, ...dto } = f;
  return json(dto);
});

/** Removes a saved forecast (forecasts are snapshots, never edited, so no version is needed). */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const tripId = await forecastTripId(db, ctx.params.id!);
  if (!tripId) throw notFound();
  await tripAccess(db, user, tripId, 'write').catch((e) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound() : e;
  });
  await deleteForecast(db, ctx.params.id!);
  return new Response(null, { status: 204 });
});
