import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Kysely } from 'kysely';
import type { DB } from '../db/schema';

/**
 * The invented demo crew of product.md: the Reyes-Okafor household's camper account, a second
 * household member, and an installer account. Safe to run twice (existing accounts are kept).
 */
export const DEMO_ACCOUNTS = {
  camper: { name: 'Inés Reyes-Okafor', email: 'ines@reyes-okafor.test', password: 'dusk-and-ember-27', kind: 'camper' as const },
  member: { name: 'Tobi Reyes-Okafor', email: 'tobi@reyes-okafor.test', password: 'dusk-and-ember-27', kind: 'camper' as const },
  installer: { name: 'Wren Calloway', email: 'wren@highline-power.test', password: 'amp-hours-2027', kind: 'installer' as const },
};

export async function seed(): Promise<void> {
  const { db } = await import('../src/server/db');
  const { auth } = await import('../src/server/auth');
  const { migrateToLatest } = await import('../db/migrate');
  await migrateToLatest(db);

  const accountId = async (a: (typeof DEMO_ACCOUNTS)[keyof typeof DEMO_ACCOUNTS]): Promise<string> => {
    const existing = await db.selectFrom('user').select('id').where('email', '=', a.email).executeTakeFirst();
    if (existing) return existing.id;
    const res = await auth.api.signUpEmail({ body: { name: a.name, email: a.email, password: a.password, kind: a.kind } as never });
    return res.user.id;
  };
  const ids = {
    camper: await accountId(DEMO_ACCOUNTS.camper),
    member: await accountId(DEMO_ACCOUNTS.member),
    installer: await accountId(DEMO_ACCOUNTS.installer),
  };

  const crew = await db.selectFrom('crew_members').select('crew_id').where('user_id', '=', ids.camper).where('role', '=', 'owner').orderBy('created_at').executeTakeFirstOrThrow();
  await db.updateTable('crews').set({ name: 'Reyes-Okafor', updated_at: new Date().toISOString() }).where('id', '=', crew.crew_id).execute();

  const { seedDemoRigs } = await import('./seed-demo');
  await seedDemoRigs(db, { crewId: crew.crew_id, ownerId: ids.camper, memberId: ids.member });
  await seedCrewAndGrant(db, { crewId: crew.crew_id, ownerId: ids.camper, memberId: ids.member, installerId: ids.installer });
  await db.destroy();
  console.log(`Demo crew "Reyes-Okafor" ready. Sign in as ${DEMO_ACCOUNTS.camper.email} / ${DEMO_ACCOUNTS.camper.password}`);
}

/** Tobi edits in the Reyes-Okafor crew (and works in it by default); the installer may read the van. Safe to run twice. */
async function seedCrewAndGrant(db: Kysely<DB>, ids: { crewId: string; ownerId: string; memberId: string; installerId: string }): Promise<void> {
  const now = new Date().toISOString();
  await db.insertInto('crew_members').values({ crew_id: ids.crewId, user_id: ids.memberId, role: 'editor', created_at: now }).onConflict((oc) => oc.doNothing()).execute();
  await db
    .insertInto('active_crews')
    .values({ user_id: ids.memberId, crew_id: ids.crewId, updated_at: now })
    .onConflict((oc) => oc.column('user_id').doUpdateSet({ crew_id: ids.crewId, updated_at: now }))
    .execute();
  const van = await db.selectFrom('rigs').select('id').where('crew_id', '=', ids.crewId).where('name', 'like', 'Camper van%').executeTakeFirst();
  if (van) {
    await db
      .insertInto('rig_grants')
      .values({ id: crypto.randomUUID(), rig_id: van.id, installer_id: ids.installerId, granted_by: ids.ownerId, created_at: now })
      .onConflict((oc) => oc.doNothing())
      .execute();
  }
}

const isMain = process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (isMain) {
  seed().catch((err) => {
    console.error('Seeding failed:', err);
    process.exit(1);
  });
}
