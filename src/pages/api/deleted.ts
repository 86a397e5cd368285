import { db } from '../../server/db';
import { listRecentlyDeleted } from '../../server/deletion';
import { json, requireUser, route } from '../../server/http';

/** Rigs and trips deleted in the crews the user owns, still restorable, with the days left before the purge. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await listRecentlyDeleted(db, user.id));
});
