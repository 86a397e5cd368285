import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher, type MailCatcher } from '../../src/server/mail-catcher';
import { uniqueEmail } from '../helpers/api';
import { caughtFor, outboxFor, waitForMail, waitForSent } from '../helpers/mail';
import { cleanup, freePort, startServer, type RunningServer } from '../helpers/server';

// Its own server and catcher, so the catcher can be stopped and the server restarted without
// touching the shared ones. Retries start after 200 ms here (30 s by default).

let server: RunningServer;
let port: number;
let catcher: MailCatcher | null = null;
const ENV = () => ({ SMTP_URL: `smtp://127.0.0.1:${port}`, OUTBOX_RETRY_BASE_MS: '200' });

async function post(path: string, body: unknown) {
  return fetch(`${server.url}${path}`, { method: 'POST', headers: { 'content-type': 'application/json', origin: server.url }, body: JSON.stringify(body) });
}

async function account(): Promise<string> {
  const email = uniqueEmail('outbox');
  const res = await post('/api/auth/sign-up/email', { name: 'Outbox Tester', email, password: 'outbox-password-1', kind: 'camper' });
  expect(res.status).toBe(200);
  return email;
}

async function waitForQueuedError(email: string) {
  const deadline = Date.now() + 10_000;
  for (;;) {
    const rows = outboxFor(email, server.dbPath);
    if (rows.length === 1 && rows[0]!.attempts >= 1 && rows[0]!.last_error) return rows[0]!;
    if (Date.now() > deadline) throw new Error(`no failed attempt recorded: ${JSON.stringify(rows)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

beforeAll(async () => {
  port = await freePort();
  server = await startServer(ENV());
});

afterAll(async () => {
  await server?.stop();
  await catcher?.stop();
  if (server) cleanup(server.dir);
});

describe('outbox: mail is never lost when the SMTP server is down', () => {
  it('keeps the message queued with its error, then delivers it once when the catcher is back', async () => {
    const email = await account();
    expect((await post('/api/auth/request-password-reset', { email, redirectTo: '/reset-password' })).status).toBe(200);

    const failed = await waitForQueuedError(email);
    expect(failed.status).toBe('queued');
    expect(failed.last_error).toMatch(/ECONNREFUSED|connect/i);
    expect(new Date(failed.next_attempt_at).getTime()).toBeGreaterThan(Date.now() - 1_000);
    expect(caughtFor(email, server.dbPath)).toHaveLength(0);

    catcher = await startMailCatcher({ dbPath: server.dbPath, port, quiet: true });
    const [mail] = await waitForMail(email, { dbPath: server.dbPath, timeoutMs: 15_000 });
    expect(mail!.subject).toBe('Reset your Sunreckon password');
    const [row] = await waitForSent(email, { dbPath: server.dbPath });
    expect(row!.attempts).toBeGreaterThanOrEqual(2);
    expect(row!.last_error).toBeNull();
    expect(mail!.message_id).toBe(`<${row!.id}@outbox.sunreckon>`);

    // Several retry periods later there is still exactly one copy.
    await new Promise((r) => setTimeout(r, 1_500));
    expect(caughtFor(email, server.dbPath)).toHaveLength(1);
  });

  it('survives a restart: a message queued before the server stopped is sent by the next one', async () => {
    await catcher!.stop();
    catcher = null;
    const email = await account();
    expect((await post('/api/auth/request-password-reset', { email, redirectTo: '/reset-password' })).status).toBe(200);
    await waitForQueuedError(email);

    await server.stop();
    catcher = await startMailCatcher({ dbPath: server.dbPath, port, quiet: true });
    server = await startServer(ENV(), { dir: server.dir, dbPath: server.dbPath });

    await waitForMail(email, { dbPath: server.dbPath, timeoutMs: 15_000 });
    await waitForSent(email, { dbPath: server.dbPath });
    await new Promise((r) => setTimeout(r, 1_000));
    expect(caughtFor(email, server.dbPath)).toHaveLength(1);
  });
});
