import type { Kysely } from 'kysely';

// Extra header lines a message carries, as JSON ({"List-Unsubscribe": "<https://…>", …}): the
// trip watch's e-mails name their unsubscribe address so a mail program can offer it (RFC 2369)
// and stop them in one click (RFC 8058). Null for every other message. The local mail catcher
// keeps the header lines it received, so the tests read them as a mailbox would.

/**
 * The catcher's `headers` column, added when missing: the catcher may have made its table before
 * the app's migrations ran (it runs this at start too), so neither order fails.
 */
export async function ensureCaughtMailHeaders(db: Kysely<any>): Promise<void> {
  const tables = await db.introspection.getTables();
  const caught = tables.find((t) => t.name === 'caught_mail');
  if (caught && !caught.columns.some((c) => c.name === 'headers')) {
    await db.schema.alterTable('caught_mail').addColumn('headers', 'text').execute();
  }
}

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('outbox').addColumn('headers', 'text').execute();
  await ensureCaughtMailHeaders(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('outbox').dropColumn('headers').execute();
}
