import { loadAccess } from '../../../server/access';
import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { deleteLoad, updateLoad } from '../../../server/loads';
import { versionFrom } from '../../../server/versions';
import { loadPatchSchema } from '../../../domain/loads/loads.schema';

/** Changes the fields sent; `version` is the one read (409 with the current load when stale). */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const { load } = await loadAccess(db, user, ctx.params.id!, 'write');
  const patch = parseWith(loadPatchSchema, await readJson(ctx.request));
  return json(await updateLoad(db, load.id, user.id, patch));
});

/** Removes the load; `?version=N` (or If-Match) is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { load } = await loadAccess(db, user, ctx.params.id!, 'write');
  await deleteLoad(db, load.id, user.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
