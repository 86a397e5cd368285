import Database from 'better-sqlite3';
import { existsSync, mkdirSync, renameSync } from 'node:fs';
import path from 'node:path';
import { DEFAULT_DATABASE_PATH } from '../db/client';

/**
 * `npm run db:backup [-- --out <folder>]`: a consistent copy of the live database, taken online with
 * SQLite's backup API (better-sqlite3 `backup()`), so the server keeps serving while it runs.
 * Reads DATABASE_PATH (default db/data/sunreckon.sqlite); writes `sunreckon-<UTC time>.sqlite` into
 * --out, BACKUP_DIR or db/backups. The copy is checked with `PRAGMA integrity_check` before it is
 * given its final name. Restoring is described in the README ("Backups").
 */
export async function backupDatabase(source: string, outDir: string, now = new Date()): Promise<string> {
  if (!existsSync(source)) throw new Error(`No database at ${source}: set DATABASE_PATH.`);
  mkdirSync(outDir, { recursive: true });
  const stamp = now.toISOString().replace(/[:]/g, '-').replace(/\.\d+Z$/, 'Z');
  const target = path.join(outDir, `sunreckon-${stamp}.sqlite`);
  if (existsSync(target)) throw new Error(`${target} already exists.`);
  const partial = `${target}.partial`;
  const db = new Database(source, { fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    // Copies 256 pages per step and yields between steps, so writers are never held up for long.
    await db.backup(partial, { progress: () => 256 });
  } finally {
    db.close();
  }
  const copy = new Database(partial);
  try {
    const check = copy.pragma('integrity_check', { simple: true });
    if (check !== 'ok') throw new Error(`The backup failed its integrity check: ${String(check)}`);
    // A restored file must not need a -wal file beside it.
    copy.pragma('journal_mode = DELETE');
  } finally {
    copy.close();
  }
  renameSync(partial, target);
  return target;
}

function argValue(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

if (import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith('scripts/backup.ts')) {
  if (/^postgres(ql)?:\/\//.test(process.env.DATABASE_URL ?? '')) {
    // On PostgreSQL the database server owns the data; its own tools back it up consistently.
    console.log(
      [
        'DATABASE_URL points at PostgreSQL: this script only copies the embedded SQLite file, so it backs up nothing here.',
        'Back up PostgreSQL with its own tools, e.g. a consistent logical dump while the app runs:',
        '  pg_dump --format=custom --file=sunreckon-$(date -u +%Y%m%dT%H%M%SZ).dump "$DATABASE_URL"',
        'and restore into an empty database with:',
        '  pg_restore --no-owner --dbname="$DATABASE_URL" sunreckon-<time>.dump',
        "(or your provider's snapshots / continuous archiving). Test a restore before you rely on it.",
      ].join('\n'),
    );
    process.exit(2);
  }
  const source = process.env.DATABASE_PATH || DEFAULT_DATABASE_PATH;
  const outDir = argValue('--out') ?? process.env.BACKUP_DIR ?? 'db/backups';
  const started = Date.now();
  backupDatabase(source, outDir)
    .then((file) => console.log(`Backed up ${source} to ${file} in ${Date.now() - started} ms (integrity_check ok).`))
    .catch((err: unknown) => {
      console.error(`Backup failed: ${(err as Error).message}`);
      process.exit(1);
    });
}
