import { grantAccess } from '../../../server/access';
import { db } from '../../../server/db';
import { revokeGrant } from '../../../server/grants';
import { requireUser, route } from '../../../server/http';

/** Takes an installer's access to a rig away (owners of the rig's crew). */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const grant = await grantAccess(db, user, ctx.params.id!);
  await revokeGrant(db, grant.id);
  return new Response(null, { status: 204 });
});
