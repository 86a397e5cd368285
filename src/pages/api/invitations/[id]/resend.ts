import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { crewAccess } from '../../../../server/access';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { invitationById, resendInvitation } from '../../../../server/invitations';
import { invitationResendSchema } from '../../../../domain/crews/crews.schema';
import { limitInvitations } from '../../../../server/invite-limits';

/** E-mails a fresh link (owners of its crew); the old link stops working and the 7 days start again. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const inv = await invitationById(db, ctx.params.id!);
  await crewAccess(db, user, inv.crew_id, 'manage', 'invitation');
  const { version } = parseWith(invitationResendSchema, await readJson(ctx.request));
  await limitInvitations(inv.crew_id, inv.email);
  return json(await resendInvitation(db, { id: inv.id, version, actorId: user.id, origin: appOrigin(ctx.url) }));
});
