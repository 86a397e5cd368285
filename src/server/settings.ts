import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { SettingsDto, SettingsInput } from '../domain/accounts/accounts.schema';

/** Changes the user's name and/or units (a field not sent stays as it is) and returns both. */
export async function updateSettings(db: Kysely<DB>, userId: string, input: Pick<SettingsInput, 'name' | 'units'>): Promise<SettingsDto> {
  await db
    .updateTable('user')
    .set({
      ...(input.name !== undefined ? { name: input.name } : {}),
      ...(input.units !== undefined ? { units: input.units } : {}),
      updatedAt: new Date().toISOString(),
    })
    .where('id', '=', userId)
    .execute();
  const row = await db.selectFrom('user').select(['name', 'units']).where('id', '=', userId).executeTakeFirstOrThrow();
  return { name: row.name, units: row.units };
}
