import { sql } from 'kysely';
import { db } from '../../server/db';
import { json } from '../../server/http';

/** Liveness and database check. */
export async function GET() {
  try {
    await sql`select 1`.execute(db);
    return json({ ok: true, db: 'ok' });
  } catch {
    return json({ ok: false, db: 'error' }, 503);
  }
}
