import Database from 'better-sqlite3';
import {
  CompiledQuery,
  Kysely,
  PostgresDialect,
  PostgresDriver,
  SqliteDialect,
  SqliteDriver,
  type DatabaseConnection,
  type KyselyPlugin,
  type PluginTransformQueryArgs,
  type PluginTransformResultArgs,
  type PostgresDialectConfig,
  type QueryResult,
  type RootOperationNode,
  type SqliteDialectConfig,
  type TransactionSettings,
  type UnknownRow,
} from 'kysely';
import pg from 'pg';
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

// ---------------------------------------------------------------------------------------------
// PostgreSQL, for deployments with several app instances (DATABASE_URL=postgres://…).
//
// The app's values keep one shape on both databases: timestamps are ISO 8601 strings, flags 0/1,
// JSON columns the JSON text the app wrote, counts plain numbers. PostgreSQL stores them in its own
// types (timestamptz, boolean, jsonb, bigint); the type parsers below and AppValues (on the app's
// Kysely instance only) turn them back. better-auth gets its own instance over the same pool without
// AppValues, because it wants Date objects and booleans, as it gets on PostgreSQL anywhere.

pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);
pg.types.setTypeParser(pg.types.builtins.JSON, (v) => v);
pg.types.setTypeParser(pg.types.builtins.JSONB, (v) => v);

/** Rows as the app reads them on SQLite: Date → ISO string, boolean → 1/0. */
class AppValues implements KyselyPlugin {
  transformQuery(args: PluginTransformQueryArgs): RootOperationNode {
    return args.node;
  }
  async transformResult(args: PluginTransformResultArgs): Promise<QueryResult<UnknownRow>> {
    for (const row of args.result.rows) {
      for (const key in row) {
        const v = row[key];
        if (v instanceof Date) row[key] = v.toISOString();
        else if (typeof v === 'boolean') row[key] = v ? 1 : 0;
      }
    }
    return args.result;
  }
}

/**
 * PostgreSQL's stand-in for SQLite's BEGIN IMMEDIATE: every transaction takes one transaction-level
 * advisory lock first, so read-then-write transactions run one at a time across every instance, as
 * they do on SQLite. Plain statements outside transactions do not wait for it.
 */
const WRITE_LOCK = 7_216_001;
class SerializedPostgresDriver extends PostgresDriver {
  override async beginTransaction(connection: DatabaseConnection, settings: TransactionSettings): Promise<void> {
    await super.beginTransaction(connection, settings);
    await connection.executeQuery(CompiledQuery.raw(`select pg_advisory_xact_lock(${WRITE_LOCK})`));
  }
}
class SerializedPostgresDialect extends PostgresDialect {
  readonly #driverConfig: PostgresDialectConfig;
  constructor(config: PostgresDialectConfig) {
    super(config);
    this.#driverConfig = config;
  }
  override createDriver() {
    return new SerializedPostgresDriver(this.#driverConfig);
  }
}

export type DatabaseKind = 'sqlite' | 'postgres';

export interface OpenDatabase {
  kind: DatabaseKind;
  /** The app's instance (values in the app's shapes). */
  db: Kysely<DB>;
  /** better-auth's instance: the same connection or pool. */
  authDb: Kysely<DB>;
  /** The PostgreSQL pool (rate limits share it), when on PostgreSQL. */
  pool: pg.Pool | null;
  close(): Promise<void>;
}

export function isPostgresUrl(url: string | undefined): url is string {
  return !!url && /^postgres(ql)?:\/\//.test(url);
}

/** Opens the app's database: PostgreSQL when `url` is a postgres:// URL, else the SQLite file at `path`. */
export function openDatabase(opts: { url?: string; path: string; poolMax?: number }): OpenDatabase {
  if (isPostgresUrl(opts.url)) {
    const pool = new pg.Pool({ connectionString: opts.url, max: opts.poolMax ?? 10 });
    // An idle client that loses its server must not take the process down.
    pool.on('error', (err) => console.error('[sunreckon] PostgreSQL pool:', err.message));
    const db = new Kysely<DB>({ dialect: new SerializedPostgresDialect({ pool }), plugins: [new AppValues()] });
    const authDb = new Kysely<DB>({ dialect: new SerializedPostgresDialect({ pool }) });
    return {
      kind: 'postgres',
      db,
      authDb,
      pool,
      close: async () => {
        await pool.end();
      },
    };
  }
  const { db, sqlite } = createDb(opts.path);
  return {
    kind: 'sqlite',
    db,
    authDb: db,
    pool: null,
    close: async () => {
      sqlite.close();
    },
  };
}
