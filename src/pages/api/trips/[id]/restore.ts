import { deletedTripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { restoreTrip } from '../../../../server/deletion';
import { json, requireUser, route } from '../../../../server/http';

/** Brings a trip deleted within the last 30 days back with its saved forecasts and check-ins (owners of its rig's crew only). */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, rig } = await deletedTripAccess(db, user, ctx.params.id!);
  return json(await restoreTrip(db, trip, rig));
});
