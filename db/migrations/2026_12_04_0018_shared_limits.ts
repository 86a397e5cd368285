import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Rate-limit counters that several app instances share. Only on PostgreSQL: on SQLite the one
// process counts in memory. `rateLimit` is better-auth's table (its camelCase names, as in 0001);
// `rate_limits` is the table of rate-limiter-flexible's PostgreSQL store, in its own layout.
export async function up(db: Kysely<any>): Promise<void> {
  if (!columnTypes(db).pg) return;
  await db.schema
    .createTable('rateLimit')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('key', 'text', (c) => c.notNull().unique())
    .addColumn('count', 'integer', (c) => c.notNull())
    .addColumn('lastRequest', 'bigint', (c) => c.notNull())
    .execute();
  await db.schema
    .createTable('rate_limits')
    .addColumn('key', 'varchar(255)', (c) => c.primaryKey())
    .addColumn('points', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('expire', 'bigint')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('rate_limits').ifExists().execute();
  await db.schema.dropTable('rateLimit').ifExists().execute();
}
