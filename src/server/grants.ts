import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { GrantDto, InstallerRigDto } from '../domain/crews/crews.schema';
import { HttpError } from './errors';
import { grantMail } from './mail';
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

/** The installers a rig is shared with, oldest first. */
export async function listGrants(db: Kysely<DB>, rigId: string): Promise<GrantDto[]> {
  const rows = await selectGrants(db).where('rig_grants.rig_id', '=', rigId).orderBy('rig_grants.created_at').orderBy('rig_grants.id').execute();
  return rows.map(toDto);
}

/**
 * Shares a rig with the installer account that has this e-mail, and queues the notice to them in
 * the same transaction. The address must belong to an installer account.
 */
export async function createGrant(db: Kysely<DB>, p: { rigId: string; ownerId: string; email: string; origin: string }): Promise<GrantDto> {
  const email = p.email.trim().toLowerCase();
  const id = crypto.randomUUID();
  await db.transaction().execute(async (trx) => {
    const installer = await trx.selectFrom('user').select(['id', 'name', 'kind']).where((eb) => eb(eb.fn('lower', ['email']), '=', email)).executeTakeFirst();
    // A camper account and no account answer alike, so the form cannot tell who has an account here.
    if (!installer || installer.kind !== 'installer') {
      throw new HttpError('invalid_request', `There is no installer account with the e-mail ${email}. Ask your installer to create an installer account with it, then share the rig again. To share with a household member, invite them to the crew instead.`, [
        { path: 'email', message: 'no installer account with this e-mail' },
      ]);
    }
    const existing = await trx.selectFrom('rig_grants').select('id').where('rig_id', '=', p.rigId).where('installer_id', '=', installer.id).executeTakeFirst();
    if (existing) {
      const current = toDto(await selectGrants(trx).where('rig_grants.id', '=', existing.id).executeTakeFirstOrThrow());
      throw new HttpError('conflict', `This rig is already shared with ${email}.`, [{ path: 'email', message: 'already has access to this rig' }], { current });
    }
    await trx.insertInto('rig_grants').values({ id, rig_id: p.rigId, installer_id: installer.id, granted_by: p.ownerId, created_at: nowIso() }).execute();
    const rig = await trx.selectFrom('rigs').innerJoin('crews', 'crews.id', 'rigs.crew_id').select(['rigs.name as rigName', 'crews.name as crewName']).where('rigs.id', '=', p.rigId).executeTakeFirstOrThrow();
    const owner = await trx.selectFrom('user').select('name').where('id', '=', p.ownerId).executeTakeFirstOrThrow();
    await enqueueMail(
      trx,
      'grant',
      email,
      grantMail({ installerName: installer.name, crewName: rig.crewName, rigName: rig.rigName, ownerName: owner.name, url: `${p.origin}/installer` }),
    );
  });
  kickOutbox();
  return toDto(await selectGrants(db).where('rig_grants.id', '=', id).executeTakeFirstOrThrow());
}

/** Takes an installer's access away. */
export async function revokeGrant(db: Kysely<DB>, id: string): Promise<void> {
  await db.deleteFrom('rig_grants').where('id', '=', id).execute();
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
      eb.selectFrom('trips').select((e) => e.fn.countAll<number>().as('n')).whereRef('trips.rig_id', '=', 'rigs.id').as('tripCount'),
    ])
    .where('rig_grants.installer_id', '=', installerId)
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
