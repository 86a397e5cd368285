import type { Kysely } from 'kysely';
import type { DB, RigRow } from '../../db/schema';
import type { RigChanges, RigDto, RigValues } from '../domain/rigs/rigs.schema';
import { listVisibleRigs } from './access';
import { HttpError } from './errors';
import { conflict, nowIso } from './versions';

/** A rig row as the API shows it. */
export function toRigDto(row: RigRow, canEdit: boolean, canDelete = false): RigDto {
  return {
    id: row.id,
    crewId: row.crew_id,
    name: row.name,
    bank: JSON.parse(row.bank),
    arrays: JSON.parse(row.arrays),
    chargers: JSON.parse(row.chargers),
    inverter: row.inverter === null ? null : JSON.parse(row.inverter),
    payloadKg: row.payload_kg ?? null,
    batterySpaceL: row.battery_space_l ?? null,
    canEdit,
    canDelete,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/** The rigs of every crew the user is in. */
export async function listRigs(db: Kysely<DB>, userId: string): Promise<RigDto[]> {
  return (await listVisibleRigs(db, userId)).map((g) => toRigDto(g.rig, g.canWrite, g.role === 'owner'));
}

async function rigRow(db: Kysely<DB>, id: string): Promise<RigRow> {
  const row = await db.selectFrom('rigs').selectAll().where('id', '=', id).executeTakeFirst();
  if (!row) throw new HttpError('not_found', 'There is no rig with this id among your crews\' rigs.');
  return row;
}

/** Adds a rig to a crew the caller may write to. */
export async function createRig(db: Kysely<DB>, userId: string, crewId: string, input: RigValues, canDelete = false): Promise<RigDto> {
  const now = nowIso();
  const id = crypto.randomUUID();
  await db
    .insertInto('rigs')
    .values({
      id,
      crew_id: crewId,
      name: input.name,
      bank: JSON.stringify(input.bank),
      arrays: JSON.stringify(input.arrays),
      chargers: JSON.stringify(input.chargers),
      inverter: input.inverter === null ? null : JSON.stringify(input.inverter),
      payload_kg: input.payloadKg,
      battery_space_l: input.batterySpaceL,
      created_by: userId,
      created_at: now,
      updated_at: now,
    })
    .execute();
  return toRigDto(await rigRow(db, id), true, canDelete);
}

/** Changes the fields sent, only while the rig still has the version the caller read (else 409 with the current rig). */
export async function updateRig(db: Kysely<DB>, rigId: string, patch: RigChanges, canDelete = false): Promise<RigDto> {
  const { version, ...f } = patch;
  return db.transaction().execute(async (trx) => {
    const res = await trx
      .updateTable('rigs')
      .set((eb) => ({
        ...(f.name !== undefined && { name: f.name }),
        ...(f.bank !== undefined && { bank: JSON.stringify(f.bank) }),
        ...(f.arrays !== undefined && { arrays: JSON.stringify(f.arrays) }),
        ...(f.chargers !== undefined && { chargers: JSON.stringify(f.chargers) }),
        ...(f.inverter !== undefined && { inverter: f.inverter === null ? null : JSON.stringify(f.inverter) }),
        ...(f.payloadKg !== undefined && { payload_kg: f.payloadKg }),
        ...(f.batterySpaceL !== undefined && { battery_space_l: f.batterySpaceL }),
        version: eb('version', '+', 1),
        updated_at: nowIso(),
      }))
      .where('id', '=', rigId)
      .where('version', '=', version)
      .executeTakeFirst();
    const row = await rigRow(trx, rigId);
    if (res.numUpdatedRows === 0n) throw conflict('rig', toRigDto(row, true, canDelete));
    return toRigDto(row, true, canDelete);
  });
}

/**
 * Deletes a rig softly while it still has the version read: it (and with it its loads, trips, saved
 * forecasts, check-ins and logs) is hidden at once and can be restored by a crew owner for 30 days,
 * after which the purge removes it for good (`server/deletion.ts`).
 */
export async function deleteRig(db: Kysely<DB>, rigId: string, version: number, userId: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const res = await trx
      .updateTable('rigs')
      .set((eb) => ({ deleted_at: nowIso(), deleted_by: userId, version: eb('version', '+', 1) }))
      .where('id', '=', rigId)
      .where('version', '=', version)
      .where('deleted_at', 'is', null)
      .executeTakeFirst();
    if (res.numUpdatedRows === 0n) throw conflict('rig', toRigDto(await rigRow(trx, rigId), true, true));
  });
}
