import { sql, type Kysely } from 'kysely';

// Installer proposals: each installer's price list (one row, versioned), and proposals built from a
// saved forecast. A proposal keeps its own copies of the before and after plans and forecasts, so
// it outlives the forecast, the trip and even the installer's account (their name is kept).
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('price_lists')
    .addColumn('installer_id', 'text', (c) => c.primaryKey().references('user.id').onDelete('cascade'))
    .addColumn('currency', 'text', (c) => c.notNull())
    .addColumn('prices', 'text', (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
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
    .addColumn('changes', 'text', (c) => c.notNull())
    .addColumn('currency', 'text', (c) => c.notNull())
    .addColumn('parts', 'text', (c) => c.notNull())
    .addColumn('running', 'text', (c) => c.notNull())
    .addColumn('cables', 'text', (c) => c.notNull())
    .addColumn('cautions', 'text', (c) => c.notNull())
    .addColumn('reserve_soc_pct', 'real')
    .addColumn('summary', 'text', (c) => c.notNull())
    .addColumn('before_plan', 'text', (c) => c.notNull())
    .addColumn('before_result', 'text', (c) => c.notNull())
    .addColumn('after_plan', 'text', (c) => c.notNull())
    .addColumn('after_result', 'text', (c) => c.notNull())
    .addColumn('decision_comment', 'text')
    .addColumn('decided_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('decided_at', 'text')
    .addColumn('sent_at', 'text')
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('proposals_rig_idx').on('proposals').columns(['rig_id', 'created_at']).execute();
  await db.schema.createIndex('proposals_installer_idx').on('proposals').columns(['installer_id', 'created_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('proposals').ifExists().execute();
  await db.schema.dropTable('price_lists').ifExists().execute();
}
