import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { GrantDto, InstallerRigDto, ShareInviteDto } from '../domain/crews/crews.schema';
import { HttpError } from './errors';
import { grantMail, renderMail, type MailContent } from './mail';
import { enqueueMail, kickOutbox } from './outbox';
import { nowIso } from './versions';

// Installer grants: a crew owner lets one installer account read one rig (its power system,
// loads, trips and saved forecasts). Installers are never crew members; a grant is the only way
// in, and deleting it takes the access away at once. Grants are created and deleted, never edited.

function selectGrants(db: Kysely<DB>) {
  return db
    .selectFrom('rig_grants')
    .innerJoin('user as installer', 'installer.id', 'rig_grants.installer_id')
    .leftJoin('user as granter', 'granter.id', 'rig_grants.granted_by')
    .select([
      'rig_grants.id as id',
      'rig_grants.rig_id as rigId',
      'rig_grants.created_at as createdAt',
      'installer.id as installerId',
      'installer.name as installerName',
      'installer.email as installerEmail',
      'granter.name as grantedBy',
    ]);
}

type GrantSelect = { id: string; rigId: string; createdAt: string; installerId: string; installerName: string; installerEmail: string; grantedBy: string | null };

function toDto(r: GrantSelect): GrantDto {
  return { id: r.id, rigId: r.rigId, installer: { id: r.installerId, name: r.installerName, email: r.installerEmail }, grantedBy: r.grantedBy, createdAt: r.createdAt };
}

/** The installers a rig is shared with who have opened the share, oldest first. */
export async function listGrants(db: Kysely<DB>, rigId: string): Promise<GrantDto[]> {
  const rows = await selectGrants(db)
    .where('rig_grants.rig_id', '=', rigId)
    .where(({ not, exists, selectFrom }) => not(exists(selectFrom('rig_share_invites').select('rig_share_invites.id').whereRef('rig_share_invites.id', '=', 'rig_grants.id'))))
    .orderBy('rig_grants.created_at')
    .orderBy('rig_grants.id')
    .execute();
  return rows.map(toDto);
}

function selectShareInvites(db: Kysely<DB>) {
  return db
    .selectFrom('rig_share_invites')
    .leftJoin('user as inviter', 'inviter.id', 'rig_share_invites.invited_by')
    .select(['rig_share_invites.id as id', 'rig_share_invites.rig_id as rigId', 'rig_share_invites.email as email', 'inviter.name as invitedBy', 'rig_share_invites.created_at as createdAt']);
}

/** The addresses a rig was shared with that have not opened the share yet, oldest first. */
export async function listShareInvites(db: Kysely<DB>, rigId: string): Promise<ShareInviteDto[]> {
  return selectShareInvites(db).where('rig_share_invites.rig_id', '=', rigId).orderBy('rig_share_invites.created_at').orderBy('rig_share_invites.id').execute();
}

/** What every share answers, whoever the address belongs to. */
export const SHARE_SENT_MESSAGE =
  'If this address belongs to an installer account, they get an e-mail now, and the share shows as theirs once they open their rigs on Sunreckon. If it has no account yet, the e-mail invites them to create an installer account, and the share follows. Until then it is listed as invited.';

/** The link an invited address follows: create an installer account, then open the share. */
export function shareSignUpUrl(origin: string, shareId: string): string {
  return `${origin}/sign-up?as=installer&next=${encodeURIComponent(`/installer?share=${shareId}`)}`;
}

/** The e-mail to an address with no account: a crew wants to share a rig; create an installer account to read it. */
export function shareSignUpMail(p: { ownerName: string; rigName: string; crewName: string; url: string }): MailContent {
  // Names are the users' own words: quoted in the body (escaped by renderMail), never in the subject.
  return renderMail({
    subject: 'A crew wants to share a rig with you on Sunreckon',
    greeting: 'Hello,',
    intro: [
      `A crew owner who signs as “${p.ownerName}” wants to share their rig “${p.rigName}” with you as their installer: its power system, loads, trips and saved forecasts, so you can prepare an upgrade proposal.`,
      `The crew’s name, in its members’ own words: “${p.crewName}”.`,
      'Sunreckon has no account for this address yet. Create an installer account with this same address through the link below, and the rig is shared with you as soon as you do.',
    ],
    action: { label: 'Create an installer account', url: p.url },
    outro: ['If you do not know this crew, ignore this e-mail: nothing is shared until you create the account through this link.'],
  });
}

/**
 * Shares a rig with an e-mail address. The answer is the same whether the address belongs to an
 * installer account, a camper account or no account: an "invited" row with the address as typed.
 * Only for an installer account is a grant written (with the invite's id, so withdrawing one
 * withdraws both) and the notice queued, in the same transaction. The invite row goes when the
 * installer opens their list of shared rigs; until then the crew sees every share alike.
 */
export async function createGrant(db: Kysely<DB>, p: { rigId: string; ownerId: string; email: string; origin: string }): Promise<ShareInviteDto> {
  const typed = p.email.trim();
  const email = typed.toLowerCase();
  const id = await db.transaction().execute(async (trx) => {
    const installer = await trx.selectFrom('user').select(['id', 'name', 'kind']).where((eb) => eb(eb.fn('lower', ['email']), '=', email)).executeTakeFirst();
    const isInstaller = installer?.kind === 'installer';
    const pending = await trx.selectFrom('rig_share_invites').select('id').where('rig_id', '=', p.rigId).where((eb) => eb(eb.fn('lower', ['email']), '=', email)).executeTakeFirst();
    let shareId = pending?.id;
    if (!shareId) {
      if (isInstaller) {
        // An opened share is already on the crew's list with this address, so saying so tells nothing new.
        const existing = await trx.selectFrom('rig_grants').select('id').where('rig_id', '=', p.rigId).where('installer_id', '=', installer.id).executeTakeFirst();
        if (existing) {
          const current = toDto(await selectGrants(trx).where('rig_grants.id', '=', existing.id).executeTakeFirstOrThrow());
          throw new HttpError('conflict', `This rig is already shared with ${typed}.`, [{ path: 'email', message: 'already has access to this rig' }], { current });
        }
      }
      shareId = crypto.randomUUID();
      const createdAt = nowIso();
      await trx.insertInto('rig_share_invites').values({ id: shareId, rig_id: p.rigId, email: typed, invited_by: p.ownerId, created_at: createdAt }).execute();
      if (isInstaller) await trx.insertInto('rig_grants').values({ id: shareId, rig_id: p.rigId, installer_id: installer.id, granted_by: p.ownerId, created_at: createdAt }).execute();
    }
    if (!installer) {
      // No account at this address: invite it to create an installer account; the share follows (claimShare).
      const rig = await trx.selectFrom('rigs').innerJoin('crews', 'crews.id', 'rigs.crew_id').select(['rigs.name as rigName', 'crews.name as crewName']).where('rigs.id', '=', p.rigId).executeTakeFirstOrThrow();
      const owner = await trx.selectFrom('user').select('name').where('id', '=', p.ownerId).executeTakeFirstOrThrow();
      await enqueueMail(trx, 'grant', typed, shareSignUpMail({ ownerName: owner.name, rigName: rig.rigName, crewName: rig.crewName, url: shareSignUpUrl(p.origin, shareId) }));
    }
    if (isInstaller) {
      const rig = await trx.selectFrom('rigs').innerJoin('crews', 'crews.id', 'rigs.crew_id').select(['rigs.name as rigName', 'crews.name as crewName']).where('rigs.id', '=', p.rigId).executeTakeFirstOrThrow();
      const owner = await trx.selectFrom('user').select('name').where('id', '=', p.ownerId).executeTakeFirstOrThrow();
      await enqueueMail(trx, 'grant', email, grantMail({ installerName: installer.name, crewName: rig.crewName, rigName: rig.rigName, ownerName: owner.name, url: `${p.origin}/installer` }));
    }
    return shareId;
  });
  kickOutbox();
  return selectShareInvites(db).where('rig_share_invites.id', '=', id).executeTakeFirstOrThrow();
}

/** The rig of a not yet opened share, or null when there is none with this id. */
export async function shareInviteRig(db: Kysely<DB>, id: string): Promise<string | null> {
  const row = await db.selectFrom('rig_share_invites').select('rig_id').where('id', '=', id).executeTakeFirst();
  return row?.rig_id ?? null;
}

/**
 * An installer followed a share link (the e-mail to an address that had no account): when the share
 * still waits, was sent to this installer's own address, and has no grant yet, the grant follows.
 * The link's id proves the mailbox; the address must match too. Anything else changes nothing.
 */
export async function claimShare(db: Kysely<DB>, installer: { id: string; email: string; kind?: string }, shareId: string): Promise<boolean> {
  if (installer.kind !== 'installer') return false;
  return db.transaction().execute(async (trx) => {
    const invite = await trx.selectFrom('rig_share_invites').select(['id', 'rig_id', 'email', 'invited_by']).where('id', '=', shareId).executeTakeFirst();
    if (!invite || invite.email.trim().toLowerCase() !== installer.email.trim().toLowerCase()) return false;
    const taken = await trx.selectFrom('rig_grants').select('id').where((eb) => eb.or([eb('id', '=', invite.id), eb.and([eb('rig_id', '=', invite.rig_id), eb('installer_id', '=', installer.id)])])).executeTakeFirst();
    if (taken) return false;
    await trx.insertInto('rig_grants').values({ id: invite.id, rig_id: invite.rig_id, installer_id: installer.id, granted_by: invite.invited_by, created_at: nowIso() }).execute();
    return true;
  });
}

/** An installer opened their shared rigs: every share waiting on them counts as open. */
export async function openShares(db: Kysely<DB>, installerId: string): Promise<void> {
  await db
    .deleteFrom('rig_share_invites')
    .where('id', 'in', (eb) => eb.selectFrom('rig_grants').select('rig_grants.id').where('rig_grants.installer_id', '=', installerId))
    .execute();
}

/** Takes an installer's access away. */
export async function revokeGrant(db: Kysely<DB>, id: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await trx.deleteFrom('rig_share_invites').where('id', '=', id).execute();
    await trx.deleteFrom('rig_grants').where('id', '=', id).execute();
  });
}

/** The rigs shared with an installer, newest grant first, with enough to pick one. */
export async function listInstallerRigs(db: Kysely<DB>, installerId: string): Promise<InstallerRigDto[]> {
  const rows = await db
    .selectFrom('rig_grants')
    .innerJoin('rigs', 'rigs.id', 'rig_grants.rig_id')
    .innerJoin('crews', 'crews.id', 'rigs.crew_id')
    .leftJoin('user as granter', 'granter.id', 'rig_grants.granted_by')
    .select((eb) => [
      'rig_grants.id as grantId',
      'rigs.id as rigId',
      'rigs.name as rigName',
      'rigs.bank as bank',
      'crews.name as crewName',
      'granter.name as grantedBy',
      'rig_grants.created_at as grantedAt',
      eb.selectFrom('loads').select((e) => e.fn.countAll<number>().as('n')).whereRef('loads.rig_id', '=', 'rigs.id').as('loadCount'),
      eb.selectFrom('trips').select((e) => e.fn.countAll<number>().as('n')).whereRef('trips.rig_id', '=', 'rigs.id').where('trips.deleted_at', 'is', null).as('tripCount'),
    ])
    .where('rig_grants.installer_id', '=', installerId)
    // A deleted rig (restorable by its crew for 30 days) is hidden from installers meanwhile.
    .where('rigs.deleted_at', 'is', null)
    .orderBy('rig_grants.created_at', 'desc')
    .orderBy('rig_grants.id')
    .execute();
  return rows.map(({ bank, loadCount, tripCount, ...r }) => {
    let parsed: InstallerRigDto['bank'] = null;
    try {
      const b = JSON.parse(bank) as Record<string, unknown>;
      parsed = { chemistry: b.chemistry as string | undefined, capacityAh: b.capacityAh as number | undefined, nominalVolts: b.nominalVolts as number | undefined };
    } catch {
      parsed = null;
    }
    return { ...r, bank: parsed, loadCount: Number(loadCount ?? 0), tripCount: Number(tripCount ?? 0) };
  });
}
