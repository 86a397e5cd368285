import { crewOnly, rigAccess } from '../../../../server/access';
import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { createGrant, listGrants, listShareInvites, SHARE_SENT_MESSAGE } from '../../../../server/grants';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { limitGrants } from '../../../../server/invite-limits';
import { grantCreateSchema } from '../../../../domain/crews/crews.schema';

/** The installers this rig is shared with, the shares not yet opened (crew members), and whether the caller may change that (owners). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig, role } = crewOnly(await rigAccess(db, user, ctx.params.id!, 'read'), 'installer list');
  return json({ grants: await listGrants(db, rig.id), invited: await listShareInvites(db, rig.id), canManage: role === 'owner' });
});

/** Shares the rig with an e-mail address (crew owners); 202 with the same answer for any address. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'manage');
  const { email } = parseWith(grantCreateSchema, await readJson(ctx.request));
  await limitGrants(user.id);
  const invited = await createGrant(db, { rigId: rig.id, ownerId: user.id, email, origin: appOrigin(ctx.url) });
  return json({ invited, message: SHARE_SENT_MESSAGE }, 202);
});
