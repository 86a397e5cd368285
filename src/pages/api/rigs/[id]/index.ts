import { rigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { deleteRig, toRigDto, updateRig } from '../../../../server/rigs';
import { versionFrom } from '../../../../server/versions';
import { rigPatchSchema } from '../../../../domain/rigs/rigs.schema';

/** One rig. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig, canWrite, role } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(toRigDto(rig, canWrite, role === 'owner'));
});

/** Changes the fields sent; `version` is the one read (409 with the current rig when stale). */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig, role } = await rigAccess(db, user, ctx.params.id!, 'write');
  const patch = parseWith(rigPatchSchema, await readJson(ctx.request));
  return json(await updateRig(db, rig.id, patch, role === 'owner'));
});

/**
 * Deletes the rig with its loads, trips, saved forecasts and check-ins (crew owners only; restorable for
 * 30 days); `?version=N` (or If-Match) is the one read.
 */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'delete');
  await deleteRig(db, rig.id, versionFrom(ctx.url, ctx.request.headers), user.id);
  return new Response(null, { status: 204 });
});
