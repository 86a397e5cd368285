import Database from 'better-sqlite3';
import { execFile } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { cleanup, ROOT, startServer, type RunningServer } from '../helpers/server';

// `npm run db:backup` copies a live database with SQLite's online backup API while the server keeps
// writing; the copy restores as the README says (server stopped, file copied over DATABASE_PATH,
// no -wal/-shm beside it) and a server started on it serves the data.

const run = promisify(execFile);
const servers: RunningServer[] = [];
const dirs: string[] = [];
afterAll(async () => {
  for (const s of servers) {
    await s.stop();
    cleanup(s.dir);
  }
  for (const d of dirs) cleanup(d);
});

describe('npm run db:backup', () => {
  it('backs up a live database under writes; the restored copy serves the data', async () => {
    const live = await startServer();
    servers.push(live);
    const headers = { 'content-type': 'application/json', origin: live.url };
    const email = `backup.${Date.now()}@example.test`;
    const up = await fetch(`${live.url}/api/auth/sign-up/email`, {
      method: 'POST',
      headers,
      body: JSON.stringify({ name: 'Backup Camper', email, password: 'backup-password-1', kind: 'camper' }),
    });
    expect(up.status).toBe(200);
    const cookie = up.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const rigRes = await fetch(`${live.url}/api/rigs`, { method: 'POST', headers: { ...headers, cookie }, body: JSON.stringify({ name: 'Backed-up van', bank: { chemistry: 'lifepo4', capacityAh: 280 } }) });
    expect(rigRes.status).toBe(201);
    const rig = (await rigRes.json()) as { id: string };
    const addLoad = (name: string) => fetch(`${live.url}/api/rigs/${rig.id}/loads`, { method: 'POST', headers: { ...headers, cookie }, body: JSON.stringify({ name, watts: 40, dutyPct: 35 }) });
    for (const name of ['Fridge', 'Fan', 'Water pump']) expect((await addLoad(name)).status).toBe(201);

    // Writes keep coming while the backup runs.
    let writing = true;
    let during = 0;
    const writer = (async () => {
      while (writing) if ((await addLoad(`During ${during}`)).status === 201) during++;
    })();
    const out = mkdtempSync(path.join(tmpdir(), 'sunreckon-backup-'));
    dirs.push(out);
    const { stdout } = await run('npx', ['tsx', 'scripts/backup.ts', '--out', out], { cwd: ROOT, env: { ...process.env, DATABASE_PATH: live.dbPath } });
    writing = false;
    await writer;
    const files = readdirSync(out);
    expect(files).toHaveLength(1);
    expect(files[0]).toMatch(/^sunreckon-\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}Z\.sqlite$/);
    expect(stdout).toContain('integrity_check ok');
    const backup = path.join(out, files[0]!);

    const check = new Database(backup, { readonly: true });
    try {
      expect(check.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(check.pragma('journal_mode', { simple: true })).toBe('delete');
      const names = (check.prepare('select name from loads where rig_id = ?').all(rig.id) as { name: string }[]).map((r) => r.name);
      expect(names).toEqual(expect.arrayContaining(['Fridge', 'Fan', 'Water pump']));
    } finally {
      check.close();
    }

    // Restore: a new place, the file copied in, nothing beside it; a server on it reads the rig.
    const restoreDir = mkdtempSync(path.join(tmpdir(), 'sunreckon-restore-'));
    const restored = path.join(restoreDir, 'restored.sqlite');
    copyFileSync(backup, restored);
    expect(existsSync(`${restored}-wal`)).toBe(false);
    const again = await startServer({}, { dir: restoreDir, dbPath: restored });
    servers.push(again);
    const loads = await fetch(`${again.url}/api/rigs/${rig.id}/loads`, { headers: { cookie } });
    expect(loads.status).toBe(200);
    const restoredNames = ((await loads.json()) as { name: string }[]).map((l) => l.name);
    expect(restoredNames).toEqual(expect.arrayContaining(['Fridge', 'Fan', 'Water pump']));
    const signIn = await fetch(`${again.url}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: again.url },
      body: JSON.stringify({ email, password: 'backup-password-1' }),
    });
    expect(signIn.status).toBe(200);
  }, 90_000);

  it('fails with a message when there is no database', async () => {
    const out = mkdtempSync(path.join(tmpdir(), 'sunreckon-backup-'));
    dirs.push(out);
    const err = await run('npx', ['tsx', 'scripts/backup.ts', '--out', out], { cwd: ROOT, env: { ...process.env, DATABASE_PATH: path.join(out, 'missing.sqlite') } }).then(
      () => null,
      (e: { code: number; stderr: string }) => e,
    );
    expect(err?.code).toBe(1);
    expect(err?.stderr).toContain('No database at');
    expect(readdirSync(out)).toEqual([]);
  });
});
