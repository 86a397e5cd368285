import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Monitor logs (a battery monitor's CSV export: the original file and its parsed series) and
// check-ins (an at-camp reading that re-anchors the forecast for the rest of the trip).
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('monitor_logs')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    // The file exactly as uploaded, so a log can be read again with a different column mapping.
    .addColumn('original', ty.bytes, (c) => c.notNull())
    .addColumn('original_bytes', 'integer', (c) => c.notNull())
    .addColumn('mapping', ty.json, (c) => c.notNull())
    .addColumn('time_zone', 'text', (c) => c.notNull())
    .addColumn('sample_count', 'integer', (c) => c.notNull())
    .addColumn('started_at', ty.time, (c) => c.notNull())
    .addColumn('ended_at', ty.time, (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('monitor_logs_rig_idx').on('monitor_logs').columns(['rig_id', 'created_at']).execute();

  // One row per reading: t in ms since the epoch (UTC); amps positive while charging, whatever
  // sign the monitor used; any of the measured values may be missing.
  await db.schema
    .createTable('monitor_samples')
    .addColumn('log_id', 'text', (c) => c.notNull().references('monitor_logs.id').onDelete('cascade'))
    .addColumn('t', ty.big, (c) => c.notNull())
    .addColumn('volts', ty.real)
    .addColumn('amps', ty.real)
    .addColumn('soc_pct', ty.real)
    .addColumn('temp_c', ty.real)
    .execute();
  await db.schema.createIndex('monitor_samples_log_idx').on('monitor_samples').columns(['log_id', 't']).execute();

  // The id is made by the client (a UUID), so a check-in sent twice — or queued offline and
  // sent again after a lost answer — is stored once.
  await db.schema
    .createTable('check_ins')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('trip_id', 'text', (c) => c.notNull().references('trips.id').onDelete('cascade'))
    .addColumn('at', ty.time, (c) => c.notNull())
    .addColumn('at_ms', ty.big, (c) => c.notNull())
    .addColumn('source', 'text', (c) => c.notNull())
    .addColumn('soc_pct', ty.real, (c) => c.notNull())
    .addColumn('resting_volts', ty.real)
    .addColumn('forecast_id', 'text', (c) => c.references('forecasts.id').onDelete('set null'))
    .addColumn('result', ty.json, (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('check_ins_trip_idx').on('check_ins').columns(['trip_id', 'at_ms']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('check_ins').ifExists().execute();
  await db.schema.dropTable('monitor_samples').ifExists().execute();
  await db.schema.dropTable('monitor_logs').ifExists().execute();
}
