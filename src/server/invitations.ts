import { createHash, randomBytes } from 'node:crypto';
import type { Kysely } from 'kysely';
import type { CrewRole, DB, InvitationRow } from '../../db/schema';
import type { InvitationDto, InvitationStatus } from '../domain/crews/crews.schema';
import { HttpError } from './errors';
import { invitationMail } from './mail';
import { addMember } from './membership';
import { enqueueMail, kickOutbox } from './outbox';
import { conflict, nowIso } from './versions';

// Invitations to a crew. The e-mailed link carries a random token; only its SHA-256 is stored.
// A link works once, for the invited address only, until it expires.

export const INVITATION_DAYS = 7;

/** A new random token for an invitation link (32 bytes, URL-safe). */
function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** The stored form of a token. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

function statusOf(row: Pick<InvitationRow, 'accepted_at' | 'revoked_at' | 'expires_at'>, now = new Date()): InvitationStatus {
  if (row.accepted_at) return 'accepted';
  if (row.revoked_at) return 'revoked';
  return new Date(row.expires_at) <= now ? 'expired' : 'pending';
}

function toDto(row: InvitationRow & { inviterName?: string | null }): InvitationDto {
  return {
    id: row.id,
    crewId: row.crew_id,
    email: row.email,
    role: row.role,
    status: statusOf(row),
    invitedBy: row.inviterName ?? null,
    expiresAt: row.expires_at,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function selectInvitations(db: Kysely<DB>) {
  return db.selectFrom('invitations').leftJoin('user', 'user.id', 'invitations.invited_by').selectAll('invitations').select('user.name as inviterName');
}

/** A crew's open and expired invitations (accepted and revoked ones drop off the list), newest first. */
export async function listInvitations(db: Kysely<DB>, crewId: string): Promise<InvitationDto[]> {
  const rows = await selectInvitations(db)
    .where('invitations.crew_id', '=', crewId)
    .where('invitations.accepted_at', 'is', null)
    .where('invitations.revoked_at', 'is', null)
    .orderBy('invitations.created_at', 'desc')
    .execute();
  return rows.map(toDto);
}

/** One invitation with the crew it belongs to; 404 when it does not exist. */
export async function invitationById(db: Kysely<DB>, id: string): Promise<InvitationRow> {
  const row = await db.selectFrom('invitations').selectAll().where('id', '=', id).executeTakeFirst();
  if (!row) throw new HttpError('not_found', 'There is no invitation with this id among your crews.');
  return row;
}

async function queueInvitationMail(trx: Kysely<DB>, row: { crew_id: string; email: string; role: CrewRole; expires_at: string }, inviterId: string, token: string, origin: string): Promise<void> {
  const crew = await trx.selectFrom('crews').select('name').where('id', '=', row.crew_id).executeTakeFirstOrThrow();
  const inviter = await trx.selectFrom('user').select('name').where('id', '=', inviterId).executeTakeFirstOrThrow();
  const url = `${origin}/invite/${token}`;
  await enqueueMail(trx, 'invitation', row.email, invitationMail({ crewName: crew.name, inviterName: inviter.name, role: row.role, url, expiresAt: new Date(row.expires_at) }));
}

function expiry(now = new Date()): string {
  return new Date(now.getTime() + INVITATION_DAYS * 24 * 3600_000).toISOString();
}

/**
 * Invites an e-mail address into a crew with a role and queues the e-mail in the same
 * transaction. Refuses members, installer accounts and a second open invitation for one address.
 */
export async function createInvitation(
  db: Kysely<DB>,
  p: { crewId: string; inviterId: string; email: string; role: CrewRole; origin: string },
): Promise<InvitationDto> {
  const email = p.email.trim().toLowerCase();
  const id = crypto.randomUUID();
  await db.transaction().execute(async (trx) => {
    const account = await trx.selectFrom('user').select(['id', 'kind']).where((eb) => eb(eb.fn('lower', ['email']), '=', email)).executeTakeFirst();
    if (account?.kind === 'installer') {
      throw new HttpError('invalid_request', 'This e-mail belongs to an installer account. Installers are never crew members: share a rig with them from the rig’s Installers section instead.', [
        { path: 'email', message: 'belongs to an installer account; share a rig with them instead' },
      ]);
    }
    if (account) {
      const member = await trx.selectFrom('crew_members').select('role').where('crew_id', '=', p.crewId).where('user_id', '=', account.id).executeTakeFirst();
      if (member) {
        throw new HttpError('conflict', `${email} is already in this crew (as ${member.role}).`, [{ path: 'email', message: `already a member of this crew (${member.role})` }]);
      }
    }
    const open = (
      await trx.selectFrom('invitations').selectAll().where('crew_id', '=', p.crewId).where('email', '=', email).where('accepted_at', 'is', null).where('revoked_at', 'is', null).execute()
    ).find((r) => statusOf(r) === 'pending');
    if (open) {
      throw new HttpError('conflict', `${email} already has an open invitation to this crew. Resend it or revoke it.`, [{ path: 'email', message: 'already invited: resend or revoke that invitation' }], {
        current: toDto(open),
      });
    }
    const token = newToken();
    const now = nowIso();
    const row = { id, crew_id: p.crewId, email, role: p.role, token_hash: hashToken(token), invited_by: p.inviterId, expires_at: expiry(), created_at: now, updated_at: now };
    await trx.insertInto('invitations').values(row).execute();
    await queueInvitationMail(trx, row, p.inviterId, token, p.origin);
  });
  kickOutbox();
  return toDto(await selectInvitations(db).where('invitations.id', '=', id).executeTakeFirstOrThrow());
}

/** A fresh link and expiry for an open or expired invitation (the old link stops working), e-mailed again. */
export async function resendInvitation(db: Kysely<DB>, p: { id: string; version: number; actorId: string; origin: string }): Promise<InvitationDto> {
  await db.transaction().execute(async (trx) => {
    const row = await invitationById(trx, p.id);
    const status = statusOf(row);
    if (status === 'accepted' || status === 'revoked') {
      throw new HttpError('invalid_request', `This invitation was ${status}; invite the address again instead.`, [{ path: 'id', message: `invitation ${status}` }]);
    }
    const token = newToken();
    const res = await trx
      .updateTable('invitations')
      .set((eb) => ({ token_hash: hashToken(token), expires_at: expiry(), invited_by: p.actorId, updated_at: nowIso(), version: eb('version', '+', 1) }))
      .where('id', '=', p.id)
      .where('version', '=', p.version)
      .executeTakeFirst();
    if (res.numUpdatedRows === 0n) throw conflict('invitation', toDto(await selectInvitations(trx).where('invitations.id', '=', p.id).executeTakeFirstOrThrow()));
    const updated = await invitationById(trx, p.id);
    await queueInvitationMail(trx, updated, p.actorId, token, p.origin);
  });
  kickOutbox();
  return toDto(await selectInvitations(db).where('invitations.id', '=', p.id).executeTakeFirstOrThrow());
}

/** Withdraws an invitation; its link stops working. */
export async function revokeInvitation(db: Kysely<DB>, id: string, version: number): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const row = await invitationById(trx, id);
    if (row.accepted_at) {
      throw new HttpError('invalid_request', 'This invitation was already accepted: remove the member from the crew instead.', [{ path: 'id', message: 'invitation accepted' }]);
    }
    const res = await trx
      .updateTable('invitations')
      .set((eb) => ({ revoked_at: nowIso(), updated_at: nowIso(), version: eb('version', '+', 1) }))
      .where('id', '=', id)
      .where('version', '=', version)
      .executeTakeFirst();
    if (res.numUpdatedRows === 0n) throw conflict('invitation', toDto(await selectInvitations(trx).where('invitations.id', '=', id).executeTakeFirstOrThrow()));
  });
}

export interface InvitationView {
  status: InvitationStatus | 'unknown';
  crewName?: string;
  inviterName?: string | null;
  email?: string;
  role?: CrewRole;
  expiresAt?: string;
  /** Whether an account with the invited address exists (the page offers sign-in rather than sign-up). */
  hasAccount?: boolean;
}

/** What the /invite/<token> page shows; never throws for a bad token. */
export async function viewInvitation(db: Kysely<DB>, token: string): Promise<InvitationView> {
  if (!token || token.length > 200) return { status: 'unknown' };
  const row = await db
    .selectFrom('invitations')
    .innerJoin('crews', 'crews.id', 'invitations.crew_id')
    .leftJoin('user', 'user.id', 'invitations.invited_by')
    .selectAll('invitations')
    .select(['crews.name as crewName', 'user.name as inviterName'])
    .where('invitations.token_hash', '=', hashToken(token))
    .executeTakeFirst();
  if (!row) return { status: 'unknown' };
  const account = await db.selectFrom('user').select('id').where((eb) => eb(eb.fn('lower', ['email']), '=', row.email)).executeTakeFirst();
  return { status: statusOf(row), crewName: row.crewName, inviterName: row.inviterName, email: row.email, role: row.role, expiresAt: row.expires_at, hasAccount: !!account };
}

const UNUSABLE: Record<Exclude<InvitationStatus, 'pending'>, string> = {
  accepted: 'This invitation link was already used. If you joined, the crew is on your Crew page; otherwise ask the owner for a new invitation.',
  revoked: 'This invitation was withdrawn by the crew’s owner. Ask them for a new one if you still want to join.',
  expired: `This invitation link has expired (links work for ${INVITATION_DAYS} days). Ask the crew’s owner to resend it.`,
};

/**
 * Accepts an invitation for the signed-in user: the link must be open and addressed to their
 * e-mail. Membership and consumption of the token happen in one transaction, so a link joins once.
 */
export async function acceptInvitation(db: Kysely<DB>, token: string, user: { id: string; email: string; kind?: string }): Promise<{ crewId: string; role: CrewRole; joined: boolean }> {
  return db.transaction().execute(async (trx) => {
    const row = await trx.selectFrom('invitations').selectAll().where('token_hash', '=', hashToken(token)).executeTakeFirst();
    if (!row) {
      throw new HttpError('not_found', 'This invitation link is not valid. Check that you opened the whole link from the e-mail, or ask for a new invitation.', [
        { path: 'token', message: 'no invitation with this link' },
      ]);
    }
    const status = statusOf(row);
    if (status !== 'pending') throw new HttpError('invalid_request', UNUSABLE[status], [{ path: 'token', message: `invitation ${status}` }]);
    if (user.email.trim().toLowerCase() !== row.email) {
      throw new HttpError('forbidden', `This invitation is for ${row.email}, but you are signed in as ${user.email}. Sign out, then sign in or create an account with ${row.email}.`, [
        { path: 'token', message: 'invitation addressed to another e-mail' },
      ]);
    }
    if (user.kind === 'installer') {
      throw new HttpError('forbidden', 'Installer accounts cannot join a crew. Ask the crew’s owner to share a rig with you instead.', [{ path: 'token', message: 'installer account' }]);
    }
    const consumed = await trx
      .updateTable('invitations')
      .set((eb) => ({ accepted_at: nowIso(), accepted_by: user.id, updated_at: nowIso(), version: eb('version', '+', 1) }))
      .where('id', '=', row.id)
      .where('accepted_at', 'is', null)
      .where('revoked_at', 'is', null)
      .executeTakeFirst();
    if (consumed.numUpdatedRows === 0n) throw new HttpError('invalid_request', UNUSABLE.accepted, [{ path: 'token', message: 'invitation accepted' }]);
    const joined = await addMember(trx, row.crew_id, user.id, row.role);
    return { crewId: row.crew_id, role: row.role, joined };
  });
}
