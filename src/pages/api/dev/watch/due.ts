import { db } from '../../../../server/db';
import { env } from '../../../../server/env';
import { HttpError } from '../../../../server/errors';
import { json, requireUser, route } from '../../../../server/http';

export const prerender = false;

/**
 * Development only: makes every watched trip due a run now (forgets when each last ran), so the /dev
 * page's "Run the watch now" re-runs them at once instead of waiting out WATCH_INTERVAL_MINUTES.
 * The runs, notices and the mail limit (one e-mail per person per 12 hours) are left as they are.
 */
export const POST = route(async (ctx) => {
  if (env.isProduction) throw new HttpError('not_found', 'Not found.');
  requireUser(ctx);
  const res = await db.updateTable('trip_watches').set({ last_run_at: null }).where('last_run_at', 'is not', null).executeTakeFirst();
  return json({ due: Number(res.numUpdatedRows) });
});
