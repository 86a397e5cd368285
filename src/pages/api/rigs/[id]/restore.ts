import { deletedRigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { restoreRig } from '../../../../server/deletion';
import { json, requireUser, route } from '../../../../server/http';

/** Brings a rig deleted within the last 30 days back with everything it held (crew owners only). */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await deletedRigAccess(db, user, ctx.params.id!);
  return json(await restoreRig(db, rig));
});
