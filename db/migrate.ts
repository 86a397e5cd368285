import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Migrator, type Kysely } from 'kysely';
import { DEFAULT_DATABASE_PATH, isPostgresUrl, openDatabase } from './client';
import { migrations } from './migrations/index';

/** Applies every pending migration; throws on the first failure. */
export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
  const migrator = new Migrator({
    db,
    provider: { getMigrations: async () => migrations },
    // Migrations written side by side land in any order; each still runs once, in name order when pending together.
    allowUnorderedMigrations: true,
  });
  const { error, results } = await migrator.migrateToLatest();
  if (error) throw error instanceof Error ? error : new Error(String(error));
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName);
}

const isMain = process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (isMain) {
  // DATABASE_URL (postgres://) wins over DATABASE_PATH, as in the server (src/server/db.ts).
  const url = process.env.DATABASE_URL || undefined;
  const file = process.env.DATABASE_PATH || DEFAULT_DATABASE_PATH;
  const where = isPostgresUrl(url) ? 'the PostgreSQL database' : file;
  const store = openDatabase({ url, path: file, poolMax: 1 });
  migrateToLatest(store.db)
    .then((applied) => {
      console.log(applied.length ? `Applied ${applied.length} migration(s) to ${where}: ${applied.join(', ')}` : `Database ${where} is up to date.`);
      return store.close();
    })
    .catch(async (err) => {
      console.error('Migration failed:', err);
      await store.close();
      process.exit(1);
    });
}
