import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Saved forecasts: a snapshot of the exact plan that was run plus its result. The hourly series
// is stored column-wise (one array per field) in `result`, which is about a third of the row form.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('forecasts')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('trip_id', 'text', (c) => c.notNull().references('trips.id').onDelete('cascade'))
    .addColumn('rig_id', 'text', (c) => c.notNull())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('plan', ty.json, (c) => c.notNull())
    .addColumn('summary', ty.json, (c) => c.notNull())
    .addColumn('result', ty.json, (c) => c.notNull())
    .addColumn('reserve_soc_pct', ty.real)
    .addColumn('created_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('forecasts_trip_idx').on('forecasts').columns(['trip_id', 'created_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('forecasts').ifExists().execute();
}
