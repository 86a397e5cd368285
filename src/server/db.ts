import { createDb } from '../../db/client';
import { env } from './env';

/** The app's one Kysely instance; better-auth uses the same connection. */
export const { db, sqlite } = createDb(env.DATABASE_PATH);
