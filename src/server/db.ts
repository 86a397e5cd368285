import { openDatabase } from '../../db/client';
import { env } from './env';

/**
 * The app's one database: PostgreSQL when DATABASE_URL is set, else the SQLite file at
 * DATABASE_PATH. Nothing else decides; the rest of the server sees one Kysely instance.
 */
export const database = openDatabase({ url: env.DATABASE_URL, path: env.DATABASE_PATH, poolMax: env.DATABASE_POOL_MAX });

/** The app's Kysely instance. */
export const db = database.db;
