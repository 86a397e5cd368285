import type { Kysely } from 'kysely';
import type { CaughtMail, DB, OutboxRow } from '../../db/schema';
import { outboxSummary } from './outbox';

/**
 * What the /dev/mail page shows: the newest caught messages (optionally those whose recipient
 * contains `to`) and the outbox rows not sent yet.
 */
export async function devMail(db: Kysely<DB>, to = ''): Promise<{ messages: CaughtMail[]; unsent: OutboxRow[] }> {
  let query = db.selectFrom('caught_mail').selectAll().orderBy('id', 'desc').limit(100);
  if (to) query = query.where('to_address', 'like', `%${to.replace(/[%_]/g, '')}%`);
  const [messages, outbox] = await Promise.all([query.execute(), outboxSummary(db, 30)]);
  return { messages, unsent: outbox.filter((m) => m.status !== 'sent') };
}
