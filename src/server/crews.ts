import type { Kysely } from 'kysely';
import type { DB, CrewRole } from '../../db/schema';

/** Gives a new camper their own crew, as its owner. */
export async function createPersonalCrew(db: Kysely<DB>, userId: string, userName: string): Promise<string> {
  const id = crypto.randomUUID();
  const now = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('crews').values({ id, name: `${userName}'s crew`, created_at: now, updated_at: now }).execute();
    await trx.insertInto('crew_members').values({ crew_id: id, user_id: userId, role: 'owner', created_at: now }).execute();
  });
  return id;
}

export interface Membership {
  crewId: string;
  crewName: string;
  role: CrewRole;
}

/** Lists the crews a user belongs to, oldest first. */
export async function listMemberships(db: Kysely<DB>, userId: string): Promise<Membership[]> {
  const rows = await db
    .selectFrom('crew_members')
    .innerJoin('crews', 'crews.id', 'crew_members.crew_id')
    .select(['crews.id as crewId', 'crews.name as crewName', 'crew_members.role as role'])
    .where('crew_members.user_id', '=', userId)
    .orderBy('crew_members.created_at')
    .execute();
  return rows;
}
