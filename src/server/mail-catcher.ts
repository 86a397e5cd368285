import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { DEFAULT_DATABASE_PATH, isPostgresUrl, openDatabase } from '../../db/client';
import { caughtMailTable } from '../../db/migrations/2026_12_01_0004_crews_mail';
import { ensureCaughtMailHeaders } from '../../db/migrations/2026_12_05_0019_mail_headers';

// The local mail catcher for development, the demo and the tests: a real SMTP server on loopback
// that accepts every message and stores it in the `caught_mail` table of the app's SQLite file,
// where the /dev/mail page (outside production) and the tests read it. It never relays anything.

export interface MailCatcher {
  host: string;
  port: number;
  /** What to put in SMTP_URL. */
  url: string;
  stop(): Promise<void>;
}

function addresses(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return '';
  return (Array.isArray(a) ? a : [a]).flatMap((x) => x.value.map((v) => v.address ?? '')).filter(Boolean).join(', ');
}

/**
 * Starts the catcher on 127.0.0.1 (port 0 picks a free one) writing into the app's database: the
 * PostgreSQL one at `databaseUrl` (or a postgres:// URL given as `dbPath`), else the SQLite file at `dbPath`.
 */
export async function startMailCatcher(opts: { dbPath: string; databaseUrl?: string; port?: number; quiet?: boolean }): Promise<MailCatcher> {
  const store = openDatabase({ url: isPostgresUrl(opts.dbPath) ? opts.dbPath : opts.databaseUrl, path: opts.dbPath, poolMax: 2 });
  const db = store.db;
  // The migration's own definition: the catcher may start before the app's migrations run.
  await caughtMailTable(db).execute(db);
  await ensureCaughtMailHeaders(db);

  const server = new SMTPServer({
    // Loopback only, no accounts, no TLS: a sink for development mail.
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Sunreckon mail catcher',
    size: 5 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address).join(', ');
          await db
            .insertInto('caught_mail')
            .values({
              message_id: mail.messageId ?? null,
              from_address: addresses(mail.from) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
              to_address: addresses(mail.to) || envelopeTo,
              subject: mail.subject ?? '',
              text_body: mail.text ?? '',
              html_body: typeof mail.html === 'string' ? mail.html : '',
              received_at: new Date().toISOString(),
              headers: JSON.stringify(mail.headerLines ?? []),
            })
            .execute();
          if (!opts.quiet) console.log(`[mail catcher] ${envelopeTo}: ${mail.subject ?? ''}`);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (err) => console.error('[mail catcher]', err));
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  return {
    host: '127.0.0.1',
    port,
    url: `smtp://127.0.0.1:${port}`,
    stop: () =>
      new Promise<void>((resolve) => {
        server.close(() => {
          void store.close().then(() => resolve());
        });
      }),
  };
}

// `npx tsx src/server/mail-catcher.ts [port]`: a catcher for `npm run dev` (set SMTP_URL to what it prints).
const isMain = process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (isMain) {
  const port = Number(process.argv[2] ?? 2525);
  startMailCatcher({ dbPath: process.env.DATABASE_PATH || DEFAULT_DATABASE_PATH, databaseUrl: process.env.DATABASE_URL, port })
    .then((c) => console.log(`Mail catcher listening: SMTP_URL=${c.url}  (messages at /dev/mail)`))
    .catch((err) => {
      console.error('The mail catcher could not start:', err);
      process.exit(1);
    });
}
