import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cleanup, startServer, type RunningServer } from '../helpers/server';
import { openTestDb } from '../helpers/test-db';

/**
 * Each worker process keeps a session lookup for a few seconds (src/server/session-cache.ts).
 * Two workers here, and every request on a new connection so that both serve them: a sign-out
 * or a change to the account must show at once in both, and two people never see each other.
 */

let server: RunningServer;

beforeAll(async () => {
  server = await startServer({ WEB_CONCURRENCY: '2', SESSION_CACHE_MS: '30000' });
});

afterAll(async () => {
  if (!server) return;
  await server.stop();
  cleanup(server.dir);
});

type Raw = { status: number; location: string | undefined; body: string; cookies: string[] };

/** One request on a connection of its own (the cluster hands new connections to the workers in turn). */
function request(method: string, path: string, opts: { cookie?: string; json?: unknown; form?: string } = {}): Promise<Raw> {
  return new Promise((resolve, reject) => {
    const u = new URL(path, server.url);
    const body = opts.json !== undefined ? JSON.stringify(opts.json) : opts.form;
    const headers: Record<string, string> = { origin: u.origin };
    if (opts.cookie) headers.cookie = opts.cookie;
    if (opts.json !== undefined) headers['content-type'] = 'application/json';
    if (opts.form !== undefined) headers['content-type'] = 'application/x-www-form-urlencoded';
    const req = http.request({ host: u.hostname, port: u.port, path: u.pathname + u.search, method, headers, agent: false }, (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (text += c));
      res.on('end', () =>
        resolve({ status: res.statusCode ?? 0, location: res.headers.location, body: text, cookies: (res.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]!) }),
      );
    });
    req.on('error', reject);
    req.end(body);
  });
}

let counter = 0;
async function signUp(name: string): Promise<string> {
  counter += 1;
  const res = await request('POST', '/api/auth/sign-up/email', {
    json: { name, email: `session.cache.${Date.now()}.${counter}@example.test`, password: 'session-cache-1', kind: 'camper' },
  });
  expect(res.status).toBe(200);
  return res.cookies.join('; ');
}

/** The trips page as this cookie sees it, `times` times on fresh connections. */
async function tripsPage(cookie: string, times = 6): Promise<Raw[]> {
  const out: Raw[] = [];
  for (let i = 0; i < times; i++) out.push(await request('GET', '/trips', { cookie }));
  return out;
}

describe('the session kept per worker', () => {
  it('signing out through the API ends the session in both workers at once', async () => {
    const cookie = await signUp('Kept Camper');
    expect((await tripsPage(cookie)).map((r) => r.status)).toEqual([200, 200, 200, 200, 200, 200]);
    const out = await request('POST', '/api/auth/sign-out', { cookie, json: {} });
    expect(out.status).toBe(200);
    const after = await tripsPage(cookie);
    expect(after.map((r) => r.status)).toEqual([302, 302, 302, 302, 302, 302]);
    expect(after[0]!.location).toMatch(/^\/sign-in\?next=/);
  });

  it('signing out with the header’s form (POST /sign-out) ends it too', async () => {
    const cookie = await signUp('Form Camper');
    expect((await tripsPage(cookie, 4)).every((r) => r.status === 200)).toBe(true);
    const out = await request('POST', '/sign-out', { cookie, form: '' });
    expect(out.status).toBe(303);
    expect((await tripsPage(cookie, 4)).map((r) => r.status)).toEqual([302, 302, 302, 302]);
  });

  it('a change to the account shows on the next page in both workers', async () => {
    const cookie = await signUp('Old Name Camper');
    for (const r of await tripsPage(cookie, 4)) expect(r.body).toContain('Old Name Camper');
    const changed = await request('POST', '/api/auth/update-user', { cookie, json: { name: 'New Name Camper' } });
    expect(changed.status).toBe(200);
    for (const r of await tripsPage(cookie, 4)) {
      expect(r.body).toContain('New Name Camper');
      expect(r.body).not.toContain('Old Name Camper');
    }
  });

  it('is kept: a session removed behind the app’s back still serves until a write with its cookie ends it', async () => {
    const cookie = await signUp('Behind Camper');
    expect((await tripsPage(cookie, 4)).every((r) => r.status === 200)).toBe(true);
    // Removed straight from the database (no route of the app sees it): both workers still hold it.
    const db = openTestDb({ where: server.dbPath, write: true });
    try {
      const user = db.prepare('select id from user where name = ?').get('Behind Camper') as { id: string };
      expect(db.prepare('delete from session where userId = ?').run(user.id).changes).toBeGreaterThan(0);
    } finally {
      db.close();
    }
    expect((await tripsPage(cookie, 4)).map((r) => r.status)).toEqual([200, 200, 200, 200]);
    // Any write carrying the cookie ends the kept session everywhere.
    await request('POST', '/api/auth/sign-out', { cookie, json: {} });
    expect((await tripsPage(cookie, 4)).map((r) => r.status)).toEqual([302, 302, 302, 302]);
  });

  it('two people asking in turn each see only their own account', async () => {
    const ana = await signUp('Ana Kept-First');
    const ben = await signUp('Ben Kept-Second');
    for (let i = 0; i < 4; i++) {
      const a = await request('GET', '/trips', { cookie: ana });
      const b = await request('GET', '/trips', { cookie: ben });
      expect(a.body).toContain('Ana Kept-First');
      expect(a.body).not.toContain('Ben Kept-Second');
      expect(b.body).toContain('Ben Kept-Second');
      expect(b.body).not.toContain('Ana Kept-First');
    }
  });
});
