import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { crewAccess } from '../../../../server/access';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { createInvitation, listInvitations } from '../../../../server/invitations';
import { invitationCreateSchema } from '../../../../domain/crews/crews.schema';
import { limitInvitations } from '../../../../server/invite-limits';

/** The crew's open and expired invitations (owners). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  await crewAccess(db, user, ctx.params.id!, 'manage');
  return json(await listInvitations(db, ctx.params.id!));
});

/** Invites an e-mail address with a role (owners); the link is e-mailed, never returned. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  await crewAccess(db, user, ctx.params.id!, 'manage');
  const input = parseWith(invitationCreateSchema, await readJson(ctx.request));
  await limitInvitations(ctx.params.id!, input.email);
  const invitation = await createInvitation(db, { crewId: ctx.params.id!, inviterId: user.id, email: input.email, role: input.role, origin: appOrigin(ctx.url) });
  return json(invitation, 201);
});
