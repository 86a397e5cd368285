import { db } from '../../../../server/db';
import { crewAccess } from '../../../../server/access';
import { crewDetail, renameCrew } from '../../../../server/crews';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { crewRenameSchema } from '../../../../domain/crews/crews.schema';

/** A crew with its members (and, for owners, its invitations). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const role = await crewAccess(db, user, ctx.params.id!, 'read');
  return json(await crewDetail(db, ctx.params.id!, user.id, role));
});

/** Renames the crew (owners); `version` is the one read. */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  await crewAccess(db, user, ctx.params.id!, 'manage');
  const input = parseWith(crewRenameSchema, await readJson(ctx.request));
  return json(await renameCrew(db, ctx.params.id!, input.name, input.version));
});
