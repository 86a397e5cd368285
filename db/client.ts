import Database from 'better-sqlite3';
import { CompiledQuery, Kysely, SqliteDialect, SqliteDriver, type DatabaseConnection, type SqliteDialectConfig } from 'kysely';
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

/**
 * Transactions take SQLite's write lock when they begin (BEGIN IMMEDIATE). A deferred BEGIN that
 * reads and then writes fails at once with SQLITE_BUSY when another process (the mail catcher,
 * a backup, a seed) committed in between — the busy timeout cannot help there — whereas an
 * immediate one simply waits its turn.
 */
class ImmediateSqliteDriver extends SqliteDriver {
  override async beginTransaction(connection: DatabaseConnection): Promise<void> {
    await connection.executeQuery(CompiledQuery.raw('begin immediate'));
  }
}

class ImmediateSqliteDialect extends SqliteDialect {
  readonly #driverConfig: SqliteDialectConfig;
  constructor(config: SqliteDialectConfig) {
    super(config);
    this.#driverConfig = config;
  }
  override createDriver() {
    return new ImmediateSqliteDriver(this.#driverConfig);
  }
}

/** Creates the typed Kysely instance over one better-sqlite3 connection. */
export function createDb(path: string): { db: Kysely<DB>; sqlite: Database.Database } {
  const sqlite = openSqlite(path);
  const db = new Kysely<DB>({ dialect: new ImmediateSqliteDialect({ database: sqlite }) });
  return { db, sqlite };
}

export const DEFAULT_DATABASE_PATH = 'db/data/sunreckon.sqlite';
