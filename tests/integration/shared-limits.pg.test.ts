import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { cleanup, startServer, type RunningServer } from '../helpers/server';

// PostgreSQL only (project integration-pg): with several instances the rate-limit counters live in
// the shared database, so a client cannot multiply its allowance by spreading requests over them.
// (On SQLite the one process counts in memory.)

let a: RunningServer;
let b: RunningServer;

beforeAll(async () => {
  a = await startServer({ PREVIEW_RATE_LIMIT: '6', AUTH_RATE_LIMIT: '3' });
  b = await startServer({ PREVIEW_RATE_LIMIT: '6', AUTH_RATE_LIMIT: '3' }, { dir: a.dir, dbPath: a.dbPath });
}, 180_000);

afterAll(async () => {
  await b?.stop();
  await a?.stop();
  if (a) cleanup(a.dir);
});

describe('rate limits across instances', () => {
  it('the preview limit counts requests to both instances together', async () => {
    const send = (s: RunningServer) => fetch(`${s.url}/api/forecasts/preview`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(demoPlan()) });
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++) statuses.push((await send(i % 2 ? b : a)).status);
    expect(statuses).toEqual([200, 200, 200, 200, 200, 200, 429, 429]);
  });

  it('failed sign-ins count across both instances (better-auth’s limit in the database)', async () => {
    const send = (s: RunningServer) =>
      fetch(`${s.url}/api/auth/sign-in/email`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: s.url },
        body: JSON.stringify({ email: 'nobody-here@example.test', password: 'wrong-password-1' }),
      });
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await send(i % 2 ? b : a)).status);
    expect(statuses.slice(0, 3).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(3)).toEqual([429, 429]);
  });
});
