import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// better-auth's core tables (user, session, account, verification) with its default camelCase
// column names, plus our account `kind`. Written by hand because better-auth's CLI needs Node 22;
// tests/integration/auth-schema.test.ts asks better-auth whether anything is missing.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('user')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('email', 'text', (c) => c.notNull().unique())
    .addColumn('emailVerified', ty.flag, (c) => c.notNull().defaultTo(ty.off))
    .addColumn('image', 'text')
    .addColumn('kind', 'text', (c) => c.notNull().defaultTo('camper').check(sql`kind in ('camper', 'installer')`))
    .addColumn('units', 'text', (c) => c.notNull().defaultTo('metric').check(sql`units in ('metric', 'imperial')`))
    .addColumn('createdAt', ty.authTime, (c) => c.notNull())
    .addColumn('updatedAt', ty.authTime, (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('session')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('expiresAt', ty.authTime, (c) => c.notNull())
    .addColumn('token', 'text', (c) => c.notNull().unique())
    .addColumn('createdAt', ty.authTime, (c) => c.notNull())
    .addColumn('updatedAt', ty.authTime, (c) => c.notNull())
    .addColumn('ipAddress', 'text')
    .addColumn('userAgent', 'text')
    .addColumn('userId', 'text', (c) => c.notNull().references('user.id').onDelete('cascade'))
    .execute();
  await db.schema.createIndex('session_userId_idx').on('session').column('userId').execute();

  await db.schema
    .createTable('account')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('accountId', 'text', (c) => c.notNull())
    .addColumn('providerId', 'text', (c) => c.notNull())
    .addColumn('userId', 'text', (c) => c.notNull().references('user.id').onDelete('cascade'))
    .addColumn('accessToken', 'text')
    .addColumn('refreshToken', 'text')
    .addColumn('idToken', 'text')
    .addColumn('accessTokenExpiresAt', ty.authTime)
    .addColumn('refreshTokenExpiresAt', ty.authTime)
    .addColumn('scope', 'text')
    .addColumn('password', 'text')
    .addColumn('createdAt', ty.authTime, (c) => c.notNull())
    .addColumn('updatedAt', ty.authTime, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('account_userId_idx').on('account').column('userId').execute();

  await db.schema
    .createTable('verification')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('identifier', 'text', (c) => c.notNull())
    .addColumn('value', 'text', (c) => c.notNull())
    .addColumn('expiresAt', ty.authTime, (c) => c.notNull())
    .addColumn('createdAt', ty.authTime, (c) => c.notNull())
    .addColumn('updatedAt', ty.authTime, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('verification_identifier_idx').on('verification').column('identifier').execute();

  // A crew is a household; every rig, load and trip belongs to one. Each new account gets a personal crew.
  await db.schema
    .createTable('crews')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('crew_members')
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('user_id', 'text', (c) => c.notNull().references('user.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('owner', 'editor', 'viewer')`))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addPrimaryKeyConstraint('crew_members_pk', ['crew_id', 'user_id'])
    .execute();
  await db.schema.createIndex('crew_members_user_idx').on('crew_members').column('user_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['crew_members', 'crews', 'verification', 'account', 'session', 'user']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
}
