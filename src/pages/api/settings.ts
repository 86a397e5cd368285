import { db } from '../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../server/http';
import { updateSettings } from '../../server/settings';
import { settingsSchema } from '../../domain/accounts/accounts.schema';

/** Changes the signed-in user's name, units (metric or imperial) and/or time zone. */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const input = parseWith(settingsSchema, await readJson(ctx.request), 'invalid_request', 'Some settings need fixing.');
  return json(await updateSettings(db, user.id, input));
});
