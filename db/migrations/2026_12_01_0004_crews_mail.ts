import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// Crew membership gets a version (roles are editable), plus invitations, installer grants on one
// rig, each user's chosen crew, and the outbox every e-mail passes through. The dev mail catcher's
// own table is created here too (IF NOT EXISTS) so the /dev/mail page can always query it; the
// catcher creates it the same way when it starts before the migrations have run.
/**
 * The local SMTP catcher's table (development, demo and tests). Exported so the catcher, which may
 * start before the migrations have run, creates exactly this table.
 */
export function caughtMailTable(db: Kysely<any>) {
  const ty = columnTypes(db);
  return sql`
  create table if not exists caught_mail (
    id ${sql.raw(ty.pg ? 'bigint generated always as identity primary key' : 'integer primary key autoincrement')},
    message_id text,
    from_address text not null,
    to_address text not null,
    subject text not null,
    text_body text not null,
    html_body text not null,
    received_at ${sql.raw(ty.time)} not null
  )`;
}

export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema.alterTable('crew_members').addColumn('version', 'integer', (c) => c.notNull().defaultTo(1)).execute();

  await db.schema
    .createTable('invitations')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('owner', 'editor', 'viewer')`))
    // Only a SHA-256 of the link's token is kept: a copy of the database cannot be used to join a crew.
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('invited_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('expires_at', ty.time, (c) => c.notNull())
    .addColumn('accepted_at', ty.time)
    .addColumn('accepted_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('revoked_at', ty.time)
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('invitations_crew_idx').on('invitations').columns(['crew_id', 'email']).execute();

  await db.schema
    .createTable('rig_grants')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('installer_id', 'text', (c) => c.notNull().references('user.id').onDelete('cascade'))
    .addColumn('granted_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addUniqueConstraint('rig_grants_rig_installer_uq', ['rig_id', 'installer_id'])
    .execute();
  await db.schema.createIndex('rig_grants_installer_idx').on('rig_grants').column('installer_id').execute();

  await db.schema
    .createTable('active_crews')
    .addColumn('user_id', 'text', (c) => c.primaryKey().references('user.id').onDelete('cascade'))
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('outbox')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('to_address', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('text_body', 'text', (c) => c.notNull())
    .addColumn('html_body', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('queued').check(sql`status in ('queued', 'sending', 'sent')`))
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('last_error', 'text')
    .addColumn('next_attempt_at', ty.time, (c) => c.notNull())
    .addColumn('locked_until', ty.time)
    .addColumn('message_id', 'text')
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('sent_at', ty.time)
    .execute();
  await db.schema.createIndex('outbox_due_idx').on('outbox').columns(['status', 'next_attempt_at']).execute();

  await caughtMailTable(db).execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['caught_mail', 'outbox', 'active_crews', 'rig_grants', 'invitations']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
  await db.schema.alterTable('crew_members').dropColumn('version').execute();
}
