import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { tripDeletionCounts } from '../../../../server/deletion';
import { json, requireUser, route } from '../../../../server/http';

/** What deleting the trip would take with it (saved forecasts, check-ins), for the confirmation. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(await tripDeletionCounts(db, trip.id));
});
