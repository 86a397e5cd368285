import { z } from 'zod';
import { tripAccess } from '../../../../../server/access';
import { db } from '../../../../../server/db';
import { HttpError } from '../../../../../server/errors';
import { json, parseWith, readJson, requireUser, route } from '../../../../../server/http';
import { setMailChoice, watchView } from '../../../../../server/watch-state';

export const prerender = false;

const followSchema = z.object({ following: z.boolean({ error: 'must be true or false' }) }, { error: 'must be an object with following' });

/** `{ following }`: a crew member starts or stops the trip watch's e-mail to their own address; answers the watch as GET does. */
export const PUT = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, role } = await tripAccess(db, user, ctx.params.id!, 'read');
  if (role === 'installer') {
    throw new HttpError('forbidden', 'Only members of the trip’s crew can follow its watch.', [{ path: 'following', message: 'crew members only' }]);
  }
  const body = parseWith(followSchema, await readJson(ctx.request, 1024), 'invalid_request', 'Say whether to follow the watch: { "following": true } or false.');
  await setMailChoice(db, trip.id, user.id, body.following ? 'follow' : 'stop');
  return json(await watchView(db, { trip, role, userId: user.id }));
});
