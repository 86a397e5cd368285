import { checkInInputSchema } from '../../../../domain/checkins/checkins.schema';
import { tripAccess } from '../../../../server/access';
import { createCheckIn, listCheckIns } from '../../../../server/check-ins';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';

export const prerender = false;

/** The trip's check-ins, the latest reading first. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(await listCheckIns(db, trip.id));
});

/**
 * A check-in: `{ id (UUID made by the app), at (ISO with offset), socPct | restingVolts, forecastId? }`.
 * Re-forecasts the rest of the trip from the reading: 201 with the check-in; the same check-in
 * sent again is 200 with the stored one (stored exactly once).
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, rig } = await tripAccess(db, user, ctx.params.id!, 'write');
  const input = parseWith(checkInInputSchema, await readJson(ctx.request, 16 * 1024), 'invalid_request', 'The check-in needs fixing.');
  const { checkIn, created } = await createCheckIn(db, { trip, rig, userId: user.id }, input);
  return json(checkIn, created ? 201 : 200);
});
