import { rigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { rigDeletionCounts } from '../../../../server/deletion';
import { json, requireUser, route } from '../../../../server/http';

/** What deleting the rig would take with it (loads, trips, saved forecasts, check-ins, logs), for the confirmation. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(await rigDeletionCounts(db, rig.id));
});
