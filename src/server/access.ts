import type { Kysely } from 'kysely';
import type { CrewRole, DB, LoadRow, ProposalRow, RigRow, TripRow } from '../../db/schema';
import { HttpError } from './errors';

// Authorization, in one place. Every route asks here before it reads or writes a rig, a load, a
// trip or a crew. Access is decided per rig: a load, a trip or a saved forecast is reachable
// exactly when its rig is. A user reaches a rig through their role in the rig's crew, or — for an
// installer account, which is never a crew member — through a grant on that one rig, read-only.
//
//              rig/loads/trips/forecasts   write them   members, invitations, grants, crew name
//   owner      read                        yes          yes
//   editor     read                        yes          no (403)
//   viewer     read                        no (403)     no (403)
//   installer  read (granted rig only)     no (403)     no (403)
//   anyone else: 404 — a row outside the caller's crews and grants is never revealed.
//
// Upgrade sweeps and proposals (issue 7): a granted installer sweeps the rig's saved forecasts and
// writes proposals (the crew gets 403); the installer reads and edits their own proposals only; the
// crew reads a proposal once it is sent (a draft is 404 to them), and only the crew's owners accept
// or decline it.

/**
 * read and write: the rig's data; manage: who may see the rig (installer grants) — crew owners only;
 * delete: deleting (and restoring) a rig or a trip — crew owners only, since it takes saved forecasts
 * and check-ins with it.
 */
export type Need = 'read' | 'write' | 'manage' | 'delete';

/** How a user reaches a rig: their role in the rig's crew, or 'installer' through a grant. */
export type RigRole = CrewRole | 'installer';

/** Which roles may change a rig, its loads, its trips and its forecasts. */
const WRITES: Record<RigRole, boolean> = { owner: true, editor: true, viewer: false, installer: false };

/** The signed-in user, as far as access needs it. */
export interface Actor {
  id: string;
}

export interface RigGrant {
  rig: RigRow;
  role: RigRole;
  canWrite: boolean;
}

/**
 * Rigs the user can see — through crew membership or an installer grant — with the role that
 * lets them: the base of every rig lookup and list.
 */
function visibleRigs(db: Kysely<DB>, userId: string, withDeleted = false) {
  const q = db
    .selectFrom('rigs')
    .leftJoin('crew_members', (j) => j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', userId))
    .leftJoin('rig_grants', (j) => j.onRef('rig_grants.rig_id', '=', 'rigs.id').on('rig_grants.installer_id', '=', userId))
    .where((eb) => eb.or([eb('crew_members.user_id', 'is not', null), eb('rig_grants.id', 'is not', null)]))
    .selectAll('rigs')
    // An installer is never a crew member, so at most one of the two joins matches.
    .select((eb) => eb.fn.coalesce('crew_members.role', eb.val('installer')).$castTo<RigRole>().as('role'));
  // A deleted rig (restorable for 30 days) is hidden from every list and lookup; only the restore path sees it.
  return withDeleted ? q : q.where('rigs.deleted_at', 'is', null);
}

/** Every rig the user can see with their role on it, oldest first. */
export async function listVisibleRigs(db: Kysely<DB>, userId: string): Promise<RigGrant[]> {
  const rows = await visibleRigs(db, userId).orderBy('rigs.created_at').orderBy('rigs.id').execute();
  return rows.map(({ role, ...rig }) => ({ rig, role, canWrite: WRITES[role] }));
}

function notFound(what: string): HttpError {
  return new HttpError('not_found', `There is no ${what} with this id among your crews' rigs.`);
}

function forbidden(what: string, role: RigRole): HttpError {
  if (role === 'installer') {
    return new HttpError('forbidden', `This ${what} was shared with you to read: installers cannot change a crew's rigs, loads, trips or forecasts. Suggest changes in a proposal.`);
  }
  return new HttpError('forbidden', `You can view this ${what} but not change it: your crew role is viewer. Ask the crew's owner to make you an editor.`);
}

function grant(rig: RigRow, role: RigRole, need: Need, what: string): RigGrant {
  const canWrite = WRITES[role];
  if (need === 'write' && !canWrite) throw forbidden(what, role);
  if (need === 'delete' && role !== 'owner') {
    if (role === 'installer' || role === 'viewer') throw forbidden(what, role);
    throw new HttpError('forbidden', `Only the crew's owners can delete a ${what}: it takes its saved forecasts and check-ins with it. Your role is ${role}; ask an owner to delete it.`);
  }
  if (need === 'manage' && role !== 'owner') {
    throw new HttpError('forbidden', `Only the crew's owners can decide who else sees this ${what}${role === 'installer' ? '' : `; your role is ${role}`}.`);
  }
  return { rig, role, canWrite };
}

/** For what only the rig's crew sees (its activity, its installer list): 403 for a granted installer. */
export function crewOnly(access: RigGrant, what: string): RigGrant {
  if (access.role === 'installer') throw new HttpError('forbidden', `The ${what} of a rig is shown to its crew only.`);
  return access;
}

/**
 * The rig, when the user may do `need` with it. Not in the user's crews → 404 (never reveal that
 * it exists); a viewer asking to write → 403.
 */
export async function rigAccess(db: Kysely<DB>, user: Actor, rigId: string, need: Need, what = 'rig'): Promise<RigGrant> {
  const row = await visibleRigs(db, user.id).where('rigs.id', '=', rigId).executeTakeFirst();
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
  const trip = await db.selectFrom('trips').selectAll().where('id', '=', tripId).where('deleted_at', 'is', null).executeTakeFirst();
  if (!trip) throw notFound('trip');
  const access = await rigAccess(db, user, trip.rig_id, need, 'trip').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound('trip') : e;
  });
  return { ...access, trip };
}

/** A rig even while it is deleted, for restoring it: its crew's owners only (404 outside the user's crews and grants). */
export async function deletedRigAccess(db: Kysely<DB>, user: Actor, rigId: string): Promise<RigGrant> {
  const row = await visibleRigs(db, user.id, true).where('rigs.id', '=', rigId).executeTakeFirst();
  if (!row) throw notFound('rig');
  const { role, ...rig } = row;
  return grant(rig, role, 'delete', 'rig');
}

/** A trip even while it (or its rig) is deleted, for restoring it: owners of its rig's crew only. */
export async function deletedTripAccess(db: Kysely<DB>, user: Actor, tripId: string): Promise<RigGrant & { trip: TripRow }> {
  const trip = await db.selectFrom('trips').selectAll().where('id', '=', tripId).executeTakeFirst();
  if (!trip) throw notFound('trip');
  const row = await visibleRigs(db, user.id, true).where('rigs.id', '=', trip.rig_id).executeTakeFirst();
  if (!row) throw notFound('trip');
  const { role, ...rig } = row;
  return { ...grant(rig, role, 'delete', 'trip'), trip };
}

/**
 * The crew a new rig goes into: `crewId` when the user may write there (else 404 / 403 naming
 * `crewId`), or else the user's active crew when they may write there, or else their oldest crew
 * in which they are owner or editor.
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
  const active = await db.selectFrom('active_crews').select('crew_id').where('user_id', '=', user.id).executeTakeFirst();
  const first = memberships.find((x) => x.crew_id === active?.crew_id && WRITES[x.role]) ?? memberships.find((x) => WRITES[x.role]);
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

/**
 * The user's role in a crew when they may `need` it: 'read' for any member, 'manage' (members,
 * invitations, the crew's name) for owners. Not a member → 404; a member who is not an owner → 403.
 */
export async function crewAccess(db: Kysely<DB>, user: Actor, crewId: string, need: 'read' | 'manage', what = 'crew'): Promise<CrewRole> {
  const row = await db.selectFrom('crew_members').select('role').where('crew_id', '=', crewId).where('user_id', '=', user.id).executeTakeFirst();
  if (!row) throw new HttpError('not_found', `There is no ${what} with this id among your crews.`);
  if (need === 'manage' && row.role !== 'owner') {
    throw new HttpError('forbidden', `Only the crew's owners can manage members, invitations and installers; your role is ${row.role}.`);
  }
  return row.role;
}

/** An installer grant, for taking it away: owners of the rig's crew only; 404 to anyone else but the installer. */
export async function grantAccess(db: Kysely<DB>, user: Actor, grantId: string): Promise<{ id: string; rigId: string }> {
  const row = await db
    .selectFrom('rig_grants')
    .innerJoin('rigs', 'rigs.id', 'rig_grants.rig_id')
    .leftJoin('crew_members', (j) => j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', user.id))
    .select(['rig_grants.id as id', 'rig_grants.rig_id as rigId', 'rig_grants.installer_id as installerId', 'crew_members.role as role'])
    .where('rig_grants.id', '=', grantId)
    .executeTakeFirst();
  if (!row || (!row.role && row.installerId !== user.id)) throw new HttpError('not_found', 'There is no installer access with this id among your rigs.');
  if (row.role !== 'owner') {
    throw new HttpError('forbidden', `Only the crew's owners can take an installer's access away${row.role ? `; your role is ${row.role}` : ''}.`);
  }
  return { id: row.id, rigId: row.rigId };
}

/** Sweeps and proposals are an installer's work: a crew member on the rig gets 403. */
export function installerOnly(access: RigGrant, what: string): RigGrant {
  if (access.role !== 'installer') {
    throw new HttpError('forbidden', `${what} are prepared by the installer the crew shares this rig with; crew members read the proposals they send.`);
  }
  return access;
}

/** What a user does with a proposal: read it, edit/send/delete it (its installer), accept or decline it (the crew's owners). */
export type ProposalNeed = 'read' | 'write' | 'decide';

/**
 * A proposal and its rig, when the user may do `need` with it. Another crew, an installer without a
 * grant on the rig, another installer's proposal, or a draft the crew has not been sent → 404; a
 * crew member editing, or anyone but an owner deciding → 403.
 */
export async function proposalAccess(db: Kysely<DB>, user: Actor, proposalId: string, need: ProposalNeed): Promise<RigGrant & { proposal: ProposalRow }> {
  const missing = () => new HttpError('not_found', 'There is no proposal with this id among your rigs.');
  const proposal = await db.selectFrom('proposals').selectAll().where('id', '=', proposalId).executeTakeFirst();
  if (!proposal) throw missing();
  const access = await rigAccess(db, user, proposal.rig_id, 'read').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? missing() : e;
  });
  if (access.role === 'installer') {
    if (proposal.installer_id !== user.id) throw missing();
    if (need === 'decide') throw new HttpError('forbidden', 'The crew’s owner accepts or declines a proposal, not its installer.');
    return { ...access, proposal };
  }
  if (proposal.status === 'draft') throw missing();
  if (need === 'write') throw new HttpError('forbidden', 'Only the installer who wrote this proposal can change it.');
  if (need === 'decide' && access.role !== 'owner') {
    throw new HttpError('forbidden', `Only the crew’s owners can accept or decline a proposal; your role is ${access.role}.`);
  }
  return { ...access, proposal };
}
