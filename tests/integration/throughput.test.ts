import { createHash } from 'node:crypto';
import http from 'node:http';
import { readdirSync, readFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { startMailCatcher, type MailCatcher } from '../../src/server/mail-catcher';
import { benchPlan } from '../../scripts/bench-plan';
import type { Forecast } from '../../src/engine';
import { fromColumns, type ColumnarForecast } from '../../src/lib/forecast-columns';
import { baseUrl, signUp } from '../helpers/api';
import { caughtFor, waitForMail } from '../helpers/mail';
import { cleanup, freshTestDatabase, startServer, type RunningServer } from '../helpers/server';

/** A raw GET (no automatic decompression), for checking what travels on the wire. */
function rawGet(
  url: string,
  headers: Record<string, string> = {},
): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      })
      .on('error', reject);
  });
}

/** The /_astro/ scripts and styles the landing page links to. */
async function assetsOfLanding(): Promise<string[]> {
  const html = await (await fetch(`${baseUrl()}/`)).text();
  return [...new Set([...html.matchAll(/(?:src|href)="(\/_astro\/[^"]+\.(?:js|css))"/g)].map((m) => m[1]!))];
}

describe('static files', () => {
  it('hashed files answer with a year of immutable caching and the precompressed body the client accepts', async () => {
    const assets = await assetsOfLanding();
    expect(assets.length).toBeGreaterThan(0);
    // The largest one is surely over the 1 KB below which nothing is precompressed.
    const sized = await Promise.all(assets.map(async (a) => ({ a, plain: await rawGet(`${baseUrl()}${a}`) })));
    const { a, plain } = sized.sort((x, y) => y.plain.body.length - x.plain.body.length)[0]!;
    expect(plain.status).toBe(200);
    expect(plain.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.headers['x-content-type-options']).toBe('nosniff');

    const br = await rawGet(`${baseUrl()}${a}`, { 'accept-encoding': 'gzip, deflate, br' });
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers['vary']).toBe('Accept-Encoding');
    expect(br.body.length).toBeLessThan(plain.body.length);
    expect(brotliDecompressSync(br.body).equals(plain.body)).toBe(true);

    const gz = await rawGet(`${baseUrl()}${a}`, { 'accept-encoding': 'gzip' });
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gunzipSync(gz.body).equals(plain.body)).toBe(true);

    // A second visit with the ETag gets a 304 and no body.
    const again = await rawGet(`${baseUrl()}${a}`, { 'if-none-match': String(plain.headers.etag) });
    expect(again.status).toBe(304);
    expect(again.body.length).toBe(0);
  });

  it('the service worker is asked again on each visit, and an unknown /_astro/ file is a 404 from the app', async () => {
    const sw = await rawGet(`${baseUrl()}/sw.js`);
    expect(sw.status).toBe(200);
    expect(sw.headers['cache-control']).toBe('no-cache');
    expect(sw.headers['content-type']).toMatch(/javascript/);
    const missing = await rawGet(`${baseUrl()}/_astro/no-such-file.js`);
    expect(missing.status).toBe(404);
  });
});

describe('routes without a session lookup', () => {
  it('health answers with and without a session cookie, also many times in a row', async () => {
    const s = await signUp();
    for (const cookie of [undefined, s.cookie, 'better-auth.session_token=not-a-real-token']) {
      for (let i = 0; i < 3; i++) {
        const res = await fetch(`${baseUrl()}/api/health`, { headers: cookie ? { cookie } : {} });
        expect(res.status).toBe(200);
        expect(res.headers.get('cache-control')).toBe('no-store');
        expect(res.headers.get('x-content-type-options')).toBe('nosniff');
        expect(await res.json()).toEqual({ ok: true, db: 'ok' });
      }
    }
  });

  it('the anonymous preview forecasts a 30-day, 40-load trip the same way twice (the second from the sun cache) and still names a bad field', async () => {
    const post = (body: unknown) =>
      fetch(`${baseUrl()}/api/forecasts/preview`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: baseUrl() },
        body: JSON.stringify(body),
      });
    const plan = benchPlan(30);
    const first = await post(plan);
    expect(first.status).toBe(200);
    const a = (await first.json()) as { hourly: unknown[]; summary: unknown };
    const b = (await (await post(plan)).json()) as { hourly: unknown[]; summary: unknown };
    expect(b).toEqual(a);
    // Other loads on the same trip: the cached sun, another answer.
    const heavier = { ...plan, loads: plan.loads!.map((l) => ({ ...l, watts: (l.watts ?? 0) * 3 })) };
    const c = (await (await post(heavier)).json()) as { summary: unknown };
    expect(c.summary).not.toEqual(a.summary);
    const bad = await post({ ...plan, stops: [{ ...plan.stops[0]!, lat: 'north' }] });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(await bad.json())).toContain('stops.0.lat');
  });
});

describe('the preview in columns', () => {
  it('?hourly=columns carries the same forecast as the row form, in less JSON', async () => {
    const post = (q: string) =>
      fetch(`${baseUrl()}/api/forecasts/preview${q}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: baseUrl() },
        body: JSON.stringify(benchPlan(30)),
      });
    const rowsRes = await post('');
    const colsRes = await post('?hourly=columns');
    expect(colsRes.status).toBe(200);
    const rowsText = await rowsRes.text();
    const colsText = await colsRes.text();
    expect(colsText.length).toBeLessThan(rowsText.length * 0.6);
    const rows = JSON.parse(rowsText) as Forecast;
    const cols = JSON.parse(colsText) as ColumnarForecast;
    expect(cols.hours).toBe(rows.hourly.length);
    expect(cols.hourlyColumns.socPct).toHaveLength(rows.hourly.length);
    expect(cols.hourlyColumns.socPct[100]).toBe(rows.hourly[100]!.socPct);
    expect(fromColumns(cols)).toEqual(rows);
  });
});

describe('the security-headers step', () => {
  it('keeps allowing each inline script of a page by hash after it stops reading the page (learned on the first renders)', async () => {
    for (let i = 0; i < 8; i++) {
      const res = await fetch(`${baseUrl()}/sign-in`);
      const html = await res.text();
      const csp = res.headers.get('content-security-policy') ?? '';
      const inline = [...html.matchAll(/<script\b(?![^>]*\bsrc\s*=)[^>]*>([\s\S]*?)<\/script>/gi)].map(
        (m) => `'sha256-${createHash('sha256').update(m[1]!).digest('base64')}'`,
      );
      expect(inline.length).toBeGreaterThan(0);
      for (const h of inline) expect(csp, `render ${i + 1}`).toContain(h);
      expect(res.headers.get('x-frame-options')).toBe('DENY');
    }
  });
});

describe('the landing page cache', () => {
  // Base.astro names the signed-in user's id in a meta tag (empty for anonymous visitors, which
  // Astro writes as a bare attribute); the header offers "Open my trips" only when signed in.
  const userMeta = (html: string) => {
    const m = /<meta name="sunreckon-user" content(?:="([^"]*)")?/.exec(html);
    return m ? (m[1] ?? '') : undefined;
  };

  it('anonymous visitors share one cached page; a signed-in visitor never gets it, nor do anonymous visitors get theirs', async () => {
    await fetch(`${baseUrl()}/`);
    const anon = await fetch(`${baseUrl()}/`);
    expect(anon.status).toBe(200);
    expect(anon.headers.get('x-sunreckon-cache')).toBe('hit');
    expect(anon.headers.get('content-security-policy')).toContain("script-src 'self'");
    const anonHtml = await anon.text();
    expect(userMeta(anonHtml)).toBe('');
    expect(anonHtml).toContain('Create account');
    expect(anonHtml).not.toContain('Open my trips');

    const s = await signUp();
    const signedIn = await fetch(`${baseUrl()}/`, { headers: { cookie: s.cookie }, redirect: 'manual' });
    expect(signedIn.headers.get('x-sunreckon-cache')).toBeNull();
    expect(signedIn.status).toBe(200);
    const signedInHtml = await signedIn.text();
    expect(userMeta(signedInHtml)).toBe(s.userId);
    expect(signedInHtml).toContain('Open my trips');

    const after = await fetch(`${baseUrl()}/`);
    const afterHtml = await after.text();
    expect(after.headers.get('x-sunreckon-cache')).toBe('hit');
    expect(userMeta(afterHtml)).toBe('');
    expect(afterHtml).not.toContain('Open my trips');
    expect(afterHtml).not.toContain(s.userId);
    expect(afterHtml).not.toContain(s.email);
  });
});

describe('several worker processes', () => {
  let server: RunningServer | null = null;
  let catcher: MailCatcher | null = null;
  afterAll(async () => {
    await server?.stop();
    await catcher?.stop();
    if (server) cleanup(server.dir);
  });

  it('WEB_CONCURRENCY=2 serves pages, API and files from two workers; each mail is sent once; the preview limit counts across workers', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-test-'));
    const dbPath = await freshTestDatabase(dir);
    catcher = await startMailCatcher({ dbPath, quiet: true });
    server = await startServer(
      { WEB_CONCURRENCY: '2', SMTP_URL: catcher.url, OUTBOX_RETRY_BASE_MS: '200', PREVIEW_RATE_LIMIT: '6' },
      { dir, dbPath },
    );
    const url = server.url;

    // The primary and its two workers.
    const children = readdirSync('/proc')
      .filter((d) => /^\d+$/.test(d))
      .filter((d) => {
        try {
          const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
          return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) === server!.child.pid;
        } catch {
          return false;
        }
      });
    expect(children).toHaveLength(2);

    for (let i = 0; i < 6; i++) {
      expect((await fetch(`${url}/api/health`)).status).toBe(200);
      expect((await fetch(`${url}/sign-in`)).status).toBe(200);
      expect((await fetch(`${url}/sw.js`)).status).toBe(200);
    }

    // Ten campers ask for a reset link at once: the requests spread over both workers, each of which
    // kicks the outbox; every address gets exactly one message.
    const headers = { 'content-type': 'application/json', origin: url };
    const emails = Array.from({ length: 10 }, (_, i) => `cluster.mail.${i}.${Date.now()}@example.test`);
    for (const email of emails) {
      const up = await fetch(`${url}/api/auth/sign-up/email`, {
        method: 'POST',
        headers,
        body: JSON.stringify({ name: 'Cluster Camper', email, password: 'cluster-pass-1', kind: 'camper' }),
      });
      expect(up.status).toBe(200);
    }
    const resets = await Promise.all(
      emails.map((email) =>
        fetch(`${url}/api/auth/request-password-reset`, {
          method: 'POST',
          headers,
          body: JSON.stringify({ email, redirectTo: '/reset-password' }),
        }),
      ),
    );
    expect(resets.map((r) => r.status)).toEqual(emails.map(() => 200));
    for (const email of emails) await waitForMail(email, { dbPath, timeoutMs: 15_000 });
    await new Promise((r) => setTimeout(r, 1_500));
    for (const email of emails) expect(caughtFor(email, dbPath)).toHaveLength(1);

    // Six previews a minute per client, counted for both workers together.
    const plan = JSON.stringify(benchPlan(3));
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++)
      statuses.push((await fetch(`${url}/api/forecasts/preview`, { method: 'POST', headers, body: plan })).status);
    expect(statuses.slice(0, 6)).toEqual([200, 200, 200, 200, 200, 200]);
    expect(statuses.slice(6)).toEqual([429, 429]);
  }, 90_000);
});
