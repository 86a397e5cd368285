import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Trip watch: one row per piece of background work (e.g. "watch-run"); the instance that holds an
// unexpired lease does the work, so several server instances never run it twice. Times are epoch ms.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('watch_leases')
    .addColumn('name', 'text', (c) => c.primaryKey())
    .addColumn('holder', 'text', (c) => c.notNull())
    .addColumn('expires_at', ty.big, (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('watch_leases').execute();
}
