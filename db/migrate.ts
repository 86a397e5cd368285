import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Migrator, type Kysely } from 'kysely';
import { createDb, DEFAULT_DATABASE_PATH } from './client';
import { migrations } from './migrations/index';

/** Applies every pending migration; throws on the first failure. */
export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
  const migrator = new Migrator({
    db,
    provider: { getMigrations: async () => migrations },
  });
  const { error, results } = await migrator.migrateToLatest();
  if (error) throw error instanceof Error ? error : new Error(String(error));
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName);
}

const isMain = process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (isMain) {
  const file = process.env.DATABASE_PATH || DEFAULT_DATABASE_PATH;
  const { db } = createDb(file);
  migrateToLatest(db)
    .then((applied) => {
      console.log(applied.length ? `Applied ${applied.length} migration(s) to ${file}: ${applied.join(', ')}` : `Database ${file} is up to date.`);
      return db.destroy();
    })
    .catch(async (err) => {
      console.error('Migration failed:', err);
      await db.destroy();
      process.exit(1);
    });
}
