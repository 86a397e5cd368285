import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// A proposal becomes a business document: the installer's company and contact, an optional licence
// or registration number, the quote number, issue date and validity, labour lines, removal or
// trade-in of old parts, the tax rate and terms — one JSON text column, parsed by the app
// (src/domain/proposals/document.schema.ts), '{}' for proposals made before (every field defaults).
// The crew owner's acceptance records the name they typed; the time is decided_at.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema.alterTable('proposals').addColumn('document', ty.json, (c) => c.notNull().defaultTo('{}')).execute();
  await db.schema.alterTable('proposals').addColumn('accepted_name', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('proposals').dropColumn('accepted_name').execute();
  await db.schema.alterTable('proposals').dropColumn('document').execute();
}
