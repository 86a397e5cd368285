import { db } from '../../../../server/db';
import { requireUser, route } from '../../../../server/http';
import { logAccess, logOriginal } from '../../../../server/monitor-logs';

export const prerender = false;

/** The log's file exactly as it was uploaded. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { log } = await logAccess(db, user, ctx.params.id!, 'read');
  const { name, bytes } = await logOriginal(db, log.id);
  const safe = name.replace(/[^\w.\- ]+/g, '_').slice(0, 100) || 'monitor-log.csv';
  return new Response(Buffer.from(bytes), {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${safe}"`,
      'cache-control': 'no-store',
      'x-content-type-options': 'nosniff',
    },
  });
});
