import { openTestDb } from './test-db';
import type { Selectable } from 'kysely';
import { inject } from 'vitest';
import type { CaughtMailTable } from '../../db/schema';

/** A stored message, as the catcher's table holds it. */
export type Caught = Selectable<CaughtMailTable>;

/** Every message the real SMTP catcher stored for an address (in the given database, else the shared test one). */
export function caughtFor(to: string, dbPath = inject('dbPath')): Caught[] {
  const db = openTestDb({ where: dbPath });
  try {
    return db.prepare('select * from caught_mail where lower(to_address) = lower(?) order by id').all(to) as Caught[];
  } finally {
    db.close();
  }
}

/** Waits until the catcher has received `count` messages for an address, and returns them all. */
export async function waitForMail(to: string, opts: { count?: number; timeoutMs?: number; dbPath?: string } = {}): Promise<Caught[]> {
  const count = opts.count ?? 1;
  const deadline = Date.now() + (opts.timeoutMs ?? 10_000);
  for (;;) {
    const got = caughtFor(to, opts.dbPath);
    if (got.length >= count) return got;
    if (Date.now() > deadline) throw new Error(`Expected ${count} message(s) to ${to} within the timeout, got ${got.length}.`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** The first link in a message's plain-text part that starts with `prefix` (e.g. `${baseUrl}/invite/`). */
export function linkIn(mail: Caught, prefix: string): string {
  const found = mail.text_body.match(/https?:\/\/[^\s<>"')]+/g)?.find((u) => u.startsWith(prefix));
  if (!found) throw new Error(`No link starting with ${prefix} in:\n${mail.text_body}`);
  return found;
}

/** A header's value as the catcher received it (folded lines joined), or null when the message has none. */
export function headerIn(mail: Caught, name: string): string | null {
  const lines = JSON.parse(mail.headers ?? '[]') as { key: string; line: string }[];
  const found = lines.find((h) => h.key === name.toLowerCase());
  if (!found) return null;
  return found.line.slice(found.line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim();
}

/** Reads outbox rows for an address straight from the database. */
export function outboxFor(to: string, dbPath = inject('dbPath')): { id: string; status: string; attempts: number; last_error: string | null; next_attempt_at: string; kind: string }[] {
  const db = openTestDb({ where: dbPath });
  try {
    return db.prepare('select id, status, attempts, last_error, next_attempt_at, kind from outbox where to_address = ? order by created_at').all(to) as never;
  } finally {
    db.close();
  }
}

/** Waits until every outbox row for an address is sent, and returns the rows. */
export async function waitForSent(to: string, opts: { timeoutMs?: number; dbPath?: string } = {}): Promise<ReturnType<typeof outboxFor>> {
  const deadline = Date.now() + (opts.timeoutMs ?? 10_000);
  for (;;) {
    const rows = outboxFor(to, opts.dbPath);
    if (rows.length > 0 && rows.every((r) => r.status === 'sent')) return rows;
    if (Date.now() > deadline) throw new Error(`Outbox rows for ${to} not all sent: ${JSON.stringify(rows)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
