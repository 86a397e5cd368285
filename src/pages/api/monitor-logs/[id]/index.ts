import { db } from '../../../../server/db';
import { json, requireUser, route } from '../../../../server/http';
import { deleteLog, logAccess, logDetail, pageFrom } from '../../../../server/monitor-logs';
import { versionFrom } from '../../../../server/versions';

export const prerender = false;

/**
 * A monitor log with its overview (readings thinned for charts, night-time baseline, daily Ah),
 * the saved forecasts of its dates and one page of its readings (`?after=<ms>&limit=<1–1000>`).
 */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const page = pageFrom(ctx.url);
  const { log } = await logAccess(db, user, ctx.params.id!, 'read');
  return json(await logDetail(db, log, page));
});

/** Removes a log and its readings; `?version=N` is the one read. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const { log } = await logAccess(db, user, ctx.params.id!, 'write');
  await deleteLog(db, log.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
