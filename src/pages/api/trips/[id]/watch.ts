import { z } from 'zod';
import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { HttpError } from '../../../../server/errors';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { setWatchEnabled, watchView } from '../../../../server/watch-state';

export const prerender = false;

const toggleSchema = z.object({ enabled: z.boolean({ error: 'must be true or false' }) }, { error: 'must be an object with enabled' });

/** The trip's watch: on or off, the window, the next run, the notice and the last runs (any crew member or installer who sees the trip). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, role } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(await watchView(db, { trip, role, userId: user.id }));
});

/** `{ enabled }`: the owner or an editor turns the trip's watch on or off; answers the watch as GET does. */
export const PUT = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, role } = await tripAccess(db, user, ctx.params.id!, 'read');
  if (role !== 'owner' && role !== 'editor') {
    throw new HttpError('forbidden', 'Only the crew’s owners and editors can turn the trip watch on or off. You can follow it for your own e-mail.', [{ path: 'enabled', message: 'owners and editors only' }]);
  }
  const body = parseWith(toggleSchema, await readJson(ctx.request, 1024), 'invalid_request', 'Say whether the watch is on: { "enabled": true } or false.');
  await setWatchEnabled(db, trip.id, body.enabled);
  return json(await watchView(db, { trip, role, userId: user.id }));
});
