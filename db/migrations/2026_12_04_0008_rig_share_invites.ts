import type { Kysely } from 'kysely';
import { columnTypes } from './types';

// Rig shares waiting to be opened. Sharing a rig answers alike for any address: every share
// starts as a row here, shown to the crew as "invited <address>". When the address belongs to an
// installer account, a rig_grants row with the same id is written at once (the installer can read
// the rig); the share counts as open, and this row goes, when that installer opens their list of
// shared rigs. Addresses of other accounts or of no account stay invited until withdrawn.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('rig_share_invites')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    // As the owner typed it (trimmed); compared without case.
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('invited_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('rig_share_invites_rig').on('rig_share_invites').columns(['rig_id', 'created_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('rig_share_invites').execute();
}
