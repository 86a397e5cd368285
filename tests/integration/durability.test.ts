import Database from 'better-sqlite3';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { openSqlite } from '../../db/client';
import { startMailCatcher, type MailCatcher } from '../../src/server/mail-catcher';
import { caughtFor, outboxFor, waitForMail, waitForSent } from '../helpers/mail';
import { cleanup, freePort, startServer, type RunningServer } from '../helpers/server';

// Data safety when the process dies: SQLite in WAL mode with a busy timeout, every acknowledged
// write still there after a SIGKILL, and multi-row writes (CSV imports) all-or-nothing.

const servers: RunningServer[] = [];
afterAll(async () => {
  for (const s of servers) {
    await s.stop('SIGKILL');
    cleanup(s.dir);
  }
});

async function signUpOn(url: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-up/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ name: 'Durable Camper', email: `durable.${Date.now()}.${Math.random().toString(36).slice(2)}@example.test`, password: 'durable-password-1', kind: 'camper' }),
  });
  expect(res.status).toBe(200);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

function post(url: string, cookie: string, path: string, body: string, type = 'application/json') {
  return fetch(`${url}${path}`, { method: 'POST', headers: { 'content-type': type, origin: url, cookie }, body });
}

describe('SQLite settings', () => {
  it('every connection opens in WAL mode with foreign keys, a busy timeout and synchronous NORMAL', () => {
    const db = openSqlite(':memory:');
    try {
      expect(db.pragma('busy_timeout', { simple: true })).toBe(5000);
      expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
      expect(db.pragma('synchronous', { simple: true })).toBe(1);
    } finally {
      db.close();
    }
  });

  it('the running server’s database file is in WAL mode', () => {
    const db = new Database(inject('dbPath'), { readonly: true, fileMustExist: true });
    try {
      expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    } finally {
      db.close();
    }
  });

  it('a write waits for another process’s lock instead of failing', async () => {
    const server = await startServer();
    servers.push(server);
    const cookie = await signUpOn(server.url);
    const holder = new Database(server.dbPath);
    holder.pragma('busy_timeout = 5000');
    holder.exec('BEGIN IMMEDIATE');
    const started = Date.now();
    const pending = post(server.url, cookie, '/api/rigs', JSON.stringify({ name: 'Waiting van', bank: { chemistry: 'agm', capacityAh: 100 } }));
    await new Promise((r) => setTimeout(r, 700));
    holder.exec('COMMIT');
    holder.close();
    const res = await pending;
    expect(res.status, await res.clone().text()).toBe(201);
    expect(Date.now() - started).toBeGreaterThanOrEqual(600);
  });
});

describe('SIGKILL in the middle of a stream of writes', () => {
  it('restarts with integrity_check ok, every acknowledged write present, and imports all-or-nothing', async () => {
    const first = await startServer();
    servers.push(first);
    const cookie = await signUpOn(first.url);
    const rigs: string[] = [];
    for (let i = 0; i < 6; i++) {
      const r = await post(first.url, cookie, '/api/rigs', JSON.stringify({ name: `Stream rig ${i}`, bank: { chemistry: 'lifepo4', capacityAh: 200 } }));
      expect(r.status).toBe(201);
      rigs.push(((await r.json()) as { id: string }).id);
    }

    const ackedLoads = new Set<string>();
    const ackedImports = new Set<string>();
    const sentImports = new Set<string>();
    let acked = 0;
    let stopped = false;
    let n = 0;
    const IMPORT_ROWS = 10;

    const writer = async () => {
      while (!stopped) {
        const k = n++;
        const rig = rigs[k % rigs.length]!;
        try {
          if (k % 3 === 2) {
            const tag = `imp${k}`;
            sentImports.add(tag);
            const csv = 'name,watts,dutyPct\n' + Array.from({ length: IMPORT_ROWS }, (_, i) => `${tag}-${i},${5 + i},50`).join('\n') + '\n';
            const res = await post(first.url, cookie, `/api/rigs/${rig}/loads/import`, csv, 'text/csv');
            if (res.status === 201) {
              ackedImports.add(tag);
              acked++;
            } else expect(res.status, await res.text()).toBe(201);
          } else {
            const res = await post(first.url, cookie, `/api/rigs/${rig}/loads`, JSON.stringify({ name: `single${k}`, watts: 10 + (k % 50), dutyPct: 30 }));
            if (res.status === 201) {
              ackedLoads.add(((await res.json()) as { id: string }).id);
              acked++;
            } else expect(res.status, await res.text()).toBe(201);
          }
        } catch (err) {
          // The connection dropped under the kill: this write was never acknowledged.
          if (!stopped) throw err;
        }
      }
    };
    const writers = Array.from({ length: 6 }, writer);
    while (acked < 60) await new Promise((r) => setTimeout(r, 5));
    stopped = true;
    first.child.kill('SIGKILL');
    await Promise.allSettled(writers);
    await first.stop();
    expect(first.child.signalCode).toBe('SIGKILL');

    // Opening the file after the crash replays the WAL; the file is whole.
    const check = new Database(first.dbPath);
    try {
      expect(check.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(check.pragma('foreign_key_check')).toEqual([]);
      const ids = new Set((check.prepare(`select id from loads where rig_id in (${rigs.map(() => '?').join(',')})`).all(...rigs) as { id: string }[]).map((r) => r.id));
      const missing = [...ackedLoads].filter((id) => !ids.has(id));
      expect(missing).toEqual([]);
      for (const tag of sentImports) {
        const rows = (check.prepare('select count(*) as n from loads where name like ?').get(`${tag}-%`) as { n: number }).n;
        expect([0, IMPORT_ROWS], tag).toContain(rows);
        if (ackedImports.has(tag)) expect(rows, tag).toBe(IMPORT_ROWS);
      }
    } finally {
      check.close();
    }

    // The server starts again on the same file and serves what was acknowledged.
    const second = await startServer({}, { dir: first.dir, dbPath: first.dbPath });
    servers.push(second);
    let seen = 0;
    for (const rig of rigs) {
      const res = await fetch(`${second.url}/api/rigs/${rig}/loads`, { headers: { cookie } });
      expect(res.status).toBe(200);
      const loads = (await res.json()) as { id: string }[];
      seen += loads.filter((l) => ackedLoads.has(l.id)).length;
    }
    expect(seen).toBe(ackedLoads.size);
    expect(ackedLoads.size + ackedImports.size).toBeGreaterThanOrEqual(60);
  }, 90_000);
});

describe('the mail outbox across a SIGKILL', () => {
  let catcher: MailCatcher | null = null;
  afterAll(async () => {
    await catcher?.stop();
  });

  it('a message queued while mail was down is still queued after the kill and is sent once by the next server', async () => {
    const port = await freePort();
    const env = { SMTP_URL: `smtp://127.0.0.1:${port}`, OUTBOX_RETRY_BASE_MS: '200' };
    const first = await startServer(env);
    servers.push(first);
    const email = `outbox.kill.${Date.now()}@example.test`;
    const headers = { 'content-type': 'application/json', origin: first.url };
    const up = await fetch(`${first.url}/api/auth/sign-up/email`, { method: 'POST', headers, body: JSON.stringify({ name: 'Outbox Camper', email, password: 'outbox-kill-pass-1', kind: 'camper' }) });
    expect(up.status).toBe(200);
    expect((await fetch(`${first.url}/api/auth/request-password-reset`, { method: 'POST', headers, body: JSON.stringify({ email, redirectTo: '/reset-password' }) })).status).toBe(200);
    const deadline = Date.now() + 10_000;
    while (!outboxFor(email, first.dbPath).some((r) => r.attempts >= 1)) {
      if (Date.now() > deadline) throw new Error('no failed send recorded');
      await new Promise((r) => setTimeout(r, 50));
    }

    first.child.kill('SIGKILL');
    await first.stop();
    expect(first.child.signalCode).toBe('SIGKILL');
    const queued = outboxFor(email, first.dbPath);
    expect(queued).toHaveLength(1);
    expect(queued[0]!.status).toBe('queued');

    catcher = await startMailCatcher({ dbPath: first.dbPath, port, quiet: true });
    const second = await startServer(env, { dir: first.dir, dbPath: first.dbPath });
    servers.push(second);
    await waitForMail(email, { dbPath: second.dbPath, timeoutMs: 15_000 });
    await waitForSent(email, { dbPath: second.dbPath });
    await new Promise((r) => setTimeout(r, 1_000));
    expect(caughtFor(email, second.dbPath)).toHaveLength(1);
  }, 60_000);
});
