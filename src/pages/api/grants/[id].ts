import { grantAccess, rigAccess } from '../../../server/access';
import { db } from '../../../server/db';
import { revokeGrant, shareInviteRig } from '../../../server/grants';
import { requireUser, route } from '../../../server/http';

/** Takes an installer's access to a rig away, or withdraws a share not yet opened (owners of the rig's crew). */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = ctx.params.id!;
  const inviteRig = await shareInviteRig(db, id);
  if (inviteRig) await rigAccess(db, user, inviteRig, 'manage');
  else await grantAccess(db, user, id);
  await revokeGrant(db, id);
  return new Response(null, { status: 204 });
});
