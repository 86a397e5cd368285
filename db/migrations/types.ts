import { PostgresAdapter, type Kysely } from 'kysely';

/**
 * Column types by meaning, for migrations that run on SQLite (the embedded default) and on
 * PostgreSQL. On SQLite they are exactly what the frozen migrations always created; on PostgreSQL
 * each meaning gets its proper type. db/client.ts turns PostgreSQL's values back into the app's
 * shapes (ISO strings, 0/1, JSON text), so the app reads the same values from both.
 */
export function columnTypes(db: Kysely<any>) {
  const pg = db.getExecutor().adapter instanceof PostgresAdapter;
  return {
    /** A point in time, written as an ISO 8601 UTC string. */
    time: pg ? ('timestamptz' as const) : ('text' as const),
    /** A calendar day, YYYY-MM-DD. */
    day: pg ? ('date' as const) : ('text' as const),
    /** JSON text the app writes and parses. */
    json: pg ? ('jsonb' as const) : ('text' as const),
    /** A yes/no flag, written as 1/0 by the app. */
    flag: pg ? ('boolean' as const) : ('integer' as const),
    /** The default of a flag column that is off. */
    off: pg ? false : 0,
    /** A double-precision number (SQLite's REAL is 8 bytes; PostgreSQL's `real` only 4). */
    real: pg ? ('double precision' as const) : ('real' as const),
    /** Raw bytes. */
    bytes: pg ? ('bytea' as const) : ('blob' as const),
    /** An integer that may pass 2^31 (epoch seconds and beyond). */
    big: pg ? ('bigint' as const) : ('integer' as const),
    /** better-auth's date fields (it writes Date objects). */
    authTime: pg ? ('timestamptz' as const) : ('date' as const),
    pg,
  };
}
