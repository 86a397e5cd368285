import { readdirSync } from 'node:fs';
import { request } from 'node:http';
import path from 'node:path';
import { openTestDb as openDb } from '../helpers/test-db';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, openTestDb, signUp, uniqueEmail } from '../helpers/api';
import { makeRig, makeTrip, RIG_INPUT, TRIP_INPUT } from '../helpers/crew';
import { TEST_PRICES } from '../helpers/prices';
import { cleanup, DIST, ROOT, startServer, type RunningServer } from '../helpers/server';

// Hardening II (issue 15): auth and abuse findings of the attack on a production-mode server,
// one regression test each. Every request here is small (≤ ~1 MB) and quick.

const json = (body: unknown, headers: Record<string, string> = {}) => ({
  method: 'POST',
  headers: { 'content-type': 'application/json', origin: baseUrl(), ...headers },
  body: typeof body === 'string' ? body : JSON.stringify(body),
});

describe('/api/auth/* reads the body with the bounded reader', () => {
  it('refuses a body over 64 KB with 413 in the error envelope (Content-Length sent)', async () => {
    const res = await fetch(
      `${baseUrl()}/api/auth/sign-in/email`,
      json({ email: 'a@example.test', password: 'x'.repeat(70 * 1024) }, { connection: 'close' }),
    );
    expect(res.status).toBe(413);
    expect(await res.json()).toMatchObject({ error: { code: 'payload_too_large', message: expect.stringContaining('64 KB') } });
  });

  it('refuses a streamed body without Content-Length once it passes 64 KB', async () => {
    // Chunked, 1 MB at most, on a connection of its own (the server closes it after refusing).
    const status = await new Promise<number>((resolve, reject) => {
      const url = new URL('/api/auth/sign-up/email', baseUrl());
      const req = request(
        url,
        {
          method: 'POST',
          agent: false,
          headers: { 'content-type': 'application/json', origin: baseUrl(), 'transfer-encoding': 'chunked' },
        },
        (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        },
      );
      // The server answers 413 and closes the connection while we may still be writing: our next
      // write can then fail (EPIPE, ECONNRESET) before the answer is read. That is the refusal too
      // (a server that read the whole body would answer it, not drop the connection).
      req.on('error', (err: NodeJS.ErrnoException) => (err.code === 'EPIPE' || err.code === 'ECONNRESET' ? resolve(-1) : reject(err)));
      const chunk = 'x'.repeat(16 * 1024);
      let sent = 0;
      const pump = () => {
        while (sent < 64) {
          sent += 1;
          if (!req.write(chunk)) return void req.once('drain', pump);
        }
        req.end();
      };
      pump();
    });
    if (status !== -1) expect(status).toBe(413);
    // And the server is still there.
    expect((await fetch(`${baseUrl()}/api/health`)).status).toBe(200);
  });

  it('still signs in with an ordinary body', async () => {
    const email = uniqueEmail('bounded');
    await signUp({ email, password: 'bounded-password-1' });
    const res = await fetch(`${baseUrl()}/api/auth/sign-in/email`, json({ email, password: 'bounded-password-1' }));
    expect(res.status).toBe(200);
  });
});

describe('redirect after sign-in (next)', () => {
  const evil = [
    '/%09/evil.example',
    '/%0A/evil.example',
    '/%0D/evil.example',
    '/%0D%0A/evil.example',
    '//evil.example',
    '/\\evil.example',
    '/%5Cevil.example',
    '/%09%09/evil.example',
    'https://evil.example/',
    '%2F%2Fevil.example',
    '/%00/evil.example',
    // Dot segments: the parser turns "/.//evil.example" into the path "//evil.example" (found by the fuzz run).
    '/.%2F%2Fevil.example',
    '/./%2Fevil.example',
    '/a/..//evil.example',
    '/.%2F%5Cevil.example',
  ];

  it.each(evil)('next=%s stays on our origin and never answers 500', async (next) => {
    const s = await signUp();
    for (const page of ['/sign-in', '/sign-up']) {
      const res = await api(`${page}?next=${next}`, { session: s });
      expect(res.status, page).toBe(302);
      const location = res.headers.get('location')!;
      expect(new URL(location, baseUrl()).origin, location).toBe(baseUrl());
      // What a browser does with the header: tabs and line breaks dropped, then resolved.
      expect(new URL(location.replace(/[\t\n\r]/g, ''), baseUrl()).host).toBe(new URL(baseUrl()).host);
    }
  });

  it('keeps a same-site path with its query', async () => {
    const s = await signUp();
    const res = await api(`/sign-in?next=${encodeURIComponent('/rigs?tab=loads#logs')}`, { session: s });
    expect(res.headers.get('location')).toBe('/rigs?tab=loads#logs');
  });
});

describe('one name rule and a fixed kind on better-auth endpoints', () => {
  const signUpWith = (body: Record<string, unknown>) =>
    fetch(`${baseUrl()}/api/auth/sign-up/email`, json({ email: uniqueEmail('rule'), password: 'rule-password-1', ...body }));
  const userRow = (id: string) => {
    const db = openTestDb();
    try {
      return db.prepare('select name, kind from user where id = ?').get(id) as { name: string; kind: string };
    } finally {
      db.close();
    }
  };

  it.each([
    ['an empty name', { name: '', kind: 'camper' }, 'name'],
    ['a blank name', { name: '   ', kind: 'camper' }, 'name'],
    ['an 81-character name', { name: 'n'.repeat(81), kind: 'camper' }, 'name'],
    ['a name that is not text', { name: 42, kind: 'camper' }, 'name'],
    ['kind "superadmin"', { name: 'Ada', kind: 'superadmin' }, 'kind'],
    ['kind that is not text', { name: 'Ada', kind: ['installer'] }, 'kind'],
  ])('sign-up with %s is a 400 naming the field', async (_label, body, field) => {
    const res = await signUpWith(body);
    expect(res.status).toBe(400);
    const out = (await res.json()) as { error: { code: string }; issues: { path: string }[] };
    expect(out.error.code).toBe('invalid_request');
    expect(out.issues.map((i) => i.path)).toContain(field);
  });

  it('sign-up trims the name and keeps 80 characters', async () => {
    const res = await signUpWith({ name: `  ${'a'.repeat(80)}  `, kind: 'camper' });
    expect(res.status).toBe(200);
    const { user } = (await res.json()) as { user: { id: string } };
    expect(userRow(user.id).name).toBe('a'.repeat(80));
  });

  it('update-user follows the same rule and trims', async () => {
    const s = await signUp({ name: 'Before' });
    for (const name of ['', '  ', 'x'.repeat(81)]) {
      const res = await api('/api/auth/update-user', { method: 'POST', session: s, json: { name } });
      expect(res.status, JSON.stringify(name)).toBe(400);
      expect(await res.json()).toMatchObject({ error: { code: 'invalid_request' }, issues: [{ path: 'name' }] });
    }
    // A 5 MB name is refused before anything is read past 64 KB.
    const huge = await api('/api/auth/update-user', { method: 'POST', session: s, json: { name: 'x'.repeat(5 * 1024 * 1024) } });
    expect(huge.status).toBe(413);
    expect(userRow(s.userId).name).toBe('Before');
    const ok = await api('/api/auth/update-user', { method: 'POST', session: s, json: { name: '  After  ' } });
    expect(ok.status).toBe(200);
    expect(userRow(s.userId).name).toBe('After');
  });

  it('kind cannot be changed after sign-up', async () => {
    const s = await signUp({ kind: 'installer' });
    for (const kind of ['camper', 'installer', 'superadmin']) {
      const res = await api('/api/auth/update-user', { method: 'POST', session: s, json: { kind } });
      expect(res.status, kind).toBe(400);
      expect(await res.json()).toMatchObject({
        error: { code: 'invalid_request' },
        issues: [{ path: '(body)', message: expect.stringContaining('kind') }],
      });
    }
    expect(userRow(s.userId).kind).toBe('installer');
  });
});

describe('smaller findings', () => {
  it('static files and the service worker carry X-Content-Type-Options: nosniff', async () => {
    const asset = readdirSync(path.join(ROOT, DIST, 'client', '_astro')).find((f) => f.endsWith('.js'))!;
    for (const p of [`/_astro/${asset}`, '/sw.js', '/favicon.svg']) {
      const res = await fetch(`${baseUrl()}${p}`);
      expect(res.status, p).toBe(200);
      expect(res.headers.get('x-content-type-options'), p).toBe('nosniff');
    }
  });

  it('list-sessions and get-session never hand the raw session token to the browser', async () => {
    const s = await signUp();
    const db = openTestDb();
    const token = (db.prepare('select token from session where userId = ?').get(s.userId) as { token: string }).token;
    db.close();
    for (const p of ['/api/auth/list-sessions', '/api/auth/get-session']) {
      const res = await api(p, { session: s });
      expect(res.status, p).toBe(200);
      const text = await res.text();
      expect(text, p).not.toContain(token);
      expect(text, p).not.toMatch(/"token"/);
      expect(text, p).toContain(s.userId);
    }
  });

  it('a cross-site form post to a page is refused with 403, as Astro’s origin check did; from this site it reaches the page', async () => {
    const post = (origin: string | null, type: string | null) =>
      fetch(`${baseUrl()}/invite/not-a-real-token`, {
        method: 'POST',
        headers: { ...(origin ? { origin } : {}), ...(type ? { 'content-type': type } : {}) },
        body: type ? 'a=1' : undefined,
        redirect: 'manual',
      });
    for (const type of ['application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', 'text/plain', null]) {
      const res = await post('https://elsewhere.example', type);
      expect(res.status, String(type)).toBe(403);
      expect(await res.text()).toBe('Cross-site POST form submissions are forbidden');
    }
    // No Origin at all is not this site either (a form post from a browser always sends one).
    expect((await post(null, 'application/x-www-form-urlencoded')).status).toBe(403);
    // From this site the page itself answers (here: the invitation is unknown, not a 403).
    expect((await post(baseUrl(), 'application/x-www-form-urlencoded')).status).not.toBe(403);
  });

  it('a foreign or missing rig or trip is a 404 page', async () => {
    const owner = await signUp();
    const stranger = await signUp();
    const rig = await makeRig(owner);
    const trip = await makeTrip(owner, rig.id);
    for (const [p, status] of [
      [`/rigs/${rig.id}`, 200],
      [`/trips/${trip.id}`, 200],
    ] as const) {
      expect((await api(p, { session: owner })).status, p).toBe(status);
    }
    for (const p of [`/rigs/${rig.id}`, `/trips/${trip.id}`, '/rigs/no-such-rig', '/trips/no-such-trip']) {
      const res = await api(p, { session: stranger });
      expect(res.status, p).toBe(404);
      const html = await res.text();
      expect(html, p).toMatch(/No such (rig|trip)/);
      expect(html, p).not.toContain('Test van');
    }
  });
});

describe('mail, share, sweep and proxy limits (INVITE_CREW_HOURLY=3, INVITE_ADDRESS_HOURLY=2, GRANT_HOURLY=2, SWEEP_RATE_LIMIT=2)', () => {
  let server: RunningServer;
  beforeAll(async () => {
    // No SMTP_URL: every accepted message waits in the outbox, where it is counted.
    server = await startServer({
      INVITE_CREW_HOURLY: '3',
      INVITE_ADDRESS_HOURLY: '2',
      GRANT_HOURLY: '2',
      SWEEP_RATE_LIMIT: '2',
      SMTP_URL: '',
    });
  });
  afterAll(async () => {
    await server?.stop();
    if (server) cleanup(server.dir);
  });
  const call = (p: string, init: { method?: string; cookie?: string; body?: unknown; headers?: Record<string, string> } = {}) =>
    fetch(`${server.url}${p}`, {
      method: init.method ?? 'GET',
      headers: {
        origin: server.url,
        ...(init.cookie ? { cookie: init.cookie } : {}),
        ...(init.body !== undefined ? { 'content-type': 'application/json' } : {}),
        ...init.headers,
      },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
    });
  async function account(kind: 'camper' | 'installer', name = 'Limit Owner') {
    const email = uniqueEmail(kind);
    const res = await call('/api/auth/sign-up/email', { method: 'POST', body: { name, email, password: 'limit-password-1', kind } });
    expect(res.status).toBe(200);
    return {
      email,
      cookie: res.headers
        .getSetCookie()
        .map((c) => c.split(';')[0])
        .join('; '),
    };
  }
  const outbox = (to: string) => {
    const db = openDb({ where: server.dbPath });
    try {
      return (db.prepare('select count(*) as n from outbox where to_address = ?').get(to) as { n: number }).n;
    } finally {
      db.close();
    }
  };

  it('warns once at start when X-Forwarded-For arrives and SUNRECKON_TRUST_PROXY is off', async () => {
    expect(server.logs()).not.toContain('X-Forwarded-For');
    for (let i = 0; i < 3; i++) await fetch(`${server.url}/api/health`, { headers: { 'x-forwarded-for': `198.51.100.${i}` } });
    await new Promise((r) => setTimeout(r, 100));
    expect(server.logs().match(/SUNRECKON_TRUST_PROXY is off/g)).toHaveLength(1);
  });

  it('resends to one address: the third e-mail in an hour is 429 with Retry-After, and is not sent', async () => {
    const owner = await account('camper');
    const crewId = ((await (await call('/api/crews', { cookie: owner.cookie })).json()) as { id: string }[])[0]!.id;
    const to = uniqueEmail('target');
    const first = await call(`/api/crews/${crewId}/invitations`, {
      method: 'POST',
      cookie: owner.cookie,
      body: { email: to, role: 'viewer' },
    });
    expect(first.status).toBe(201);
    let inv = (await first.json()) as { id: string; version: number };
    const statuses: number[] = [];
    let last: Response | undefined;
    for (let i = 0; i < 3; i++) {
      last = await call(`/api/invitations/${inv.id}/resend`, { method: 'POST', cookie: owner.cookie, body: { version: inv.version } });
      statuses.push(last.status);
      if (last.status === 200) inv = (await last.json()) as typeof inv;
    }
    expect(statuses).toEqual([200, 429, 429]);
    expect(Number(last!.headers.get('retry-after'))).toBeGreaterThan(60);
    expect(await last!.json()).toMatchObject({ error: { code: 'rate_limited' } });
    expect(outbox(to)).toBe(2);
  });

  it('one crew: the fourth invitation in an hour is 429, whatever the address', async () => {
    const owner = await account('camper');
    const crewId = ((await (await call('/api/crews', { cookie: owner.cookie })).json()) as { id: string }[])[0]!.id;
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++)
      statuses.push(
        (
          await call(`/api/crews/${crewId}/invitations`, {
            method: 'POST',
            cookie: owner.cookie,
            body: { email: uniqueEmail(`crew${i}`), role: 'viewer' },
          })
        ).status,
      );
    expect(statuses).toEqual([201, 201, 201, 429]);
  });

  it('sweeps: the third in a minute by one installer is 429 with Retry-After', async () => {
    const owner = await account('camper');
    const installer = await account('installer', 'Sweeper');
    const rig = (await (await call('/api/rigs', { method: 'POST', cookie: owner.cookie, body: RIG_INPUT })).json()) as { id: string };
    const trip = (await (await call('/api/trips', { method: 'POST', cookie: owner.cookie, body: TRIP_INPUT(rig.id) })).json()) as {
      id: string;
    };
    const forecast = (await (await call(`/api/trips/${trip.id}/forecasts`, { method: 'POST', cookie: owner.cookie, body: {} })).json()) as {
      id: string;
    };
    expect(
      (await call(`/api/rigs/${rig.id}/grants`, { method: 'POST', cookie: owner.cookie, body: { email: installer.email } })).status,
    ).toBe(202);
    const answers: Response[] = [];
    for (let i = 0; i < 3; i++)
      answers.push(
        await call(`/api/forecasts/${forecast.id}/sweep`, {
          method: 'POST',
          cookie: installer.cookie,
          body: { candidates: { banks: [{ chemistry: 'lifepo4', capacityAh: 300 + i }] }, prices: TEST_PRICES },
        }),
      );
    expect(answers.map((r) => r.status)).toEqual([200, 200, 429]);
    expect(Number(answers[2]!.headers.get('retry-after'))).toBeGreaterThan(0);
  });

  it('shares: an installer, a camper and no account answer alike (202, same body, listed as invited); only the installer gets the e-mail; the third in an hour is 429', async () => {
    const camper = await account('camper', 'Other Camper');
    const installer = await account('installer', 'Wren');
    const ghost = uniqueEmail('ghost');
    // Each address typed with a capital and spaces, kept as typed (trimmed) in the answer and the list.
    const typed = (email: string) => ` ${email[0]!.toUpperCase()}${email.slice(1)} `;
    const seen: { status: number; body: string; listed: string; ms: number }[] = [];
    const owners: { cookie: string; rigId: string }[] = [];
    for (const email of [installer.email, camper.email, ghost]) {
      const owner = await account('camper');
      const rig = (await (
        await call('/api/rigs', { method: 'POST', cookie: owner.cookie, body: { name: 'Share van', bank: { chemistry: 'lifepo4', capacityAh: 100, nominalVolts: 12.8 } } })
      ).json()) as { id: string };
      owners.push({ cookie: owner.cookie, rigId: rig.id });
      const t0 = performance.now();
      const res = await call(`/api/rigs/${rig.id}/grants`, { method: 'POST', cookie: owner.cookie, body: { email: typed(email) } });
      const ms = performance.now() - t0;
      const body = (await res.json()) as { invited: { id: string; rigId: string; email: string; invitedBy: string; createdAt: string }; message: string };
      expect(body.invited.email).toBe(typed(email).trim());
      expect(body.invited.rigId).toBe(rig.id);
      const norm = JSON.stringify({ ...body, invited: { ...body.invited, id: '<id>', rigId: '<rig>', email: '<e>', createdAt: '<t>' } });
      const list = await (await call(`/api/rigs/${rig.id}/grants`, { cookie: owner.cookie })).json();
      const listed = JSON.stringify(list).replaceAll(body.invited.id, '<id>').replaceAll(rig.id, '<rig>').replaceAll(typed(email).trim(), '<e>').replaceAll(body.invited.createdAt, '<t>');
      seen.push({ status: res.status, body: norm, listed, ms });
    }
    expect(seen.map((s) => s.status)).toEqual([202, 202, 202]);
    expect(new Set(seen.map((s) => s.body)).size).toBe(1);
    expect(new Set(seen.map((s) => s.listed)).size).toBe(1);
    expect(seen[0]!.listed).toContain('"invited":[{');
    expect(seen[0]!.listed).toContain('"grants":[]');
    // The installer's e-mail is queued after the answer's transaction, not sent inside it: no slow branch.
    expect(Math.max(...seen.map((s) => s.ms))).toBeLessThan(1000);
    expect([outbox(installer.email), outbox(camper.email), outbox(ghost)]).toEqual([1, 0, 0]);

    // The installer opens their shared rigs: the share becomes theirs on the crew's list.
    const mine = (await (await call('/api/installer/rigs', { cookie: installer.cookie })).json()) as { rigId: string }[];
    expect(mine.map((r) => r.rigId)).toEqual([owners[0]!.rigId]);
    const after = (await (await call(`/api/rigs/${owners[0]!.rigId}/grants`, { cookie: owners[0]!.cookie })).json()) as {
      grants: { installer: { email: string } }[];
      invited: unknown[];
    };
    expect(after.grants.map((g) => g.installer.email)).toEqual([installer.email]);
    expect(after.invited).toEqual([]);

    // The same address again answers alike and does not add a second row; the third share in an hour is 429.
    const again = await call(`/api/rigs/${owners[1]!.rigId}/grants`, { method: 'POST', cookie: owners[1]!.cookie, body: { email: camper.email } });
    expect(again.status).toBe(202);
    const list = (await (await call(`/api/rigs/${owners[1]!.rigId}/grants`, { cookie: owners[1]!.cookie })).json()) as { invited: unknown[] };
    expect(list.invited).toHaveLength(1);
    const third = await call(`/api/rigs/${owners[1]!.rigId}/grants`, { method: 'POST', cookie: owners[1]!.cookie, body: { email: uniqueEmail('late') } });
    expect(third.status).toBe(429);
  });

  it('withdrawing a share not yet opened removes it from the list and, for an installer, their access', async () => {
    const owner = await account('camper');
    const installer = await account('installer', 'Fenn');
    const rig = (await (
      await call('/api/rigs', { method: 'POST', cookie: owner.cookie, body: { name: 'Withdraw van', bank: { chemistry: 'lifepo4', capacityAh: 100, nominalVolts: 12.8 } } })
    ).json()) as { id: string };
    const ghost = uniqueEmail('ghost');
    const ids: string[] = [];
    for (const email of [installer.email, ghost]) {
      const res = await call(`/api/rigs/${rig.id}/grants`, { method: 'POST', cookie: owner.cookie, body: { email } });
      ids.push(((await res.json()) as { invited: { id: string } }).invited.id);
    }
    expect((await call(`/api/rigs/${rig.id}`, { cookie: installer.cookie })).status).toBe(200);
    expect((await call(`/api/grants/${ids[0]}`, { method: 'DELETE', cookie: installer.cookie })).status).toBe(403);
    for (const id of ids) expect((await call(`/api/grants/${id}`, { method: 'DELETE', cookie: owner.cookie })).status).toBe(204);
    expect((await call(`/api/rigs/${rig.id}`, { cookie: installer.cookie })).status).toBe(404);
    expect(await (await call(`/api/rigs/${rig.id}/grants`, { cookie: owner.cookie })).json()).toEqual({ grants: [], invited: [], canManage: true });
  });
});

describe('monitor-log uploads are read in the worker pool, within caps', () => {
  let owner: Awaited<ReturnType<typeof signUp>>;
  let rigId: string;
  beforeAll(async () => {
    owner = await signUp();
    rigId = (await makeRig(owner)).id;
  });
  const preview = (csv: string, name = 'log.csv') => {
    const form = new FormData();
    form.set('file', new Blob([csv], { type: 'text/csv' }), name);
    form.set('timeZone', 'America/Denver');
    return api(`/api/rigs/${rigId}/monitor-logs?preview=1`, { method: 'POST', session: owner, body: form });
  };
  const logs = async () => ((await (await api(`/api/rigs/${rigId}/monitor-logs`, { session: owner })).json()) as unknown[]).length;

  it('one 1 MB line is a 400 naming the line-length limit', async () => {
    const res = await preview('x'.repeat(1024 * 1024));
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({
      error: { message: expect.stringContaining('4096 characters') },
      issues: [{ path: 'line 1' }],
    });
  });

  it('1 MB of commas is a 400 naming the column limit, with a short answer', async () => {
    const res = await preview(`${','.repeat(1000)}\n`.repeat(1000));
    expect(res.status).toBe(400);
    const text = await res.text();
    expect(text.length).toBeLessThan(2000);
    expect(JSON.parse(text)).toMatchObject({ error: { message: expect.stringContaining('64 columns') }, issues: [{ path: 'line 1' }] });
  });

  it('a valid 10 MB log previews with an answer under 1 MB and saves nothing', async () => {
    const start = Date.parse('2027-05-01T00:00:00Z');
    const lines = ['Time,Voltage (V),Current (A),SOC (%)'];
    let size = 40;
    for (let i = 0; size < 10 * 1024 * 1024 - 100_000; i++) {
      const line = `${new Date(start + i * 60_000).toISOString()},${(13 + (i % 50) / 100).toFixed(2)},${(((i % 200) - 100) / 10).toFixed(1)},${(50 + (i % 400) / 10).toFixed(1)}`;
      lines.push(line);
      size += line.length + 1;
    }
    const res = await preview(`${lines.join('\n')}\n`);
    const text = await res.text();
    expect(res.status, text.slice(0, 300)).toBe(200);
    expect(text.length).toBeLessThan(1024 * 1024);
    const body = JSON.parse(text) as { count: number; rows: unknown[]; sample: unknown[]; errorCount: number };
    expect(body.count).toBe(lines.length - 1);
    expect(body.rows.length).toBeLessThanOrEqual(8);
    expect(body.sample.length).toBeLessThanOrEqual(8);
    expect(await logs()).toBe(0);
  });

  it('a file full of bad readings answers under 1 MB, every problem counted', async () => {
    const bad = Array.from(
      { length: 20_000 },
      (_, i) => `2027-05-01T${String(i % 24).padStart(2, '0')}:00:00Z,${'9'.repeat(40)},x${'y'.repeat(30)}`,
    );
    const res = await preview(`Time,Voltage (V),Current (A)\n${bad.join('\n')}\n`);
    const text = await res.text();
    expect(res.status).toBeLessThan(500);
    expect(text.length).toBeLessThan(1024 * 1024);
  });
});

describe('upgrade sweeps run in the worker pool, two at a time per installer', () => {
  it('a third sweep while two run is 429 with Retry-After; more than 1,000 options is a 400', async () => {
    const owner = await signUp();
    const rig = await makeRig(owner);
    const trip = await makeTrip(owner, rig.id);
    const forecast = (await (await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: {} })).json()) as {
      id: string;
    };
    const installer = await signUp({ kind: 'installer' });
    expect((await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } })).status).toBe(
      202,
    );
    // Not the rig's own 200 Ah (the sweep skips a bank the rig already has).
    const banks = [150, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000, 1200].map((capacityAh) => ({ chemistry: 'lifepo4', capacityAh }));
    const panels = [100, 150, 200, 250, 300, 350, 400, 500, 600, 800].map((watts) => ({ watts, mounting: 'flat' }));
    const sweep = (dcdcAmps: number[]) =>
      api(`/api/forecasts/${forecast.id}/sweep`, {
        method: 'POST',
        session: installer,
        json: { candidates: { banks, panels, dcdcAmps }, prices: TEST_PRICES },
      });
    // 13 × 11 × 7 − 1 = 1,000 options each.
    const answers = await Promise.all([0, 1, 2].map(() => sweep([20, 30, 40, 50, 60, 80])));
    const statuses = answers.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 200, 429]);
    const refused = answers.find((r) => r.status === 429)!;
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(0);
    const done = (await answers.find((r) => r.status === 200)!.json()) as { options: unknown[]; forecastId: string };
    expect(done.options).toHaveLength(1000);
    expect(done.forecastId).toBe(forecast.id);
    // Once they are done, the next one runs.
    expect((await sweep([20])).status).toBe(200);
    const tooMany = await api(`/api/forecasts/${forecast.id}/sweep`, {
      method: 'POST',
      session: installer,
      json: { candidates: { banks, panels, dcdcAmps: [20, 30, 40, 50, 60, 80], generatorHours: [2] }, prices: TEST_PRICES },
    });
    expect(tooMany.status).toBe(400);
    expect(await tooMany.json()).toMatchObject({ issues: [{ path: 'candidates', message: expect.stringContaining('at most 1000') }] });
  });
});
