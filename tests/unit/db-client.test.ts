import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { createDb } from '../../db/client';

// Regression: an invitation write answered 500 when the mail catcher (another process) committed
// to the same file between the transaction's first read and its first write (SQLITE_BUSY at once).
describe('database transactions', () => {
  let dir = '';
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('hold the write lock from BEGIN, so another writer waits instead of breaking a read-then-write transaction', async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-db-'));
    const file = path.join(dir, 't.sqlite');
    const { db } = createDb(file);
    await sql`create table notes (id integer primary key, body text not null)`.execute(db);
    const other = new Database(file);
    other.pragma('busy_timeout = 0');

    let otherWriter: unknown = null;
    await db.transaction().execute(async (trx) => {
      const before = await sql<{ n: number }>`select count(*) as n from notes`.execute(trx);
      expect(before.rows[0]?.n).toBe(0);
      try {
        other.prepare("insert into notes (body) values ('from another process')").run();
      } catch (err) {
        otherWriter = err;
      }
      await sql`insert into notes (body) values ('from the app')`.execute(trx);
    });

    expect((otherWriter as { code?: string } | null)?.code).toBe('SQLITE_BUSY');
    other.prepare("insert into notes (body) values ('after the app committed')").run();
    const bodies = other.prepare('select body from notes order by id').all() as { body: string }[];
    expect(bodies.map((b) => b.body)).toEqual(['from the app', 'after the app committed']);
    other.close();
    await db.destroy();
  });
});
