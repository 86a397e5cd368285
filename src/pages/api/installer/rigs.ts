import { db } from '../../../server/db';
import { HttpError } from '../../../server/errors';
import { listInstallerRigs, openShares } from '../../../server/grants';
import { json, requireUser, route } from '../../../server/http';

/** The rigs crews have shared with the signed-in installer; opening the list opens every share waiting on them. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  if ((user as { kind?: string }).kind !== 'installer') {
    throw new HttpError('forbidden', 'This list is for installer accounts; your crews’ rigs are under Rigs.');
  }
  await openShares(db, user.id);
  return json(await listInstallerRigs(db, user.id));
});
