import type { Kysely } from 'kysely';
import type { CrewRole, DB, LoadRow, RigRow, TripRow } from '../../db/schema';
import { HttpError } from './errors';

// Authorization, in one place. Every route asks here before it reads or writes a rig, a load or
// a trip. Access is decided per rig: a load or a trip is reachable exactly when its rig is.
// A later issue adds installer grants (read-only on one rig): extend `visibleRigs` with the grant
// and give `RigRole` an 'installer' entry in WRITES — nothing else needs to change.

export type Need = 'read' | 'write';

/** How a user reaches a rig: through their role in the rig's crew. */
export type RigRole = CrewRole;

/** Which roles may change a rig, its loads and its trips. */
const WRITES: Record<RigRole, boolean> = { owner: true, editor: true, viewer: false };

/** The signed-in user, as far as access needs it. */
export interface Actor {
  id: string;
}

export interface RigGrant {
  rig: RigRow;
  role: RigRole;
  canWrite: boolean;
}

/** Rigs the user can see, joined with the role that lets them: the base of every rig lookup and list. */
function visibleRigs(db: Kysely<DB>, userId: string) {
  return db
    .selectFrom('rigs')
    .innerJoin('crew_members', (j) => j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', userId));
}

/** Every rig the user can see with their role on it, oldest first. */
export async function listVisibleRigs(db: Kysely<DB>, userId: string): Promise<RigGrant[]> {
  const rows = await visibleRigs(db, userId).selectAll('rigs').select('crew_members.role as role').orderBy('rigs.created_at').orderBy('rigs.id').execute();
  return rows.map(({ role, ...rig }) => ({ rig, role, canWrite: WRITES[role] }));
}

function notFound(what: string): HttpError {
  return new HttpError('not_found', `There is no ${what} with this id among your crews' rigs.`);
}

function forbidden(what: string): HttpError {
  return new HttpError('forbidden', `You can view this ${what} but not change it: your crew role is viewer. Ask the crew's owner to make you an editor.`);
}

function grant(rig: RigRow, role: RigRole, need: Need, what: string): RigGrant {
  const canWrite = WRITES[role];
  if (need === 'write' && !canWrite) throw forbidden(what);
  return { rig, role, canWrite };
}

/**
 * The rig, when the user may do `need` with it. Not in the user's crews → 404 (never reveal that
 * it exists); a viewer asking to write → 403.
 */
export async function rigAccess(db: Kysely<DB>, user: Actor, rigId: string, need: Need, what = 'rig'): Promise<RigGrant> {
  const row = await visibleRigs(db, user.id).selectAll('rigs').select('crew_members.role as role').where('rigs.id', '=', rigId).executeTakeFirst();
  if (!row) throw notFound(what);
  const { role, ...rig } = row;
  return grant(rig, role, need, what);
}

/** A load and its rig, when the user may do `need` with the rig's loads. */
export async function loadAccess(db: Kysely<DB>, user: Actor, loadId: string, need: Need): Promise<RigGrant & { load: LoadRow }> {
  const load = await db.selectFrom('loads').selectAll().where('id', '=', loadId).executeTakeFirst();
  if (!load) throw notFound('load');
  const access = await rigAccess(db, user, load.rig_id, need, 'load').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound('load') : e;
  });
  return { ...access, load };
}

/** A trip and its rig, when the user may do `need` with the rig's trips. */
export async function tripAccess(db: Kysely<DB>, user: Actor, tripId: string, need: Need): Promise<RigGrant & { trip: TripRow }> {
  const trip = await db.selectFrom('trips').selectAll().where('id', '=', tripId).executeTakeFirst();
  if (!trip) throw notFound('trip');
  const access = await rigAccess(db, user, trip.rig_id, need, 'trip').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound('trip') : e;
  });
  return { ...access, trip };
}

/**
 * The crew a new rig goes into: `crewId` when the user may write there (else 404 / 403 naming
 * `crewId`), or else the user's oldest crew in which they are owner or editor.
 */
export async function crewForNewRig(db: Kysely<DB>, user: Actor, crewId?: string): Promise<string> {
  const memberships = await db
    .selectFrom('crew_members')
    .select(['crew_id', 'role'])
    .where('user_id', '=', user.id)
    .orderBy('created_at')
    .orderBy('crew_id')
    .execute();
  if (crewId !== undefined) {
    const m = memberships.find((x) => x.crew_id === crewId);
    if (!m) throw new HttpError('not_found', 'You are not in this crew.', [{ path: 'crewId', message: 'not one of your crews' }]);
    if (!WRITES[m.role]) throw new HttpError('forbidden', 'Your role in this crew is viewer: you cannot add rigs to it.', [{ path: 'crewId', message: 'you are a viewer in this crew' }]);
    return m.crew_id;
  }
  const first = memberships.find((x) => WRITES[x.role]);
  if (!first) throw new HttpError('forbidden', 'You are not an owner or editor of any crew, so there is nowhere to add a rig.', [{ path: 'crewId', message: 'no crew you can add rigs to' }]);
  return first.crew_id;
}

/** `rigAccess` for a rig named in a request field (a trip's `rigId`): the 404 / 403 name that field. */
export async function rigAccessByField(db: Kysely<DB>, user: Actor, rigId: string, need: Need, field = 'rigId'): Promise<RigGrant> {
  try {
    return await rigAccess(db, user, rigId, need);
  } catch (e) {
    if (e instanceof HttpError && (e.code === 'not_found' || e.code === 'forbidden')) {
      throw new HttpError(e.code, e.message, [{ path: field, message: e.code === 'not_found' ? 'not one of your rigs' : 'you can only view this rig' }]);
    }
    throw e;
  }
}
