import { describe, expect, inject, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { freshTestDatabase } from '../helpers/server';
import { isPostgres } from '../helpers/test-db';

// On the database the suite runs on: a fresh SQLite file, or a fresh PostgreSQL database in the
// integration-pg run (where better-auth also keeps its rate-limit counters in the database).
describe('our migrations and better-auth', () => {
  it('better-auth finds every table and column it needs', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-schema-'));
    const where = await freshTestDatabase(dir);
    if (isPostgres(where)) process.env.DATABASE_URL = where;
    else process.env.DATABASE_PATH = where;
    const { database, db } = await import('../../src/server/db');
    expect(database.kind).toBe(isPostgres(inject('dbPath')) ? 'postgres' : 'sqlite');
    const { migrateToLatest } = await import('../../db/migrate');
    await migrateToLatest(db);
    const { auth } = await import('../../src/server/auth');
    const { getMigrations } = await import('better-auth/db/migration');
    const m = await getMigrations(auth.options);
    await database.close();
    rmSync(dir, { recursive: true, force: true });
    expect(m.toBeCreated.map((t) => t.table)).toEqual([]);
    expect(m.toBeAdded.map((t) => `${t.table}: ${Object.keys(t.fields).join(',')}`)).toEqual([]);
  });
});
