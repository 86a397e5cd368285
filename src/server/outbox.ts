import type { Kysely } from 'kysely';
import type { DB, OutboxRow } from '../../db/schema';
import { db as appDb } from './db';
import { env } from './env';
import { deliver, type MailContent } from './mail';

// The outbox: a message is written here in the same transaction as the change that causes it
// (an invitation, a grant, a reset request), then sent. When sending fails the row stays queued
// with its attempts, last error and next attempt time, and the worker tries again with a doubling
// delay. Rows live in SQLite, so a restart picks up where the last process stopped.

const MAX_DELAY_MS = 15 * 60_000;
/** How long a claimed row is held before another pass may take it (a crash mid-send). */
const LEASE_MS = 2 * 60_000;

/** Writes a message to the outbox inside the caller's transaction; call `kickOutbox()` after commit. */
export async function enqueueMail(trx: Kysely<DB>, kind: string, to: string, content: MailContent): Promise<string> {
  const id = crypto.randomUUID();
  const now = new Date().toISOString();
  await trx
    .insertInto('outbox')
    .values({ id, kind, to_address: to, subject: content.subject, text_body: content.text, html_body: content.html, headers: content.headers ? JSON.stringify(content.headers) : null, next_attempt_at: now, created_at: now })
    .execute();
  return id;
}

/** The delay before attempt number `attempts + 1`, after `attempts` failures. */
export function retryDelayMs(attempts: number, baseMs = env.OUTBOX_RETRY_BASE_MS): number {
  return Math.min(baseMs * 2 ** Math.max(0, attempts - 1), MAX_DELAY_MS);
}

function messageIdOf(row: Pick<OutboxRow, 'id'>): string {
  return `<${row.id}@outbox.sunreckon>`;
}

/** Claims a due row so that only one pass sends it; false when another pass got there first. */
async function claim(db: Kysely<DB>, row: OutboxRow, now: Date): Promise<boolean> {
  const res = await db
    .updateTable('outbox')
    .set({ status: 'sending', locked_until: new Date(now.getTime() + LEASE_MS).toISOString() })
    .where('id', '=', row.id)
    .where('status', '=', row.status)
    .where('attempts', '=', row.attempts)
    .where((eb) => (row.locked_until === null ? eb('locked_until', 'is', null) : eb('locked_until', '=', row.locked_until)))
    .executeTakeFirst();
  return res.numUpdatedRows === 1n;
}

/** Sends every due message once; failures are written back with their error and next attempt. */
export async function sendDue(db: Kysely<DB>, now = new Date()): Promise<{ sent: number; failed: number }> {
  const iso = now.toISOString();
  const due = await db
    .selectFrom('outbox')
    .selectAll()
    .where((eb) =>
      eb.or([
        eb.and([eb('status', '=', 'queued'), eb('next_attempt_at', '<=', iso)]),
        // A pass that died mid-send left its lease behind.
        eb.and([eb('status', '=', 'sending'), eb('locked_until', '<', iso)]),
      ]),
    )
    .orderBy('created_at')
    .limit(50)
    .execute();
  let sent = 0;
  let failed = 0;
  for (const row of due) {
    if (!(await claim(db, row, now))) continue;
    try {
      const messageId = await deliver({ to: row.to_address, subject: row.subject, text: row.text_body, html: row.html_body, ...(row.headers ? { headers: JSON.parse(row.headers) as Record<string, string> } : {}) }, messageIdOf(row));
      await db
        .updateTable('outbox')
        .set({ status: 'sent', attempts: row.attempts + 1, sent_at: new Date().toISOString(), message_id: messageId, locked_until: null, last_error: null })
        .where('id', '=', row.id)
        .execute();
      sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      const message = err instanceof Error ? err.message : String(err);
      await db
        .updateTable('outbox')
        .set({
          status: 'queued',
          attempts,
          last_error: message.slice(0, 500),
          next_attempt_at: new Date(Date.now() + retryDelayMs(attempts)).toISOString(),
          locked_until: null,
        })
        .where('id', '=', row.id)
        .execute();
      failed += 1;
    }
  }
  return { sent, failed };
}

let running = false;
let again = false;
let timer: ReturnType<typeof setInterval> | null = null;

async function pass(): Promise<void> {
  if (running) {
    again = true;
    return;
  }
  running = true;
  try {
    do {
      again = false;
      await sendDue(appDb);
    } while (again);
  } catch (err) {
    console.error('[sunreckon] outbox pass failed', err);
  } finally {
    running = false;
  }
}

/** Sends what was just queued, without holding up the request that queued it. */
export function kickOutbox(): void {
  setImmediate(() => void pass());
}

/** Starts the retry loop (idempotent); the timer is unref'd so it never keeps a process alive. */
export function startOutboxWorker(): void {
  if (timer) return;
  const every = Math.max(100, Math.min(env.OUTBOX_RETRY_BASE_MS, 5_000));
  timer = setInterval(() => void pass(), every);
  timer.unref();
  kickOutbox();
}

/** Where the outbox stands, for the /dev/mail page. */
export async function outboxSummary(db: Kysely<DB>, limit = 50): Promise<OutboxRow[]> {
  return db.selectFrom('outbox').selectAll().orderBy('created_at', 'desc').limit(limit).execute();
}

// Only inside the built or dev server (Astro sets import.meta.env.SSR): scripts that import the
// auth module — seed, migrate — must not start sending mail from the database they touch.
// With several worker processes (server.mjs) only the one with SUNRECKON_BACKGROUND=1 keeps the timer;
// any worker may still kick a pass for what it queued (each mail is claimed once, see claim()).
if (import.meta.env?.SSR && process.env.SUNRECKON_BACKGROUND !== '0') startOutboxWorker();
