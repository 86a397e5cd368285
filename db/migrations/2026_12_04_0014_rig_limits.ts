import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// What a rig may still carry and the room it has for batteries, both optional: the upgrade sweep
// checks each bank option's weight and size against them. Existing rigs state neither.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .alterTable('rigs')
    .addColumn('payload_kg', ty.real, (c) => c.check(sql`payload_kg is null or payload_kg > 0`))
    .execute();
  await db.schema
    .alterTable('rigs')
    .addColumn('battery_space_l', ty.real, (c) => c.check(sql`battery_space_l is null or battery_space_l > 0`))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('rigs').dropColumn('battery_space_l').execute();
  await db.schema.alterTable('rigs').dropColumn('payload_kg').execute();
}
