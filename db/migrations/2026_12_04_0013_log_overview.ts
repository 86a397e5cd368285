import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// A monitor log's overview (its readings thinned for a chart, the night-time baseline, each day's
// amp-hours), computed once when the log is saved so a log page never reads every reading again.
// Logs saved before this have none until first opened.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema.alterTable('monitor_logs').addColumn('overview', ty.json).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('monitor_logs').dropColumn('overview').execute();
}
