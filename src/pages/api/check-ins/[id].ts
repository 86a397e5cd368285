import { checkInAccess, deleteCheckIn } from '../../../server/check-ins';
import { db } from '../../../server/db';
import { requireUser, route } from '../../../server/http';
import { versionFrom } from '../../../server/versions';

export const prerender = false;

/** Removes a check-in (a reading typed wrong); `?version=N` is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { checkIn } = await checkInAccess(db, user, ctx.params.id!, 'write');
  await deleteCheckIn(db, checkIn.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
