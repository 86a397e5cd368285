import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import type { z } from 'zod';
import type { DB, LoadAction, LoadRow } from '../../db/schema';
import { LIMITS } from '../engine';
import type { LoadDto, loadInputSchema, loadPatchSchema } from '../domain/loads/loads.schema';
import { HttpError } from './errors';
import { conflict, nowIso } from './versions';
import { defined } from '../lib/invariant';

export type LoadValues = z.output<typeof loadInputSchema>;
export type LoadChanges = z.output<typeof loadPatchSchema>;

/** The load fields a camper edits, in the order the activity trail lists them. */
const FIELDS = ['name', 'watts', 'quantity', 'supply', 'windows', 'dutyPct', 'days', 'response', 'setpointC', 'location', 'surgeWatts', 'note', 'standby', 'position'] as const;
type Field = (typeof FIELDS)[number];

type LoadWithAuthor = LoadRow & { added_by_name: string | null; updated_by_name?: string | null };

/** A load row (with its author's name) as the API shows it. */
export function toLoadDto(row: LoadWithAuthor): LoadDto {
  return {
    id: row.id,
    rigId: row.rig_id,
    name: row.name,
    watts: row.watts,
    quantity: row.quantity,
    supply: row.supply,
    windows: JSON.parse(row.windows),
    dutyPct: row.duty_pct,
    days: row.days,
    response: row.response,
    setpointC: row.setpoint_c,
    location: row.location,
    surgeWatts: row.surge_watts,
    note: row.note,
    standby: row.standby === 1,
    position: row.position,
    addedBy: row.added_by === null ? null : { id: row.added_by, name: row.added_by_name ?? '' },
    // Who saved it last (migration 0010), so a stale edit can say whose change it met; null before it was recorded.
    updatedBy: row.updated_by == null ? null : { id: row.updated_by, name: row.updated_by_name ?? '' },
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function withAuthor(db: Kysely<DB>) {
  return db
    .selectFrom('loads')
    .leftJoin('user', 'user.id', 'loads.added_by')
    .leftJoin('user as changer', 'changer.id', 'loads.updated_by')
    .selectAll('loads')
    .select(['user.name as added_by_name', 'changer.name as updated_by_name']);
}

async function loadDto(db: Kysely<DB>, id: string): Promise<LoadDto | null> {
  const row = await withAuthor(db).where('loads.id', '=', id).executeTakeFirst();
  return row ? toLoadDto(row) : null;
}

/** A rig's loads in list order: position, then when they were added. */
export async function listLoads(db: Kysely<DB>, rigId: string): Promise<LoadDto[]> {
  const rows = await withAuthor(db).where('loads.rig_id', '=', rigId).orderBy('loads.position').orderBy('loads.created_at').orderBy('loads.id').execute();
  return rows.map(toLoadDto);
}

/** A row's editable fields as the API shows them, for diffs and snapshots. */
function fieldsOf(row: LoadRow | LoadDto): Record<Field, unknown> {
  const d = 'rig_id' in row ? toLoadDto({ ...row, added_by_name: null }) : row;
  return Object.fromEntries(FIELDS.map((f) => [f, d[f]])) as Record<Field, unknown>;
}

/** Line breaks are stored as \n, as the CSV import reads them, so export → import gives the same text. */
function lf(s: string): string {
  return s.replace(/\r\n?/g, '\n');
}

function columnsOf(v: Partial<LoadValues>) {
  return {
    ...(v.name !== undefined && { name: lf(v.name) }),
    ...(v.watts !== undefined && { watts: v.watts }),
    ...(v.quantity !== undefined && { quantity: v.quantity }),
    ...(v.supply !== undefined && { supply: v.supply }),
    ...(v.windows !== undefined && { windows: JSON.stringify(v.windows) }),
    ...(v.dutyPct !== undefined && { duty_pct: v.dutyPct }),
    ...(v.days !== undefined && { days: v.days }),
    ...(v.response !== undefined && { response: v.response }),
    ...(v.setpointC !== undefined && { setpoint_c: v.setpointC }),
    ...(v.location !== undefined && { location: v.location }),
    ...(v.surgeWatts !== undefined && { surge_watts: v.surgeWatts }),
    ...(v.note !== undefined && { note: lf(v.note) }),
    ...(v.standby !== undefined && { standby: v.standby ? 1 : 0 }),
    ...(v.position !== undefined && { position: v.position }),
  };
}

interface ActivityEntry {
  rigId: string;
  loadId: string;
  userId: string;
  action: LoadAction;
  loadName: string;
  changes: Record<string, [unknown, unknown]>;
  at: string;
}

/** Writes activity rows; callers run it in the transaction of the load write it records. */
async function logActivity(trx: Kysely<DB>, entries: ActivityEntry[]): Promise<void> {
  if (entries.length === 0) return;
  await trx
    .insertInto('load_activity')
    .values(entries.map((e) => ({ id: crypto.randomUUID(), rig_id: e.rigId, load_id: e.loadId, user_id: e.userId, action: e.action, load_name: e.loadName, changes: JSON.stringify(e.changes), at: e.at })))
    .execute();
}

function snapshot(fields: Record<Field, unknown>, side: 'before' | 'after'): Record<string, [unknown, unknown]> {
  return Object.fromEntries(FIELDS.filter((f) => f !== 'position').map((f) => [f, side === 'after' ? [null, fields[f]] : [fields[f], null]]));
}

/** Inserts loads at the end of a rig's list, each with its activity row, all in one transaction. */
async function insertLoads(db: Kysely<DB>, rigId: string, userId: string, values: LoadValues[], action: 'added' | 'imported'): Promise<LoadDto[]> {
  // Joins the caller's transaction when given one (Kysely cannot nest transactions).
  const inTransaction = <T>(fn: (trx: Kysely<DB>) => Promise<T>) => (db.isTransaction ? fn(db) : db.transaction().execute(fn));
  return inTransaction(async (trx) => {
    const { n, last } = (await trx
      .selectFrom('loads')
      .select((eb) => [eb.fn.countAll<number>().as('n'), eb.fn.max('position').as('last')])
      .where('rig_id', '=', rigId)
      .executeTakeFirst()) ?? { n: 0, last: null };
    if (Number(n) + values.length > LIMITS.maxLoads) {
      throw new HttpError('invalid_request', `A rig holds at most ${LIMITS.maxLoads} loads; this one has ${n}.`, [{ path: '(body)', message: `at most ${LIMITS.maxLoads} loads per rig` }]);
    }
    let position = last === null ? 0 : Number(last) + 1;
    const now = nowIso();
    const rows = values.map((v) => ({
      id: crypto.randomUUID(),
      rig_id: rigId,
      name: lf(v.name),
      watts: v.watts,
      quantity: v.quantity,
      supply: v.supply,
      windows: JSON.stringify(v.windows),
      duty_pct: v.dutyPct,
      days: v.days,
      response: v.response,
      setpoint_c: v.setpointC,
      location: v.location,
      surge_watts: v.surgeWatts,
      note: lf(v.note),
      standby: v.standby ? 1 : 0,
      position: v.position ?? position++,
      added_by: userId,
      updated_by: userId,
      created_at: now,
      updated_at: now,
    }));
    await trx.insertInto('loads').values(rows).execute();
    const ids = rows.map((r) => r.id);
    const byId = new Map((await withAuthor(trx).where('loads.id', 'in', ids).execute()).map((r) => [r.id, toLoadDto(r)]));
    const loads = ids.map((id) => byId.get(id)!);
    await logActivity(
      trx,
      loads.map((l) => ({ rigId, loadId: l.id, userId, action, loadName: l.name, changes: snapshot(fieldsOf(l), 'after'), at: now })),
    );
    return loads;
  });
}

/** Adds one load at the end of a rig's list (or at `position`), with an 'added' activity row. */
export async function createLoad(db: Kysely<DB>, rigId: string, userId: string, input: LoadValues): Promise<LoadDto> {
  const [load] = await insertLoads(db, rigId, userId, [input], 'added');
  return defined(load, 'the inserted load');
}

/** Adds every load of an import in one transaction, each with an 'imported' activity row. */
export async function importLoads(db: Kysely<DB>, rigId: string, userId: string, inputs: LoadValues[]): Promise<LoadDto[]> {
  return insertLoads(db, rigId, userId, inputs, 'imported');
}

/**
 * The version of a rig's whole load list: a short digest of every load's id and version, so it
 * changes whenever a load is added, changed or removed. A replacing import sends the one it read.
 */
export function listVersionOf(loads: readonly { id: string; version: number }[]): string {
  const parts = loads.map((l) => `${l.id}:${l.version}`).sort();
  return createHash('sha256').update(parts.join('\n')).digest('hex').slice(0, 20);
}

/** A rig's load list as a replacing import reads it: the loads and the list's version. */
export async function loadList(db: Kysely<DB>, rigId: string): Promise<{ version: string; loads: LoadDto[] }> {
  const loads = await listLoads(db, rigId);
  return { version: listVersionOf(loads), loads };
}

/**
 * Replaces a rig's whole load list with an import, in one transaction, while the list still has the
 * version read (else 409 carrying the list as it is now): every load is removed with a 'removed'
 * activity row, then the imported ones are added with 'imported' rows. Any failure keeps the old list.
 */
export async function replaceLoads(db: Kysely<DB>, rigId: string, userId: string, listVersion: string, inputs: LoadValues[]): Promise<{ removed: number; loads: LoadDto[] }> {
  return db.transaction().execute(async (trx) => {
    const current = await listLoads(trx, rigId);
    if (listVersionOf(current) !== listVersion) throw listConflict(current);
    const now = nowIso();
    for (const l of current) {
      // Each row goes only at the version read: a concurrent edit (on PostgreSQL, a row this
      // transaction waited for) makes the whole replace a 409 instead of removing the newer load.
      const res = await trx.deleteFrom('loads').where('id', '=', l.id).where('version', '=', l.version).executeTakeFirst();
      if (res.numDeletedRows === 0n) throw listConflict(await listLoads(trx, rigId));
    }
    await logActivity(
      trx,
      current.map((l) => ({ rigId, loadId: l.id, userId, action: 'removed' as const, loadName: l.name, changes: snapshot(fieldsOf(l), 'before'), at: now })),
    );
    const loads = await insertLoads(trx, rigId, userId, inputs, 'imported');
    return { removed: current.length, loads };
  });
}

function listConflict(current: LoadDto[]): HttpError {
  return new HttpError('conflict', 'Someone changed this load list since you checked the file. Check it again to see what would be removed now.', [], {
    current: { version: listVersionOf(current), loads: current },
  });
}

/** How many loads a rig has now. */
export async function countLoads(db: Kysely<DB>, rigId: string): Promise<number> {
  const r = await db.selectFrom('loads').select((eb) => eb.fn.countAll<number>().as('n')).where('rig_id', '=', rigId).executeTakeFirst();
  return Number(r?.n ?? 0);
}

function notFound(): HttpError {
  return new HttpError('not_found', "There is no load with this id among your crews' rigs.");
}

/**
 * Changes the fields sent while the load still has the version read (else 409 with the current
 * load), and records what changed, field by field, in the same transaction.
 */
export async function updateLoad(db: Kysely<DB>, loadId: string, userId: string, patch: LoadChanges): Promise<LoadDto> {
  const { version, ...values } = patch;
  return db.transaction().execute(async (trx) => {
    const before = await trx.selectFrom('loads').selectAll().where('id', '=', loadId).executeTakeFirst();
    if (!before) throw notFound();
    const now = nowIso();
    const res = await trx
      .updateTable('loads')
      .set((eb) => ({ ...columnsOf(values), version: eb('version', '+', 1), updated_at: now, updated_by: userId }))
      .where('id', '=', loadId)
      .where('version', '=', version)
      .executeTakeFirst();
    if (res.numUpdatedRows === 0n) throw conflict('load', await loadDto(trx, loadId));
    const after = await trx.selectFrom('loads').selectAll().where('id', '=', loadId).executeTakeFirstOrThrow();
    const [b, a] = [fieldsOf(before), fieldsOf(after)];
    const changes: Record<string, [unknown, unknown]> = {};
    for (const f of FIELDS) if (JSON.stringify(b[f]) !== JSON.stringify(a[f])) changes[f] = [b[f], a[f]];
    if (Object.keys(changes).length) {
      await logActivity(trx, [{ rigId: after.rig_id, loadId, userId, action: 'changed', loadName: after.name, changes, at: now }]);
    }
    return (await loadDto(trx, loadId))!;
  });
}

/** Removes a load while it still has the version read, leaving a 'removed' activity row. */
export async function deleteLoad(db: Kysely<DB>, loadId: string, userId: string, version: number): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const before = await trx.selectFrom('loads').selectAll().where('id', '=', loadId).executeTakeFirst();
    if (!before) throw notFound();
    const res = await trx.deleteFrom('loads').where('id', '=', loadId).where('version', '=', version).executeTakeFirst();
    if (res.numDeletedRows === 0n) throw conflict('load', await loadDto(trx, loadId));
    await logActivity(trx, [{ rigId: before.rig_id, loadId, userId, action: 'removed', loadName: before.name, changes: snapshot(fieldsOf(before), 'before'), at: nowIso() }]);
  });
}
