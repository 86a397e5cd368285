import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// Engine revision 2's new inputs. A load says where it sits (a fridge in the heated cabin or in an
// outside locker follows that place's temperature) and may give the watts one unit draws while
// starting; existing loads sit in the cabin and have no surge figure, as the engine's defaults say.
// A saved forecast records the engine revision that made it; rows saved before carry none
// (revision 1) and keep their numbers. Rig banks and inverters are JSON text and need no column.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .alterTable('loads')
    .addColumn('location', 'text', (c) => c.notNull().defaultTo('cabin').check(sql`location in ('cabin', 'outside')`))
    .execute();
  await db.schema
    .alterTable('loads')
    .addColumn('surge_watts', ty.real, (c) => c.check(sql`surge_watts is null or surge_watts >= 0`))
    .execute();
  await db.schema.alterTable('forecasts').addColumn('engine_revision', 'integer').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('forecasts').dropColumn('engine_revision').execute();
  await db.schema.alterTable('loads').dropColumn('surge_watts').execute();
  await db.schema.alterTable('loads').dropColumn('location').execute();
}
