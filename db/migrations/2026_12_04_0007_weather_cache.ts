import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Answers of the weather service, so a trip opened twice asks once and works offline at camp.
// Keyed by place (latitude and longitude in tenths of a degree, ~11 km), the UTC date range asked
// and the kind of answer; `fetched_at` decides when a forecast is stale (history never is).
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('weather_cache')
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('lat_tenths', 'integer', (c) => c.notNull())
    .addColumn('lon_tenths', 'integer', (c) => c.notNull())
    .addColumn('start_date', ty.day, (c) => c.notNull())
    .addColumn('end_date', ty.day, (c) => c.notNull())
    // JSON: the hourly series as decoded (instants, GHI, temperature, cloud cover).
    .addColumn('series', ty.json, (c) => c.notNull())
    .addColumn('fetched_at', ty.time, (c) => c.notNull())
    .addPrimaryKeyConstraint('weather_cache_pk', ['kind', 'lat_tenths', 'lon_tenths', 'start_date', 'end_date'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('weather_cache').execute();
}
