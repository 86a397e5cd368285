import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { acceptInvitation } from '../../../server/invitations';
import { invitationAcceptSchema } from '../../../domain/crews/crews.schema';

/** Accepts the invitation of a link for the signed-in user (the invited address only); single use. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { token } = parseWith(invitationAcceptSchema, await readJson(ctx.request));
  return json(await acceptInvitation(db, token, user as { id: string; email: string; kind?: string }));
});
