import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher, type MailCatcher } from '../../src/server/mail-catcher';
import { uniqueEmail } from '../helpers/api';
import { caughtFor, outboxFor } from '../helpers/mail';
import { cleanup, freePort, startServer, type RunningServer } from '../helpers/server';
import { openTestDb } from '../helpers/test-db';

// Two app instances over one database, as behind a load balancer: on PostgreSQL (the run of
// `npm run test:integration:pg`) the deployment this is for; on SQLite two processes on one file.
// Writes go through both; nothing acknowledged may be lost, a stale edit must get 409 whichever
// instance it reaches, and each queued e-mail is sent once although both instances send mail.

let a: RunningServer;
let b: RunningServer;
let catcher: MailCatcher;
let dbPath: string;

interface Who {
  cookie: string;
  userId: string;
}

async function call(server: RunningServer, path: string, init: { method?: string; who?: Who; json?: unknown } = {}): Promise<Response> {
  const headers: Record<string, string> = { origin: server.url };
  if (init.who) headers.cookie = init.who.cookie;
  if (init.json !== undefined) headers['content-type'] = 'application/json';
  return fetch(`${server.url}${path}`, { method: init.method ?? 'GET', headers, body: init.json === undefined ? undefined : JSON.stringify(init.json), redirect: 'manual' });
}

async function signUp(server: RunningServer, name: string): Promise<Who> {
  const res = await call(server, '/api/auth/sign-up/email', { method: 'POST', json: { name, email: uniqueEmail('two'), password: 'two-instances-1', kind: 'camper' } });
  expect(res.status, await res.clone().text()).toBe(200);
  const body = (await res.json()) as { user: { id: string } };
  return { cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), userId: body.user.id };
}

function personalCrew(userId: string): string {
  const db = openTestDb({ where: dbPath });
  return (db.prepare("select crew_id from crew_members where user_id = ? and role = 'owner'").get(userId) as { crew_id: string }).crew_id;
}

beforeAll(async () => {
  const port = await freePort();
  // One database for both; a catcher storing into it.
  const first = await startServer({ SMTP_URL: `smtp://127.0.0.1:${port}`, OUTBOX_RETRY_BASE_MS: '200', PREVIEW_RATE_LIMIT: '6' });
  a = first;
  dbPath = first.dbPath;
  catcher = await startMailCatcher({ dbPath, port, quiet: true });
  b = await startServer({ SMTP_URL: `smtp://127.0.0.1:${port}`, OUTBOX_RETRY_BASE_MS: '200', PREVIEW_RATE_LIMIT: '6' }, { dir: first.dir, dbPath });
}, 180_000);

afterAll(async () => {
  await b?.stop();
  await a?.stop();
  await catcher?.stop();
  if (a) cleanup(a.dir);
});

describe('two instances over one database', () => {
  it('five editors writing through both instances lose no acknowledged write, and a stale edit gets 409 on either', async () => {
    const owner = await signUp(a, 'Owner Two');
    const crewId = personalCrew(owner.userId);
    const rig = await (await call(a, '/api/rigs', { method: 'POST', who: owner, json: { name: 'Shared van', bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 200 } } })).json();

    // Five editors join through an invitation each (sent by one instance, accepted on the other).
    const editors: Who[] = [];
    for (let i = 0; i < 5; i++) {
      const editor = await signUp(i % 2 ? b : a, `Editor ${i + 1}`);
      const db = openTestDb({ where: dbPath, write: true });
      db.prepare('insert into crew_members (crew_id, user_id, role, created_at, version) values (?, ?, ?, ?, 1)').run(crewId, editor.userId, 'editor', new Date().toISOString());
      editors.push(editor);
    }

    // Each editor adds 8 loads and then changes each once, alternating instances, all at once.
    const acknowledged = new Map<string, number>();
    await Promise.all(
      editors.map(async (who, e) => {
        for (let n = 0; n < 8; n++) {
          const server = (e + n) % 2 ? b : a;
          const made = await call(server, `/api/rigs/${rig.id}/loads`, { method: 'POST', who, json: { name: `E${e}-L${n}`, watts: 10 + n, hoursPerDay: 1 } });
          expect(made.status, await made.clone().text()).toBe(201);
          const load = (await made.json()) as { id: string; version: number };
          const other = server === a ? b : a;
          const changed = await call(other, `/api/loads/${load.id}`, { method: 'PATCH', who, json: { version: load.version, watts: 100 + e * 10 + n } });
          expect(changed.status, await changed.clone().text()).toBe(200);
          acknowledged.set(load.id, 100 + e * 10 + n);
        }
      }),
    );

    const listOn = async (s: RunningServer) => (await (await call(s, `/api/rigs/${rig.id}/loads`, { who: owner })).json()) as { id: string; watts: number; version: number }[];
    const loads = await listOn(b);
    expect(loads).toHaveLength(40);
    for (const [id, watts] of acknowledged) expect(loads.find((l) => l.id === id)?.watts, id).toBe(watts);

    // Two editors change one load from the same version, one through each instance: one wins, one hears 409.
    const target = loads[0]!;
    const current = target;
    const [x, y] = await Promise.all([
      call(a, `/api/loads/${target.id}`, { method: 'PATCH', who: editors[0], json: { version: current.version, watts: 1 } }),
      call(b, `/api/loads/${target.id}`, { method: 'PATCH', who: editors[1], json: { version: current.version, watts: 2 } }),
    ]);
    expect([x.status, y.status].sort()).toEqual([200, 409]);
    const after = (await listOn(a)).find((l) => l.id === target.id)!;
    expect(after.version).toBe(current.version + 1);
    expect(after.watts).toBe(x.status === 200 ? 1 : 2);
  });

  it('each queued e-mail is sent once, though both instances send the outbox', async () => {
    const owner = await signUp(b, 'Inviting Owner');
    const crewId = personalCrew(owner.userId);
    const addresses: string[] = [];
    for (let i = 0; i < 12; i++) {
      const email = uniqueEmail('once');
      const res = await call(i % 2 ? a : b, `/api/crews/${crewId}/invitations`, { method: 'POST', who: owner, json: { email, role: 'viewer' } });
      expect(res.status, await res.clone().text()).toBe(201);
      addresses.push(email);
    }
    const deadline = Date.now() + 20_000;
    while (!addresses.every((to) => outboxFor(to, dbPath).every((r) => r.status === 'sent'))) {
      if (Date.now() > deadline) throw new Error('outbox not drained');
      await new Promise((r) => setTimeout(r, 100));
    }
    // Give a double send time to show up.
    await new Promise((r) => setTimeout(r, 1500));
    for (const to of addresses) expect(caughtFor(to, dbPath), to).toHaveLength(1);
  });
});
