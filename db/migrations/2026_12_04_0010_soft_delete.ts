import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Rigs and trips are deleted softly: `deleted_at` hides them everywhere for 30 days, during which a crew
// owner can restore them; the purge then removes them (and what hangs off them) for good. `deleted_by`
// names who deleted it. Loads record who changed them last, so a stale edit can say whose change it met.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  for (const table of ['rigs', 'trips']) {
    await db.schema.alterTable(table).addColumn('deleted_at', ty.time).execute();
    await db.schema
      .alterTable(table)
      .addColumn('deleted_by', 'text', (c) => c.references('user.id').onDelete('set null'))
      .execute();
    await db.schema.createIndex(`${table}_deleted_at`).on(table).column('deleted_at').execute();
  }
  await db.schema
    .alterTable('loads')
    .addColumn('updated_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('loads').dropColumn('updated_by').execute();
  for (const table of ['trips', 'rigs']) {
    await db.schema.dropIndex(`${table}_deleted_at`).execute();
    await db.schema.alterTable(table).dropColumn('deleted_by').execute();
    await db.schema.alterTable(table).dropColumn('deleted_at').execute();
  }
}
