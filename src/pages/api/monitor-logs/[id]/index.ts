import { db } from '../../../../server/db';
import { json, requireUser, route } from '../../../../server/http';
import { deleteLog, logAccess, logDetail } from '../../../../server/monitor-logs';
import { versionFrom } from '../../../../server/versions';

export const prerender = false;

/** A monitor log with its series (thinned for charts), night-time baseline, daily Ah and the saved forecasts of its dates. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { log } = await logAccess(db, user, ctx.params.id!, 'read');
  return json(await logDetail(db, log));
});

/** Removes a log and its readings; `?version=N` is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { log } = await logAccess(db, user, ctx.params.id!, 'write');
  await deleteLog(db, log.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
