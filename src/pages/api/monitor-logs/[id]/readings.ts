import { db } from '../../../../server/db';
import { json, requireUser, route } from '../../../../server/http';
import { logAccess, logReadings, pageFrom } from '../../../../server/monitor-logs';

export const prerender = false;

/** One page of a log's readings in time order: `?after=<ms of the last reading you have>&limit=<1–1000>`; `next` leads on. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const page = pageFrom(ctx.url);
  const { log } = await logAccess(db, user, ctx.params.id!, 'read');
  return json(await logReadings(db, log.id, page));
});
