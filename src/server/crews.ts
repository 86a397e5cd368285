import type { Kysely } from 'kysely';
import type { DB, CrewRole } from '../../db/schema';
import type { CrewDetailDto, CrewSummaryDto, MemberDto } from '../domain/crews/crews.schema';
import { HttpError } from './errors';
import { listInvitations } from './invitations';
import { crewRole, setActive } from './membership';
import { conflict, nowIso } from './versions';

/** Gives a new camper their own crew, as its owner. */
export async function createPersonalCrew(db: Kysely<DB>, userId: string, userName: string): Promise<string> {
  return createCrew(db, userId, `${userName}'s crew`);
}

/** A new crew with the user as its only owner; it becomes their active crew. */
export async function createCrew(db: Kysely<DB>, userId: string, name: string): Promise<string> {
  const id = crypto.randomUUID();
  const now = nowIso();
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('crews').values({ id, name, created_at: now, updated_at: now }).execute();
    await trx.insertInto('crew_members').values({ crew_id: id, user_id: userId, role: 'owner', created_at: now }).execute();
    await setActive(trx, userId, id);
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
    .orderBy('crews.id')
    .execute();
  return rows;
}

/**
 * The crew the user chose last, while they are still in it; else their oldest crew; null for an
 * account in no crew (an installer).
 */
export async function activeCrewId(db: Kysely<DB>, userId: string): Promise<string | null> {
  const chosen = await db
    .selectFrom('active_crews')
    .innerJoin('crew_members', (j) => j.onRef('crew_members.crew_id', '=', 'active_crews.crew_id').onRef('crew_members.user_id', '=', 'active_crews.user_id'))
    .select('active_crews.crew_id')
    .where('active_crews.user_id', '=', userId)
    .executeTakeFirst();
  if (chosen) return chosen.crew_id;
  const first = await listMemberships(db, userId);
  return first[0]?.crewId ?? null;
}

/** Switches the user's active crew; 404 when they are not in it. */
export async function switchActiveCrew(db: Kysely<DB>, userId: string, crewId: string): Promise<void> {
  if (!(await crewRole(db, userId, crewId))) {
    throw new HttpError('not_found', 'You are not in this crew.', [{ path: 'crewId', message: 'not one of your crews' }]);
  }
  await setActive(db, userId, crewId);
}

/** Every crew the user is in, with their role, the member count and which one is active. */
export async function listCrews(db: Kysely<DB>, userId: string): Promise<CrewSummaryDto[]> {
  const rows = await db
    .selectFrom('crew_members as me')
    .innerJoin('crews', 'crews.id', 'me.crew_id')
    .select((eb) => [
      'crews.id as id',
      'crews.name as name',
      'crews.version as version',
      'me.role as role',
      eb.selectFrom('crew_members as m').select((e) => e.fn.countAll<number>().as('n')).whereRef('m.crew_id', '=', 'crews.id').as('memberCount'),
    ])
    .where('me.user_id', '=', userId)
    .orderBy('me.created_at')
    .orderBy('crews.id')
    .execute();
  const active = await activeCrewId(db, userId);
  return rows.map((r) => ({ id: r.id, name: r.name, role: r.role, version: r.version, memberCount: Number(r.memberCount ?? 0), active: r.id === active }));
}

async function members(db: Kysely<DB>, crewId: string, userId: string): Promise<MemberDto[]> {
  const rows = await db
    .selectFrom('crew_members')
    .innerJoin('user', 'user.id', 'crew_members.user_id')
    .select(['user.id as userId', 'user.name as name', 'user.email as email', 'crew_members.role as role', 'crew_members.version as version', 'crew_members.created_at as joinedAt'])
    .where('crew_members.crew_id', '=', crewId)
    .orderBy('crew_members.created_at')
    .orderBy('user.id')
    .execute();
  return rows.map((r) => ({ ...r, isYou: r.userId === userId }));
}

/** A crew with its members, and (for owners) its open and expired invitations. */
export async function crewDetail(db: Kysely<DB>, crewId: string, userId: string, role: CrewRole): Promise<CrewDetailDto> {
  const crew = await db.selectFrom('crews').selectAll().where('id', '=', crewId).executeTakeFirstOrThrow();
  return {
    id: crew.id,
    name: crew.name,
    version: crew.version,
    role,
    active: (await activeCrewId(db, userId)) === crewId,
    members: await members(db, crewId, userId),
    invitations: role === 'owner' ? await listInvitations(db, crewId) : [],
  };
}

/** Renames a crew while it still has the version the caller read (else 409 with the current crew). */
export async function renameCrew(db: Kysely<DB>, crewId: string, name: string, version: number): Promise<{ id: string; name: string; version: number }> {
  return db.transaction().execute(async (trx) => {
    const res = await trx
      .updateTable('crews')
      .set((eb) => ({ name, version: eb('version', '+', 1), updated_at: nowIso() }))
      .where('id', '=', crewId)
      .where('version', '=', version)
      .executeTakeFirst();
    const row = await trx.selectFrom('crews').select(['id', 'name', 'version', 'updated_at as updatedAt']).where('id', '=', crewId).executeTakeFirstOrThrow();
    if (res.numUpdatedRows === 0n) throw conflict('crew', row);
    return row;
  });
}

async function memberRow(db: Kysely<DB>, crewId: string, userId: string) {
  const row = await db
    .selectFrom('crew_members')
    .innerJoin('user', 'user.id', 'crew_members.user_id')
    .select(['user.id as userId', 'user.name as name', 'user.email as email', 'crew_members.role as role', 'crew_members.version as version', 'crew_members.created_at as joinedAt'])
    .where('crew_members.crew_id', '=', crewId)
    .where('crew_members.user_id', '=', userId)
    .executeTakeFirst();
  if (!row) throw new HttpError('not_found', 'This person is not a member of the crew.');
  return row;
}

async function ownerCount(db: Kysely<DB>, crewId: string): Promise<number> {
  const r = await db.selectFrom('crew_members').select((e) => e.fn.countAll<number>().as('n')).where('crew_id', '=', crewId).where('role', '=', 'owner').executeTakeFirstOrThrow();
  return Number(r.n);
}

const LAST_OWNER = 'A crew needs at least one owner: make another member an owner first.';

/** Changes a member's role; the last owner cannot be demoted; 409 with the member when the version is stale. */
export async function changeRole(db: Kysely<DB>, crewId: string, memberId: string, role: CrewRole, version: number, actorId: string): Promise<MemberDto> {
  return db.transaction().execute(async (trx) => {
    const before = await memberRow(trx, crewId, memberId);
    if (before.version !== version) throw conflict('member', { ...before, isYou: before.userId === actorId });
    if (before.role === 'owner' && role !== 'owner' && (await ownerCount(trx, crewId)) <= 1) {
      throw new HttpError('invalid_request', LAST_OWNER, [{ path: 'role', message: LAST_OWNER }]);
    }
    await trx
      .updateTable('crew_members')
      .set((eb) => ({ role, version: eb('version', '+', 1) }))
      .where('crew_id', '=', crewId)
      .where('user_id', '=', memberId)
      .where('version', '=', version)
      .execute();
    const after = await memberRow(trx, crewId, memberId);
    return { ...after, isYou: after.userId === actorId };
  });
}

/** Removes a member (or lets a member leave); the last owner cannot go. */
export async function removeMember(db: Kysely<DB>, crewId: string, memberId: string, version: number, actorId: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const before = await memberRow(trx, crewId, memberId);
    if (before.version !== version) throw conflict('member', { ...before, isYou: before.userId === actorId });
    if (before.role === 'owner' && (await ownerCount(trx, crewId)) <= 1) {
      const message = memberId === actorId ? `You are this crew's only owner, so you cannot leave it. ${LAST_OWNER}` : LAST_OWNER;
      throw new HttpError('invalid_request', message, [{ path: 'userId', message }]);
    }
    await trx.deleteFrom('crew_members').where('crew_id', '=', crewId).where('user_id', '=', memberId).where('version', '=', version).execute();
    await trx.deleteFrom('active_crews').where('user_id', '=', memberId).where('crew_id', '=', crewId).execute();
  });
}
