import { rigAccess } from '../../../../../server/access';
import { db } from '../../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../../server/http';
import { createLoad, listLoads } from '../../../../../server/loads';
import { loadInputSchema } from '../../../../../domain/loads/loads.schema';

/** The rig's loads, by position then when they were added. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(await listLoads(db, rig.id));
});

/** Adds a load (at the end of the list unless `position` is sent). */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  const input = parseWith(loadInputSchema, await readJson(ctx.request));
  return json(await createLoad(db, rig.id, user.id, input), 201);
});
