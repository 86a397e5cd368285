import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

describe('our migrations and better-auth', () => {
  it('better-auth finds every table and column it needs', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-schema-'));
    process.env.DATABASE_PATH = path.join(dir, 'schema.sqlite');
    const { db } = await import('../../src/server/db');
    const { migrateToLatest } = await import('../../db/migrate');
    await migrateToLatest(db);
    const { auth } = await import('../../src/server/auth');
    const { getMigrations } = await import('better-auth/db/migration');
    const m = await getMigrations(auth.options);
    await db.destroy();
    rmSync(dir, { recursive: true, force: true });
    expect(m.toBeCreated.map((t) => t.table)).toEqual([]);
    expect(m.toBeAdded.map((t) => `${t.table}: ${Object.keys(t.fields).join(',')}`)).toEqual([]);
  });
});
