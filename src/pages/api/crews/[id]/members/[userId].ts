import { db } from '../../../../../server/db';
import { crewAccess } from '../../../../../server/access';
import { changeRole, removeMember } from '../../../../../server/crews';
import { json, parseWith, readJson, requireUser, route } from '../../../../../server/http';
import { versionFrom } from '../../../../../server/versions';
import { memberRoleSchema } from '../../../../../domain/crews/crews.schema';

/** Changes a member's role (owners); the last owner cannot be demoted. */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  await crewAccess(db, user, ctx.params.id!, 'manage');
  const input = parseWith(memberRoleSchema, await readJson(ctx.request));
  return json(await changeRole(db, ctx.params.id!, ctx.params.userId!, input.role, input.version, user.id));
});

/** Removes a member (owners), or lets a member leave (their own id); the last owner cannot go. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const leaving = ctx.params.userId === user.id;
  await crewAccess(db, user, ctx.params.id!, leaving ? 'read' : 'manage');
  await removeMember(db, ctx.params.id!, ctx.params.userId!, versionFrom(ctx.url, ctx.request.headers), user.id);
  return new Response(null, { status: 204 });
});
