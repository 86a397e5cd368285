import { rigAccessByField, tripAccess } from '../../../server/access';
import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { deleteTrip, toTripDto, updateTrip } from '../../../server/trips';
import { versionFrom } from '../../../server/versions';
import { tripPatchSchema } from '../../../domain/trips/trips.schema';

/** One trip. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, canWrite, role } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(toTripDto(trip, canWrite, role === 'owner'));
});

/** Changes the fields sent; `version` is the one read (409 with the current trip when stale). */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const current = await tripAccess(db, user, ctx.params.id!, 'write');
  const patch = parseWith(tripPatchSchema, await readJson(ctx.request));
  const { rig } = patch.rigId === undefined || patch.rigId === current.rig.id ? current : await rigAccessByField(db, user, patch.rigId, 'write');
  return json(await updateTrip(db, current.trip.id, rig, patch, current.role === 'owner'));
});

/**
 * Deletes the trip with its saved forecasts and check-ins (owners of the rig's crew only; restorable for
 * 30 days); `?version=N` (or If-Match) is the one read.
 */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'delete');
  await deleteTrip(db, trip.id, versionFrom(ctx.url, ctx.request.headers), user.id);
  return new Response(null, { status: 204 });
});
