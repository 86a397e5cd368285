import { z } from 'zod';
import { crewOnly, rigAccess } from '../../../../server/access';
import { listActivity } from '../../../../server/activity';
import { db } from '../../../../server/db';
import { json, parseWith, requireUser, route } from '../../../../server/http';

const querySchema = z.object({
  limit: z.coerce.number({ error: 'must be a number' }).int({ error: 'must be a whole number' }).min(1, { error: 'must be at least 1' }).max(200, { error: 'must be at most 200' }).default(50),
  before: z.string().max(120, { error: 'is too long' }).optional(),
});

/** Who added, changed or removed which load, and when (crew members), newest first; `?before=` pages back. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = crewOnly(await rigAccess(db, user, ctx.params.id!, 'read'), 'activity');
  const q = parseWith(querySchema, Object.fromEntries(ctx.url.searchParams));
  return json(await listActivity(db, rig.id, { limit: q.limit, before: q.before }));
});
