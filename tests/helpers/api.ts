import { inject } from 'vitest';
import { openTestDb as openDb, type TestDb } from './test-db';

/** Base URL of the server started by the global setup. */
export const baseUrl = () => inject('baseUrl');

let counter = 0;
/** A unique e-mail for a test account. */
export function uniqueEmail(prefix = 'camper'): string {
  counter += 1;
  return `${prefix}.${Date.now().toString(36)}.${counter}.${Math.random().toString(36).slice(2, 7)}@example.test`;
}

export interface Session {
  cookie: string;
  userId: string;
  email: string;
}

/** Signs a new account up through better-auth's real endpoint and returns its session cookie. */
export async function signUp(opts: { kind?: 'camper' | 'installer'; name?: string; email?: string; password?: string } = {}): Promise<Session> {
  const email = opts.email ?? uniqueEmail(opts.kind ?? 'camper');
  const res = await fetch(`${baseUrl()}/api/auth/sign-up/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl() },
    body: JSON.stringify({ name: opts.name ?? 'Test Camper', email, password: opts.password ?? 'correct-horse-1', kind: opts.kind ?? 'camper' }),
  });
  if (!res.ok) throw new Error(`sign-up failed: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { user: { id: string } };
  const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  return { cookie, userId: body.user.id, email };
}

/** fetch against the test server, as a signed-in session when given one. */
export async function api(path: string, init: RequestInit & { session?: Session; json?: unknown } = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  headers.set('origin', baseUrl());
  if (init.session) headers.set('cookie', init.session.cookie);
  let body = init.body;
  if (init.json !== undefined) {
    headers.set('content-type', 'application/json');
    body = JSON.stringify(init.json);
  }
  return fetch(`${baseUrl()}${path}`, { ...init, headers, body, redirect: 'manual' });
}

/** A read-only handle on the test database, for asserting what was stored. */
export function openTestDb(): TestDb {
  return openDb();
}
