import { execFileSync } from 'node:child_process';
import path from 'node:path';
import Database from 'better-sqlite3';
import { inject } from 'vitest';

/**
 * The tests' direct handle on the app's database, for asserting what was stored and for set-ups
 * the API cannot make. On SQLite it is better-sqlite3 itself; when the suite runs on PostgreSQL
 * (the server's "dbPath" is then its postgres:// URL) it is a small stand-in with the same three
 * calls, running each statement through `pg` in a child process so the tests stay synchronous.
 * Statements are written in SQLite's spelling; for PostgreSQL `?` becomes `$n`, and the camelCase
 * columns of better-auth's tables and the table `user` are quoted, and SQLite's `rowid` (insertion
 * order) becomes PostgreSQL's `ctid` (the same on these insert-only test tables).
 */
export interface TestDb {
  prepare(sql: string): {
    get(...params: unknown[]): unknown;
    all(...params: unknown[]): unknown[];
    run(...params: unknown[]): { changes: number };
  };
  /** Runs SQL without parameters (several statements allowed). */
  exec(sql: string): void;
  close(): void;
}

export function isPostgres(where: string): boolean {
  return /^postgres(ql)?:\/\//.test(where);
}

const QUERY = path.join(import.meta.dirname, 'pg-query.mjs');

/** SQLite spelling → PostgreSQL: placeholders, better-auth's camelCase names, the `user` table. */
export function toPostgres(sql: string): string {
  let n = 0;
  // Split on single-quoted literals so nothing inside them changes.
  return sql
    .split(/('(?:[^']|'')*')/)
    .map((part, i) => {
      if (i % 2 === 1) return part;
      return part
        .replace(/\?/g, () => `$${++n}`)
        .replace(/(?<!["\w])([a-z]+[A-Z]\w*)(?!["\w])/g, '"$1"')
        .replace(/\browid\b/g, 'ctid')
        .replace(/\b(from|into|update|join)\s+user\b/gi, '$1 "user"');
    })
    .join('');
}

function pgStatement(url: string, sql: string, params: unknown[], mode: 'all' | 'run') {
  const out = execFileSync(process.execPath, [QUERY], {
    input: JSON.stringify({ url, sql: params.length > 0 ? toPostgres(sql) : sql, params, mode }),
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
  });
  const parsed = JSON.parse(out) as { rows: Record<string, unknown>[]; changes: number };
  for (const row of parsed.rows) {
    for (const [k, v] of Object.entries(row)) {
      if (v && typeof v === 'object' && '$bytes' in v) row[k] = Buffer.from(String((v as { $bytes: string }).$bytes), 'base64');
    }
  }
  return parsed;
}

/**
 * Opens the database at `where` (a SQLite file or a postgres:// URL; default: the suite's shared
 * server's). Read-only unless `write` is set (on SQLite; PostgreSQL trusts the test).
 */
export function openTestDb(opts: { where?: string; write?: boolean } = {}): TestDb {
  const where = opts.where ?? inject('dbPath');
  if (!isPostgres(where)) return new Database(where, { readonly: !opts.write, fileMustExist: true }) as unknown as TestDb;
  return {
    prepare: (sql) => ({
      get: (...params) => pgStatement(where, sql, params, 'all').rows[0],
      all: (...params) => pgStatement(where, sql, params, 'all').rows,
      run: (...params) => ({ changes: pgStatement(where, sql, params, 'run').changes }),
    }),
    exec: (sql) => {
      pgStatement(where, sql, [], 'run');
    },
    close: () => {},
  };
}
