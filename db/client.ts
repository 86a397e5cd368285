import Database from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import type { DB } from './schema';

/** Opens the SQLite file with the settings every connection needs (WAL, foreign keys, busy timeout). */
export function openSqlite(path: string): Database.Database {
  if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true });
  const sqlite = new Database(path);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  // WAL with synchronous NORMAL is durable across process crashes (only an OS crash can lose the tail).
  sqlite.pragma('synchronous = NORMAL');
  return sqlite;
}

/** Creates the typed Kysely instance over one better-sqlite3 connection. */
export function createDb(path: string): { db: Kysely<DB>; sqlite: Database.Database } {
  const sqlite = openSqlite(path);
  const db = new Kysely<DB>({ dialect: new SqliteDialect({ database: sqlite }) });
  return { db, sqlite };
}

export const DEFAULT_DATABASE_PATH = 'db/data/sunreckon.sqlite';
