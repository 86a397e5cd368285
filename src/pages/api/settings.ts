import { db } from '../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../server/http';
import { settingsSchema, type SettingsDto } from '../../domain/accounts/accounts.schema';

/** Changes the signed-in user's name and/or units (metric or imperial). */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const input = parseWith(settingsSchema, await readJson(ctx.request), 'invalid_request', 'Some settings need fixing.');
  await db
    .updateTable('user')
    .set({
      ...(input.name !== undefined ? { name: input.name } : {}),
      ...(input.units !== undefined ? { units: input.units } : {}),
      updatedAt: new Date().toISOString(),
    })
    .where('id', '=', user.id)
    .execute();
  const row = await db.selectFrom('user').select(['name', 'units']).where('id', '=', user.id).executeTakeFirstOrThrow();
  const body: SettingsDto = { name: row.name, units: row.units };
  return json(body);
});
