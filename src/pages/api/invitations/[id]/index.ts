import { db } from '../../../../server/db';
import { crewAccess } from '../../../../server/access';
import { requireUser, route } from '../../../../server/http';
import { invitationById, revokeInvitation } from '../../../../server/invitations';
import { versionFrom } from '../../../../server/versions';

/** Revokes an invitation (owners of its crew); `?version=N` is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const inv = await invitationById(db, ctx.params.id!);
  await crewAccess(db, user, inv.crew_id, 'manage', 'invitation');
  await revokeInvitation(db, inv.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
