import type { Kysely } from 'kysely';
import type { CrewRole, DB } from '../../db/schema';
import { nowIso } from './versions';

// Crew membership rows on their own: crews.ts (the crew pages) and invitations.ts (accepting a
// link) both need them, so neither imports the other both ways (crews -> invitations -> membership).

/** The user's role in a crew, or null when they are not in it. */
export async function crewRole(db: Kysely<DB>, userId: string, crewId: string): Promise<CrewRole | null> {
  const row = await db.selectFrom('crew_members').select('role').where('crew_id', '=', crewId).where('user_id', '=', userId).executeTakeFirst();
  return row?.role ?? null;
}

/** Makes the crew the user's active one (the one /crew manages and where new rigs go). */
export async function setActive(db: Kysely<DB>, userId: string, crewId: string): Promise<void> {
  const now = nowIso();
  await db
    .insertInto('active_crews')
    .values({ user_id: userId, crew_id: crewId, updated_at: now })
    .onConflict((oc) => oc.column('user_id').doUpdateSet({ crew_id: crewId, updated_at: now }))
    .execute();
}

/** Adds a member (an accepted invitation); an existing member keeps their membership. */
export async function addMember(trx: Kysely<DB>, crewId: string, userId: string, role: CrewRole): Promise<boolean> {
  const existing = await crewRole(trx, userId, crewId);
  if (existing) return false;
  await trx.insertInto('crew_members').values({ crew_id: crewId, user_id: userId, role, created_at: nowIso() }).execute();
  await setActive(trx, userId, crewId);
  return true;
}

