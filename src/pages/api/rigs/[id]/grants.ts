import { crewOnly, rigAccess } from '../../../../server/access';
import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { createGrant, listGrants } from '../../../../server/grants';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { limitGrants } from '../../../../server/invite-limits';
import { grantCreateSchema } from '../../../../domain/crews/crews.schema';

/** The installers this rig is shared with (crew members), and whether the caller may change that (owners). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig, role } = crewOnly(await rigAccess(db, user, ctx.params.id!, 'read'), 'installer list');
  return json({ grants: await listGrants(db, rig.id), canManage: role === 'owner' });
});

/** Shares the rig with an installer account, by its e-mail (crew owners). */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'manage');
  const { email } = parseWith(grantCreateSchema, await readJson(ctx.request));
  await limitGrants(user.id);
  return json(await createGrant(db, { rigId: rig.id, ownerId: user.id, email, origin: appOrigin(ctx.url) }), 201);
});
