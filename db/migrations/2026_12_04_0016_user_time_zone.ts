import type { Kysely } from 'kysely';

// The zone a person's app-event times are shown in (saved, edited, activity): a time zone name
// such as "America/Vancouver". Empty until their browser tells it once or they choose one in
// Settings; until then times show in UTC, labelled so.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('user').addColumn('timeZone', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('user').dropColumn('timeZone').execute();
}
