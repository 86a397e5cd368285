import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { SettingsDto, SettingsInput } from '../domain/accounts/accounts.schema';

/** Changes the user's name, units and/or time zone (a field not sent stays as it is) and returns them. */
export async function updateSettings(db: Kysely<DB>, userId: string, input: Pick<SettingsInput, 'name' | 'units' | 'timeZone' | 'deviceTimeZone'>): Promise<SettingsDto> {
  if (input.deviceTimeZone !== undefined && input.timeZone === undefined) {
    // The browser's zone fills an empty setting only, in one statement, so a stale tab never undoes a choice.
    await db.updateTable('user').set({ timeZone: input.deviceTimeZone }).where('id', '=', userId).where('timeZone', 'is', null).execute();
  }
  await db
    .updateTable('user')
    .set({
      ...(input.name !== undefined ? { name: input.name } : {}),
      ...(input.units !== undefined ? { units: input.units } : {}),
      ...(input.timeZone !== undefined ? { timeZone: input.timeZone } : {}),
      updatedAt: new Date().toISOString(),
    })
    .where('id', '=', userId)
    .execute();
  const row = await db.selectFrom('user').select(['name', 'units', 'timeZone']).where('id', '=', userId).executeTakeFirstOrThrow();
  return { name: row.name, units: row.units, timeZone: row.timeZone };
}
