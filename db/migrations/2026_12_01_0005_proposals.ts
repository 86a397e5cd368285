import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// Installer proposals: each installer's price list (one row, versioned), and proposals built from a
// saved forecast. A proposal keeps its own copies of the before and after plans and forecasts, so
// it outlives the forecast, the trip and even the installer's account (their name is kept).
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('price_lists')
    .addColumn('installer_id', 'text', (c) => c.primaryKey().references('user.id').onDelete('cascade'))
    .addColumn('currency', 'text', (c) => c.notNull())
    .addColumn('prices', ty.json, (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('proposals')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('trip_id', 'text', (c) => c.references('trips.id').onDelete('set null'))
    .addColumn('forecast_id', 'text', (c) => c.references('forecasts.id').onDelete('set null'))
    .addColumn('installer_id', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('installer_name', 'text', (c) => c.notNull())
    .addColumn('title', 'text', (c) => c.notNull())
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('draft').check(sql`status in ('draft', 'sent', 'accepted', 'declined')`))
    .addColumn('changes', ty.json, (c) => c.notNull())
    .addColumn('currency', 'text', (c) => c.notNull())
    .addColumn('parts', ty.json, (c) => c.notNull())
    .addColumn('running', ty.json, (c) => c.notNull())
    .addColumn('cables', ty.json, (c) => c.notNull())
    .addColumn('cautions', ty.json, (c) => c.notNull())
    .addColumn('reserve_soc_pct', ty.real)
    .addColumn('summary', ty.json, (c) => c.notNull())
    .addColumn('before_plan', ty.json, (c) => c.notNull())
    .addColumn('before_result', ty.json, (c) => c.notNull())
    .addColumn('after_plan', ty.json, (c) => c.notNull())
    .addColumn('after_result', ty.json, (c) => c.notNull())
    .addColumn('decision_comment', 'text')
    .addColumn('decided_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('decided_at', ty.time)
    .addColumn('sent_at', ty.time)
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('proposals_rig_idx').on('proposals').columns(['rig_id', 'created_at']).execute();
  await db.schema.createIndex('proposals_installer_idx').on('proposals').columns(['installer_id', 'created_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('proposals').ifExists().execute();
  await db.schema.dropTable('price_lists').ifExists().execute();
}
