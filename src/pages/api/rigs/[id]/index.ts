import { rigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { deleteRig, toRigDto, updateRig } from '../../../../server/rigs';
import { versionFrom } from '../../../../server/versions';
import { rigPatchSchema } from '../../../../domain/rigs/rigs.schema';

/** One rig. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig, canWrite } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(toRigDto(rig, canWrite));
});

/** Changes the fields sent; `version` is the one read (409 with the current rig when stale). */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  const patch = parseWith(rigPatchSchema, await readJson(ctx.request));
  return json(await updateRig(db, rig.id, patch));
});

/** Deletes the rig with its loads and trips; `?version=N` (or If-Match) is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  await deleteRig(db, rig.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
