import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { api } from '../helpers/api';
import { cleanup, startServer, type RunningServer } from '../helpers/server';
import { at } from '../../src/lib/invariant';

/** Every number anywhere in a JSON value. */
function numbers(value: unknown, out: number[] = []): number[] {
  if (typeof value === 'number') out.push(value);
  else if (Array.isArray(value)) value.forEach((v) => numbers(v, out));
  else if (value && typeof value === 'object') Object.values(value).forEach((v) => numbers(v, out));
  return out;
}

const post = (body: BodyInit, type = 'application/json') => api('/api/forecasts/preview', { method: 'POST', body, headers: { 'content-type': type } });

describe('POST /api/forecasts/preview', () => {
  it('forecasts the demo plan without an account', async () => {
    const res = await post(JSON.stringify(demoPlan()));
    expect(res.status).toBe(200);
    const text = await res.text();
    expect(text).not.toMatch(/NaN|Infinity/);
    const body = JSON.parse(text);
    expect(body.hourly.length).toBe(body.summary.hoursSimulated);
    expect(body.hourly[0].time).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}[+-]\d{2}:\d{2}$/);
    expect(numbers(body).every(Number.isFinite)).toBe(true);
    expect(body.days.length).toBeGreaterThan(4);
  });

  it('names the refused field', async () => {
    const plan = demoPlan() as { bank: { capacityAh: unknown }; stops: { lat: unknown }[] };
    plan.bank.capacityAh = -5;
    at(plan.stops, 0, 'demo stop').lat = 123;
    const res = await post(JSON.stringify(plan));
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_plan');
    const paths = body.issues.map((i: { path: string }) => i.path);
    expect(paths).toContain('bank.capacityAh');
    expect(paths).toContain('stops.0.lat');
  });

  it('answers malformed JSON with a 400 envelope', async () => {
    const res = await post('{"bank": ');
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_plan');
    expect(body.issues[0].path).toBe('(body)');
  });

  it('answers a wrong content type with a 400 naming the header', async () => {
    const res = await post(JSON.stringify(demoPlan()), 'text/plain');
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.issues[0].path).toBe('(headers).content-type');
  });

  it('refuses a body over 256 KB', async () => {
    const res = await post(JSON.stringify({ pad: 'x'.repeat(300 * 1024) }));
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe('payload_too_large');
  });

  it.each([
    ['null', 'null'],
    ['an array', '[]'],
    ['a string', '"plan"'],
    ['NaN-like numbers', '{"bank":{"chemistry":"lifepo4","capacityAh":1e999},"stops":[]}'],
  ])('answers %s with 400, never 500', async (_label, body) => {
    const res = await post(body);
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe('invalid_plan');
  });
});

describe('preview rate limit', () => {
  let server: RunningServer;
  beforeAll(async () => {
    server = await startServer({ PREVIEW_RATE_LIMIT: '3' });
  });
  afterAll(async () => {
    await server.stop();
    cleanup(server.dir);
  });

  it('answers 429 with Retry-After past the limit per minute', async () => {
    const send = () => fetch(`${server.url}/api/forecasts/preview`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(demoPlan()) });
    const statuses = [];
    for (let i = 0; i < 4; i++) statuses.push((await send()).status);
    expect(statuses).toEqual([200, 200, 200, 429]);
    const limited = await send();
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
    expect((await limited.json()).error.code).toBe('rate_limited');
  });
});
