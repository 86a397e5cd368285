import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, openTestDb, signUp, uniqueEmail } from '../helpers/api';
import { makeRig } from '../helpers/crew';
import { cleanup, DIST, ROOT, startServer, type RunningServer } from '../helpers/server';

// Security properties of the built server, one test each. Single-use and expiring invitation and
// reset links are tested with their flows (crews.test.ts: "already used", expired, revoked;
// mail.test.ts: a reset token works once, an expired one is refused); the preview limit in
// preview.test.ts and again here beside the auth limits.

const FOREIGN = 'https://camp-deals.example';

function cookieParts(setCookie: string[], name: RegExp) {
  const c = setCookie.find((s) => name.test(s.split('=')[0]!));
  if (!c) throw new Error(`no cookie matching ${name} in ${JSON.stringify(setCookie)}`);
  const attrs = c.split(';').slice(1).map((a) => a.trim().toLowerCase());
  return { name: c.split('=')[0]!, attrs };
}

describe('cross-site requests (origin check)', () => {
  it('refuses a cross-site form POST to /sign-out and keeps the session', async () => {
    const s = await signUp();
    const res = await fetch(`${baseUrl()}/sign-out`, {
      method: 'POST',
      headers: { origin: FOREIGN, cookie: s.cookie, 'content-type': 'application/x-www-form-urlencoded' },
      body: '',
      redirect: 'manual',
    });
    expect(res.status).toBe(403);
    expect(res.headers.getSetCookie()).toEqual([]);
    const session = await api('/api/auth/get-session', { session: s });
    expect(((await session.json()) as { user: { id: string } }).user.id).toBe(s.userId);
    // The same form from our own origin signs out.
    const own = await fetch(`${baseUrl()}/sign-out`, {
      method: 'POST',
      headers: { origin: baseUrl(), cookie: s.cookie, 'content-type': 'application/x-www-form-urlencoded' },
      body: '',
      redirect: 'manual',
    });
    expect(own.status).toBe(303);
  });

  it('refuses an API write with a foreign Origin (JSON and form types) and writes nothing', async () => {
    const s = await signUp();
    const rig = await makeRig(s);
    const before = await (await api(`/api/rigs/${rig.id}/loads`, { session: s })).json();
    for (const type of ['application/json', 'text/plain', 'application/x-www-form-urlencoded']) {
      const res = await fetch(`${baseUrl()}/api/rigs/${rig.id}/loads`, {
        method: 'POST',
        headers: { origin: FOREIGN, cookie: s.cookie, 'content-type': type },
        body: JSON.stringify({ name: 'Forged load', watts: 1000, dutyPct: 100 }),
      });
      expect(res.status, type).toBe(403);
    }
    const del = await fetch(`${baseUrl()}/api/rigs/${rig.id}?version=${rig.version}`, { method: 'DELETE', headers: { origin: FOREIGN, cookie: s.cookie } });
    expect(del.status).toBe(403);
    expect(await (await api(`/api/rigs/${rig.id}/loads`, { session: s })).json()).toEqual(before);
    expect((await api(`/api/rigs/${rig.id}`, { session: s })).status).toBe(200);
  });

  it('better-auth refuses sign-in and sign-out from a foreign Origin', async () => {
    const email = uniqueEmail('origin');
    await signUp({ email, password: 'origin-password-1' });
    const res = await fetch(`${baseUrl()}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { origin: FOREIGN, 'content-type': 'application/json' },
      body: JSON.stringify({ email, password: 'origin-password-1' }),
    });
    expect(res.status).toBe(403);
    expect(res.headers.getSetCookie()).toEqual([]);
  });

  it('answers no CORS grant to another site', async () => {
    const res = await fetch(`${baseUrl()}/api/rigs`, { method: 'OPTIONS', headers: { origin: FOREIGN, 'access-control-request-method': 'POST' } });
    expect(res.headers.get('access-control-allow-origin')).toBeNull();
    const get = await fetch(`${baseUrl()}/api/health`, { headers: { origin: FOREIGN } });
    expect(get.headers.get('access-control-allow-origin')).toBeNull();
  });
});

describe('session cookies', () => {
  it('are HttpOnly and SameSite=Lax, and not Secure outside production', async () => {
    const res = await fetch(`${baseUrl()}/api/auth/sign-up/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: baseUrl() },
      body: JSON.stringify({ name: 'Cookie Camper', email: uniqueEmail('cookie'), password: 'cookie-password-1', kind: 'camper' }),
    });
    expect(res.status).toBe(200);
    const { name, attrs } = cookieParts(res.headers.getSetCookie(), /session_token$/);
    expect(name).not.toMatch(/^__Secure-/);
    expect(attrs).toContain('httponly');
    expect(attrs).toContain('samesite=lax');
    expect(attrs).not.toContain('secure');
  });

  describe('in production', () => {
    let server: RunningServer;
    const authOrigin = 'http://127.0.0.1:4399';
    beforeAll(async () => {
      server = await startServer({ SUNRECKON_ENV: 'production', BETTER_AUTH_URL: authOrigin });
    });
    afterAll(async () => {
      await server?.stop();
      if (server) cleanup(server.dir);
    });

    it('are Secure, HttpOnly and SameSite=Lax, named with __Secure-', async () => {
      const res = await fetch(`${server.url}/api/auth/sign-up/email`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: authOrigin },
        body: JSON.stringify({ name: 'Prod Camper', email: uniqueEmail('prod'), password: 'prod-password-1', kind: 'camper' }),
      });
      expect(res.status, await res.clone().text()).toBe(200);
      const { name, attrs } = cookieParts(res.headers.getSetCookie(), /session_token$/);
      expect(name).toMatch(/^__Secure-/);
      expect(attrs).toContain('secure');
      expect(attrs).toContain('httponly');
      expect(attrs).toContain('samesite=lax');
    });

    it('refuses sign-in from an origin other than BETTER_AUTH_URL, even loopback', async () => {
      const res = await fetch(`${server.url}/api/auth/sign-in/email`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: server.url },
        body: JSON.stringify({ email: 'nobody@example.test', password: 'whatever-password' }),
      });
      expect(res.status).toBe(403);
    });
  });
});

describe('security headers', () => {
  it.each(['/', '/sign-in', '/api/health', '/api/rigs', '/no-such-page'])('%s carries CSP, nosniff, Referrer-Policy and frame-ancestors', async (p) => {
    const res = await fetch(`${baseUrl()}${p}`, { redirect: 'manual' });
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
    expect(res.headers.get('x-frame-options')).toBe('DENY');
    const directives = Object.fromEntries(csp.split(';').map((d) => d.trim().split(/\s+/)).map(([k = '', ...v]) => [k, v] as const));
    expect(directives['frame-ancestors']).toEqual(["'none'"]);
    expect(directives['default-src']).toEqual(["'self'"]);
    expect(directives['base-uri']).toEqual(["'self'"]);
    expect(directives['form-action']).toEqual(["'self'"]);
    expect(directives['object-src']).toEqual(["'none'"]);
    // Our own files and hashed inline scripts only: no inline script by default, no eval, no other hosts.
    expect(directives['script-src']![0]).toBe("'self'");
    expect(directives['script-src']!.slice(1).every((v) => /^'sha256-[A-Za-z0-9+/]+=*'$/.test(v))).toBe(true);
  });

  it('allows exactly the inline scripts each page carries, by hash', async () => {
    const s = await signUp();
    const rig = await makeRig(s);
    for (const [p, session] of [['/', undefined], ['/sign-in', undefined], [`/rigs/${rig.id}`, s], ['/trips', s]] as const) {
      const res = await api(p, { session });
      expect(res.status, p).toBe(200);
      const html = await res.text();
      const allowed = new Set((res.headers.get('content-security-policy') ?? '').split(';').find((d) => d.trim().startsWith('script-src'))!.trim().split(/\s+/).slice(1));
      const inline = [...html.matchAll(/<script\b(?![^>]*\bsrc\s*=)[^>]*>([\s\S]*?)<\/script>/gi)].map((m) => `'sha256-${createHash('sha256').update(m[1]!).digest('base64')}'`);
      expect(inline.length, `${p} has islands or scripts to check`).toBeGreaterThan(0);
      for (const h of inline) expect(allowed.has(h), `${p}: ${h}`).toBe(true);
      expect(allowed.size).toBe(new Set(inline).size + 1);
    }
  });
});

describe('passwords', () => {
  it('need at least 8 characters and at most 128', async () => {
    const up = (password: string) =>
      fetch(`${baseUrl()}/api/auth/sign-up/email`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: baseUrl() },
        body: JSON.stringify({ name: 'Short', email: uniqueEmail('pw'), password, kind: 'camper' }),
      });
    expect((await up('1234567')).status).toBe(400);
    expect((await up('x'.repeat(129))).status).toBe(400);
    expect((await up('12345678')).status).toBe(200);
  });

  it('are stored as a salted scrypt hash, never as typed', async () => {
    const a = await signUp({ password: 'same-password-1' });
    const b = await signUp({ password: 'same-password-1' });
    const db = openTestDb();
    try {
      const hash = (id: string) => (db.prepare("select password from account where userId = ? and providerId = 'credential'").get(id) as { password: string }).password;
      const [ha, hb] = [hash(a.userId), hash(b.userId)];
      expect(ha).not.toContain('same-password-1');
      expect(ha).toMatch(/^[0-9a-f]{32}:[0-9a-f]{128}$/);
      expect(ha).not.toBe(hb);
    } finally {
      db.close();
    }
  });
});

/**
 * A server of the describe block's own with the given limits (started before its tests, removed after);
 * returns a JSON POST to it with the Origin a browser would send.
 */
function serverWithLimits(env: Record<string, string>) {
  let server: RunningServer;
  beforeAll(async () => {
    server = await startServer(env);
  });
  afterAll(async () => {
    await server?.stop();
    if (server) cleanup(server.dir);
  });
  return (p: string, body: unknown, headers: Record<string, string> = {}) =>
    fetch(`${server.url}${p}`, { method: 'POST', headers: { 'content-type': 'application/json', origin: server.url, ...headers }, body: JSON.stringify(body) });
}

describe('rate limits (AUTH_RATE_LIMIT=3, PREVIEW_RATE_LIMIT=3)', () => {
  const post = serverWithLimits({ AUTH_RATE_LIMIT: '3', PREVIEW_RATE_LIMIT: '3' });

  it('sign-in: the 4th attempt in a minute is 429, and a client-sent address buys no fresh allowance', async () => {
    const signIn = (i: number, headers: Record<string, string> = {}) =>
      post('/api/auth/sign-in/email', { email: 'nobody@example.test', password: `guess-${i}-password` }, headers).then((r) => r.status);
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push(await signIn(i));
    expect(statuses).toEqual([401, 401, 401, 429]);
    expect(await signIn(9, { 'x-sunreckon-client-ip': '203.0.113.9' })).toBe(429);
    // Each request claims another address: together they still get no more than one allowance.
    const spoofed: number[] = [];
    for (let i = 0; i < 4; i++) spoofed.push(await signIn(i, { 'x-forwarded-for': `203.0.113.${i + 10}` }));
    expect(spoofed.filter((s) => s !== 429).length).toBeLessThanOrEqual(3);
    expect(spoofed[3]).toBe(429);
  });

  it('preview: a made-up X-Forwarded-For does not reset the limit', async () => {
    const plan = { bank: { chemistry: 'lifepo4', capacityAh: 200 }, stops: [] };
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await post('/api/forecasts/preview', plan, { 'x-forwarded-for': `198.51.100.${i}` })).status);
    expect(statuses.slice(0, 3).every((s) => s !== 429)).toBe(true);
    expect(statuses[3]).toBe(429);
  });

  it('sign-up: the 4th in a minute is 429', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await post('/api/auth/sign-up/email', { name: 'Limit', email: uniqueEmail('limit'), password: 'limit-password-1', kind: 'camper' })).status);
    expect(statuses).toEqual([200, 200, 200, 429]);
  });

  it('password reset requests: the 2nd in a minute is 429', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 2; i++) statuses.push((await post('/api/auth/request-password-reset', { email: 'nobody@example.test', redirectTo: '/reset-password' })).status);
    expect(statuses).toEqual([200, 429]);
  });

  it('preview forecasts: the 4th in a minute is 429 with Retry-After', async () => {
    const plan = { bank: { chemistry: 'lifepo4', capacityAh: 200 }, stops: [] };
    const statuses: number[] = [];
    let last: Response | undefined;
    for (let i = 0; i < 4; i++) {
      last = await post('/api/forecasts/preview', plan);
      statuses.push(last.status);
    }
    expect(statuses.slice(0, 3).every((s) => s !== 429)).toBe(true);
    expect(statuses[3]).toBe(429);
    expect(Number(last!.headers.get('retry-after'))).toBeGreaterThan(0);
  });
});

describe('the client bundle', () => {
  const clientDir = path.join(ROOT, DIST, 'client');
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const n of readdirSync(dir)) {
      const f = path.join(dir, n);
      if (statSync(f).isDirectory()) walk(f);
      else if (/\.(m?js|html|css|map)$/.test(n)) files.push(f);
    }
  };
  walk(clientDir);

  it('has scripts to check', () => {
    expect(files.filter((f) => f.endsWith('.js')).length).toBeGreaterThan(3);
  });

  it.each(['BETTER_AUTH_SECRET', 'better-sqlite3', 'DATABASE_PATH', 'SMTP_URL', 'sunreckon-development-secret', 'test-secret-test-secret'])('never contains %s', (needle) => {
    const hits = files.filter((f) => readFileSync(f, 'utf8').includes(needle)).map((f) => path.relative(clientDir, f));
    expect(hits).toEqual([]);
  });

  it('never contains the secret the server runs with', () => {
    const secret = process.env.BETTER_AUTH_SECRET ?? 'test-secret-test-secret-test-secret-0001';
    expect(files.some((f) => readFileSync(f, 'utf8').includes(secret))).toBe(false);
  });
});

describe('the database file', () => {
  it('is not served over HTTP', async () => {
    for (const p of ['/db/data/sunreckon.sqlite', '/test.sqlite', '/../db/client.ts', '/.env']) {
      const res = await fetch(`${baseUrl()}${p}`, { redirect: 'manual' });
      expect(res.status, p).not.toBe(200);
    }
  });

  it('refuses a session cookie forged without the secret', async () => {
    const s = await signUp();
    const db = openTestDb();
    const token = (db.prepare('select token from session where userId = ?').get(s.userId) as { token: string }).token;
    db.close();
    // The raw token without better-auth's signature is not a session.
    const res = await api('/api/rigs', { headers: { cookie: `better-auth.session_token=${token}` } });
    expect(res.status).toBe(401);
  });
});

describe('rate limit on password changes (AUTH_RATE_LIMIT=3, a server of its own so the sign-up allowance above stays whole)', () => {
  const post = serverWithLimits({ AUTH_RATE_LIMIT: '3' });

  it('password changes: the 4th try in a minute is 429 (no guessing the current password from a stolen session)', async () => {
    const res = await post('/api/auth/sign-up/email', { name: 'Changer', email: uniqueEmail('changer'), password: 'changer-password-1', kind: 'camper' });
    expect(res.status).toBe(200);
    const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await post('/api/auth/change-password', { currentPassword: `guess-${i}-password`, newPassword: 'changer-password-2' }, { cookie })).status);
    expect(statuses).toEqual([400, 400, 400, 429]);
  });
});
