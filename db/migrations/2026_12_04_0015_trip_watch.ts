import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Trip watch (issue #20): the background job that re-runs an upcoming trip's forecast with fresh
// weather and tells the crew when the answer changes in a way that matters.
//   forecasts.kind      'plan' (run by a person) or 'watch' (run by the watch).
//   trip_watches        one row per watched trip: the owner's or an editor's choice (null: the
//                       default), when it last ran, the last answer the crew saw, the last error,
//                       and the notice the trip page shows (the latest change told).
//   watch_runs          one row per watch run: the figures the timeline shows, without the hourly rows.
//   watch_people        one row per person and trip: follow / stop choice and when they were last mailed.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .alterTable('forecasts')
    .addColumn('kind', 'text', (c) => c.notNull().defaultTo('plan'))
    .execute();
  await db.schema.createIndex('forecasts_trip_kind').on('forecasts').columns(['trip_id', 'kind', 'created_at']).execute();

  await db.schema
    .createTable('trip_watches')
    .addColumn('trip_id', 'text', (c) => c.primaryKey().references('trips.id').onDelete('cascade'))
    .addColumn('enabled', ty.flag)
    .addColumn('last_run_at', ty.time)
    .addColumn('seen_forecast_id', 'text')
    .addColumn('seen_status', 'text')
    .addColumn('seen_min_soc_pct', ty.real)
    // A row time with the stop's own offset ("2026-12-11T03:00:00-07:00"), kept as written.
    .addColumn('seen_cutoff_at', 'text')
    .addColumn('last_error', 'text')
    .addColumn('last_error_at', ty.time)
    .addColumn('notice_at', ty.time)
    .addColumn('notice_forecast_id', 'text')
    .addColumn('notice_status', 'text')
    .addColumn('notice_previous_status', 'text')
    .addColumn('notice_summary', 'text')
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('watch_runs')
    .addColumn('forecast_id', 'text', (c) => c.primaryKey().references('forecasts.id').onDelete('cascade'))
    .addColumn('trip_id', 'text', (c) => c.notNull().references('trips.id').onDelete('cascade'))
    .addColumn('ran_at', ty.time, (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('min_soc_pct', ty.real, (c) => c.notNull())
    .addColumn('first_cutoff_at', 'text')
    .addColumn('first_cutoff_local', 'text')
    .addColumn('changed', ty.flag, (c) => c.notNull().defaultTo(ty.off))
    .addColumn('reason', 'text')
    .addColumn('band_low_pct', ty.real)
    .addColumn('band_high_pct', ty.real)
    .execute();
  await db.schema.createIndex('watch_runs_trip').on('watch_runs').columns(['trip_id', 'ran_at']).execute();

  await db.schema
    .createTable('watch_people')
    .addColumn('trip_id', 'text', (c) => c.notNull().references('trips.id').onDelete('cascade'))
    .addColumn('user_id', 'text', (c) => c.notNull().references('user.id').onDelete('cascade'))
    // 'follow' (a viewer asked for the mail) or 'stop' (unsubscribed); null: the role's default.
    .addColumn('choice', 'text')
    .addColumn('last_mailed_at', ty.time)
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .addPrimaryKeyConstraint('watch_people_pk', ['trip_id', 'user_id'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('watch_people').execute();
  await db.schema.dropTable('watch_runs').execute();
  await db.schema.dropTable('trip_watches').execute();
  await db.schema.dropIndex('forecasts_trip_kind').execute();
  await db.schema.alterTable('forecasts').dropColumn('kind').execute();
}
