import { z } from 'zod';
import { rigAccessByField } from '../../../server/access';
import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { checkItinerary, createTrip, listTrips } from '../../../server/trips';
import { tripInputSchema } from '../../../domain/trips/trips.schema';

const listQuery = z.object({ rigId: z.string().trim().min(1, { error: 'Leave rigId out, or give a rig id.' }).optional() });

/** Trips on the rigs of the user's crews, by start date; `?rigId=` keeps one rig's. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rigId } = parseWith(listQuery, Object.fromEntries(ctx.url.searchParams));
  if (rigId !== undefined) await rigAccessByField(db, user, rigId, 'read');
  return json(await listTrips(db, user.id, rigId));
});

/** Saves a trip on a rig the user can edit. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const input = parseWith(tripInputSchema, await readJson(ctx.request));
  const { rig, role } = await rigAccessByField(db, user, input.rigId, 'write');
  checkItinerary(rig.bank, input.stops, input.drives);
  const trip = await createTrip(db, user.id, rig, input, role === 'owner');
  return json(trip, 201, { location: `/api/trips/${trip.id}` });
});
