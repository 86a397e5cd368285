import http from 'node:http';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { benchPlan } from '../../scripts/bench-plan';
import { runForecast, validatePlan, type Plan } from '../../src/engine';
import { toColumns } from '../../src/lib/forecast-columns';
import { cleanup, startServer, type RunningServer } from '../helpers/server';

/**
 * The preview's direct path (server.mjs → src/server/preview-direct.ts) answers what the Astro
 * route answers: the same bytes as the engine run here in the test, the same headers, the same
 * refusals. Three servers of their own: direct (default), route only (SUNRECKON_PREVIEW_DIRECT=0)
 * and direct with a rate limit of 3 a minute.
 */

type Raw = { status: number; headers: http.IncomingHttpHeaders; body: Buffer };

/** A raw POST (no decompression, the body's exact bytes). */
function rawPost(url: string, body: string | Buffer, headers: Record<string, string> = {}): Promise<Raw> {
  return new Promise((resolve, reject) => {
    const u = new URL(url);
    const req = http.request(
      { host: u.hostname, port: u.port, path: u.pathname + u.search, method: 'POST', headers: { 'content-type': 'application/json', origin: u.origin, ...headers } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      },
    );
    req.on('error', reject);
    req.end(body);
  });
}

/** Headers that belong to the connection or the transfer, not to the answer. */
const TRANSPORT = new Set(['date', 'connection', 'keep-alive', 'content-length', 'transfer-encoding', 'x-sunreckon-path']);
const answerHeaders = (h: http.IncomingHttpHeaders) => Object.fromEntries(Object.entries(h).filter(([k]) => !TRANSPORT.has(k)));

function engineRows(plan: Plan): string {
  const r = runForecast(plan);
  if (!r.ok) throw new Error(JSON.stringify(r.envelope));
  return JSON.stringify(r.forecast);
}
function engineColumns(plan: Plan): string {
  const r = runForecast(plan);
  if (!r.ok) throw new Error(JSON.stringify(r.envelope));
  return JSON.stringify(toColumns(r.forecast));
}

let direct: RunningServer;
let routeOnly: RunningServer;
let limited: RunningServer;

beforeAll(async () => {
  [direct, routeOnly, limited] = await Promise.all([
    startServer(),
    startServer({ SUNRECKON_PREVIEW_DIRECT: '0' }),
    startServer({ PREVIEW_RATE_LIMIT: '3' }),
  ]);
});

afterAll(async () => {
  for (const s of [direct, routeOnly, limited]) {
    if (!s) continue;
    await s.stop();
    cleanup(s.dir);
  }
});

const PREVIEW = '/api/forecasts/preview';

describe('the preview answered before Astro', () => {
  it('the first preview goes through the route, later ones directly: the same bytes as the engine, rows and columns, and the same headers', async () => {
    const plan = benchPlan(30);
    const body = JSON.stringify(plan);
    const first = await rawPost(`${direct.url}${PREVIEW}`, body);
    expect(first.status).toBe(200);
    expect(first.headers['x-sunreckon-path']).toBeUndefined();
    expect(first.body.toString()).toBe(engineRows(plan));

    const second = await rawPost(`${direct.url}${PREVIEW}`, body);
    expect(second.headers['x-sunreckon-path']).toBe('direct');
    expect(second.status).toBe(200);
    expect(second.body.toString()).toBe(engineRows(plan));
    expect(answerHeaders(second.headers)).toEqual(answerHeaders(first.headers));
    expect(second.headers['content-security-policy']).toMatch(/default-src 'self'/);
    expect(second.headers['cache-control']).toBe('no-store');

    const cols = await rawPost(`${direct.url}${PREVIEW}?hourly=columns`, body);
    expect(cols.headers['x-sunreckon-path']).toBe('direct');
    expect(cols.body.toString()).toBe(engineColumns(plan));

    // Another plan of the same trip (other loads): its own answer, not the one kept for the first.
    const heavier: Plan = { ...plan, loads: plan.loads!.map((l) => ({ ...l, watts: (l.watts ?? 0) * 3 })) };
    const other = await rawPost(`${direct.url}${PREVIEW}?hourly=columns`, JSON.stringify(heavier));
    expect(other.headers['x-sunreckon-path']).toBe('direct');
    expect(other.body.toString()).toBe(engineColumns(heavier));
    expect(other.body.toString()).not.toBe(cols.body.toString());

    // A browser asking for gzip gets the same bytes packed.
    const packed = await rawPost(`${direct.url}${PREVIEW}`, body, { 'accept-encoding': 'gzip' });
    expect(packed.headers['content-encoding']).toBe('gzip');
    expect(gunzipSync(packed.body).toString()).toBe(engineRows(plan));
  });

  it('a plan with a bad field gets the engine’s own envelope from the direct path', async () => {
    const plan = benchPlan(3);
    await rawPost(`${direct.url}${PREVIEW}`, JSON.stringify(plan)); // loads the route
    const bad = { ...plan, stops: [{ ...plan.stops[0]!, lat: 'north' }] };
    const res = await rawPost(`${direct.url}${PREVIEW}`, JSON.stringify(bad));
    expect(res.headers['x-sunreckon-path']).toBe('direct');
    expect(res.status).toBe(400);
    const v = validatePlan(bad);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(res.body.toString()).toBe(JSON.stringify(v.envelope));
    expect(res.body.toString()).toContain('stops.0.lat');
  });

  it('answers every refusal as the route does (bad JSON, NUL, empty, content type, another site, a forwarded host, a query)', async () => {
    const plan = JSON.stringify(benchPlan(3));
    await rawPost(`${direct.url}${PREVIEW}`, plan);
    await rawPost(`${routeOnly.url}${PREVIEW}`, plan);
    const cases: { name: string; body: string | Buffer; headers?: Record<string, string>; path?: string }[] = [
      { name: 'bad JSON', body: '{"stops": [' },
      { name: 'a NUL character', body: JSON.stringify({ ...benchPlan(3), loads: [{ name: 'Fridge\u0000', watts: 50 }] }) },
      { name: 'empty body', body: '' },
      { name: 'text content type', body: plan, headers: { 'content-type': 'text/plain' } },
      { name: 'another site', body: plan, headers: { origin: 'https://elsewhere.example' } },
      { name: 'a forwarded host', body: plan, headers: { 'x-forwarded-host': 'elsewhere.example' } },
      { name: 'a NUL in the query', body: plan, path: `${PREVIEW}?hourly=columns%00` },
      { name: 'a query of its own', body: plan, path: `${PREVIEW}?hourly=rows` },
    ];
    for (const c of cases) {
      const path = c.path ?? PREVIEW;
      const a = await rawPost(`${direct.url}${path}`, c.body, c.headers);
      const b = await rawPost(`${routeOnly.url}${path}`, c.body, c.headers);
      expect(b.headers['x-sunreckon-path'], c.name).toBeUndefined();
      // Each server names its own address where it says which origin it expected.
      const text = (r: Raw, s: RunningServer) => r.body.toString().replaceAll(s.url, '(server)');
      expect({ name: c.name, status: a.status, body: text(a, direct) }).toEqual({ name: c.name, status: b.status, body: text(b, routeOnly) });
      expect(answerHeaders(a.headers), c.name).toEqual(answerHeaders(b.headers));
    }
    // The direct path answered the refusals it reads a body for; the others went through Astro.
    const nul = await rawPost(`${direct.url}${PREVIEW}`, cases[1]!.body);
    expect(nul.status).toBe(400);
    expect(nul.headers['x-sunreckon-path']).toBe('direct');
    const site = await rawPost(`${direct.url}${PREVIEW}`, plan, { origin: 'https://elsewhere.example' });
    expect(site.status).toBe(403);
    expect(site.headers['x-sunreckon-path']).toBeUndefined();
  });

  it('the rate limit counts direct and routed previews together and answers 429 with Retry-After', async () => {
    const plan = JSON.stringify(benchPlan(3));
    const answers: Raw[] = [];
    for (let i = 0; i < 5; i++) answers.push(await rawPost(`${limited.url}${PREVIEW}`, plan));
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 429, 429]);
    expect(answers[1]!.headers['x-sunreckon-path']).toBe('direct');
    const refused = answers[3]!;
    expect(refused.headers['x-sunreckon-path']).toBe('direct');
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    expect(JSON.parse(refused.body.toString()).error.code).toBe('rate_limited');
    expect(refused.headers['x-frame-options']).toBe('DENY');
  });
});
