import type { Kysely } from 'kysely';
import type { DB, MonitorLogRow } from '../../db/schema';
import { planTimeline, type ResolvedPlan } from '../engine';
import type { ForecastOverlap, MonitorLogDetail, MonitorLogDto, ColumnMapping } from '../domain/monitor/monitor.schema';
import type { Sample } from '../domain/monitor/parse';
import { bankLimits, refusalMessage, type LogPreview } from '../domain/monitor/monitor';
import { rigAccess, type Actor, type Need, type RigGrant } from './access';
import { HttpError } from './errors';
import { readLimited } from './http';
import { lineIssues } from './upload';
import { MAX_BODY_BYTES, SEND_AS, tooLarge, unpack } from './workers/monitor-task';
import { logSeriesInPool, monitorLogInPool } from './workers/pool';
import { env } from './env';
import { conflict, nowIso } from './versions';

// Monitor logs: a battery monitor's CSV (kept as uploaded) and its readings, saved together in one
// transaction, and what they tell (night-time baseline, daily amp-hours, saved forecasts of the
// same dates).

type Row = Omit<MonitorLogRow, 'original'> & { creator_name: string | null };

function toDto(r: Row): MonitorLogDto {
  const mapping = JSON.parse(r.mapping) as ColumnMapping;
  return {
    id: r.id,
    rigId: r.rig_id,
    name: r.name,
    bytes: r.original_bytes,
    timeZone: r.time_zone,
    sampleCount: r.sample_count,
    startedAt: r.started_at,
    endedAt: r.ended_at,
    mapping,
    has: { volts: mapping.voltage !== null, amps: mapping.current !== null, soc: mapping.soc !== null, temperature: mapping.temperature !== null },
    createdBy: r.created_by ? { id: r.created_by, name: r.creator_name ?? 'Former member' } : null,
    createdAt: r.created_at,
    version: r.version,
  };
}

const COLUMNS = [
  'monitor_logs.id',
  'monitor_logs.crew_id',
  'monitor_logs.rig_id',
  'monitor_logs.name',
  'monitor_logs.original_bytes',
  'monitor_logs.mapping',
  'monitor_logs.time_zone',
  'monitor_logs.sample_count',
  'monitor_logs.started_at',
  'monitor_logs.ended_at',
  'monitor_logs.version',
  'monitor_logs.created_by',
  'monitor_logs.created_at',
  'user.name as creator_name',
] as const;

function rows(db: Kysely<DB>) {
  return db.selectFrom('monitor_logs').leftJoin('user', 'user.id', 'monitor_logs.created_by').select(COLUMNS);
}

/** The log and its rig, when the user may do `need` with the rig; 404 for a log outside their crews. */
export async function logAccess(db: Kysely<DB>, user: Actor, logId: string, need: Need): Promise<RigGrant & { log: MonitorLogDto }> {
  const row = await rows(db).where('monitor_logs.id', '=', logId).executeTakeFirst();
  const notFound = () => new HttpError('not_found', "There is no monitor log with this id among your crews' rigs.");
  if (!row) throw notFound();
  const access = await rigAccess(db, user, row.rig_id, need, 'monitor log').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound() : e;
  });
  return { ...access, log: toDto(row) };
}

/** A rig's logs, newest first, without their readings. */
export async function listLogs(db: Kysely<DB>, rigId: string): Promise<MonitorLogDto[]> {
  const r = await rows(db).where('monitor_logs.rig_id', '=', rigId).orderBy('monitor_logs.created_at', 'desc').orderBy('monitor_logs.id').execute();
  return r.map(toDto);
}

/** Readings are inserted in batches of this many rows (6 values each, well under SQLite's variable limit). */
const BATCH = 1000;

/**
 * Saves the file as uploaded and every reading in one transaction: if any insert fails, neither
 * the log nor any of its readings is left behind.
 */
export async function createLog(
  db: Kysely<DB>,
  input: { rigId: string; crewId: string; userId: string; name: string; original: Uint8Array; mapping: ColumnMapping; samples: Sample[] },
): Promise<MonitorLogDto> {
  const { samples } = input;
  const first = samples[0];
  const last = samples.at(-1);
  if (!first || !last) throw new HttpError('invalid_request', 'The log has no readings to save.', [{ path: 'file', message: 'no readings' }]);
  const id = crypto.randomUUID();
  await db.transaction().execute(async (trx) => {
    await trx
      .insertInto('monitor_logs')
      .values({
        id,
        crew_id: input.crewId,
        rig_id: input.rigId,
        name: input.name,
        original: input.original,
        original_bytes: input.original.byteLength,
        mapping: JSON.stringify(input.mapping),
        time_zone: input.mapping.timeZone,
        sample_count: samples.length,
        started_at: new Date(first.t).toISOString(),
        ended_at: new Date(last.t).toISOString(),
        created_by: input.userId,
        created_at: nowIso(),
      })
      .execute();
    for (let i = 0; i < samples.length; i += BATCH) {
      await trx
        .insertInto('monitor_samples')
        .values(samples.slice(i, i + BATCH).map((s) => ({ log_id: id, t: s.t, volts: s.volts, amps: s.amps, soc_pct: s.socPct, temp_c: s.tempC })))
        .execute();
      // Let the event loop turn between batches: requests that need no database keep answering.
      await new Promise((resolve) => setImmediate(resolve));
    }
  });
  const row = await rows(db).where('monitor_logs.id', '=', id).executeTakeFirstOrThrow();
  return toDto(row);
}

/** A monitor-log upload as received: the multipart body (at most 10 MB and a little framing) and its type. */
export interface RawLogUpload {
  body: Uint8Array;
  contentType: string;
}

/**
 * The multipart upload of a monitor log (a `file`, the CSV, and text fields `mapping`, `timeZone`,
 * `name`), read within its limit; the form itself is taken apart in the worker pool.
 */
export async function readLogUpload(request: Request): Promise<RawLogUpload> {
  const contentType = (request.headers.get('content-type') ?? '').trim();
  if (!/^multipart\/form-data\b/i.test(contentType)) {
    throw new HttpError('unsupported_media_type', SEND_AS, [{ path: '(headers).content-type', message: `expected multipart/form-data, got ${contentType ? `"${contentType.slice(0, 60)}"` : 'none'}` }]);
  }
  return { body: await readLimited(request, MAX_BODY_BYTES, tooLarge), contentType };
}

/** The uploaded log read as the save would read it, in the worker pool: with the sent mapping, else the detected one. */
async function readLog(rig: RigGrant['rig'], upload: RawLogUpload, withSamples: boolean) {
  const limits = bankLimits(JSON.parse(rig.bank) as { chemistry: string; capacityAh: number; nominalVolts?: number });
  const out = await monitorLogInPool({ body: upload.body, contentType: upload.contentType, limits, withSamples });
  if (!out.ok) throw new HttpError(out.code, out.message, out.issues, out.extra);
  return out;
}

/** Step 1 of an upload: the detected (or sent) mapping, the first readings and every problem by line and column. */
export async function previewUpload(rig: RigGrant['rig'], upload: RawLogUpload): Promise<LogPreview & { fileName: string; bytes: number }> {
  const out = await readLog(rig, upload, false);
  return { ...out.preview, fileName: out.fileName, bytes: out.fileBytes };
}

/**
 * Step 2: saves the log read with the confirmed mapping. Any problem refuses the whole file (400,
 * issues `line 12.Voltage (V)`); else the file and its readings are saved in one transaction.
 */
export async function saveUpload(db: Kysely<DB>, ctx: { rig: RigGrant['rig']; userId: string }, upload: RawLogUpload): Promise<MonitorLogDto & { warnings: string[] }> {
  const { mapping, preview, samples, file, fileName, name } = await readLog(ctx.rig, upload, true);
  if (!mapping) throw new HttpError('invalid_request', 'Confirm the column mapping before saving: send it in the field "mapping".', [{ path: 'mapping', message: 'send the confirmed column mapping' }]);
  if (preview.errorCount > 0 || !samples || !file) {
    throw new HttpError('invalid_request', refusalMessage(preview), lineIssues(preview.errors), { errors: preview.errors, errorCount: preview.errorCount });
  }
  const log = await createLog(db, { rigId: ctx.rig.id, crewId: ctx.rig.crew_id, userId: ctx.userId, name: (name || fileName).slice(0, 120), original: file, mapping, samples: unpack(samples) });
  return { ...log, warnings: preview.warnings };
}

/** Every reading of a log, in time order. */
export async function logSamples(db: Kysely<DB>, logId: string): Promise<Sample[]> {
  const r = await db.selectFrom('monitor_samples').select(['t', 'volts', 'amps', 'soc_pct', 'temp_c']).where('log_id', '=', logId).orderBy('t').execute();
  return r.map((x) => ({ t: x.t, volts: x.volts, amps: x.amps, socPct: x.soc_pct, tempC: x.temp_c }));
}

/** Saved forecasts of the rig that share hours with [fromMs, toMs]. */
async function overlappingForecasts(db: Kysely<DB>, rigId: string, fromMs: number, toMs: number): Promise<ForecastOverlap[]> {
  const list = await db
    .selectFrom('forecasts')
    .innerJoin('trips', 'trips.id', 'forecasts.trip_id')
    .select(['forecasts.id', 'forecasts.name', 'forecasts.trip_id', 'forecasts.plan', 'forecasts.created_at', 'trips.name as trip_name'])
    .where('forecasts.rig_id', '=', rigId)
    .orderBy('forecasts.created_at', 'desc')
    .limit(200)
    .execute();
  const out: ForecastOverlap[] = [];
  for (const f of list) {
    let start: number;
    let end: number;
    try {
      const plan = JSON.parse(f.plan) as ResolvedPlan;
      const tl = planTimeline(plan.stops, plan.drives);
      [start, end] = [tl.startMs, tl.endMs];
    } catch {
      continue;
    }
    const hours = (Math.min(end, toMs) - Math.max(start, fromMs)) / 3_600_000;
    if (hours >= 1) out.push({ id: f.id, name: f.name, tripId: f.trip_id, tripName: f.trip_name, createdAt: f.created_at, overlapHours: Math.floor(hours) });
  }
  return out.sort((a, b) => b.overlapHours - a.overlapHours || b.createdAt.localeCompare(a.createdAt));
}

/** A log with its thinned series and what it tells. */
export async function logDetail(db: Kysely<DB>, log: MonitorLogDto): Promise<MonitorLogDetail> {
  // The readings are read and thinned in the worker pool, on a read-only connection of its own.
  const [told, forecasts] = await Promise.all([
    logSeriesInPool({ dbPath: env.DATABASE_PATH, logId: log.id, timeZone: log.timeZone }),
    overlappingForecasts(db, log.rigId, Date.parse(log.startedAt), Date.parse(log.endedAt)),
  ]);
  return { ...log, ...told, forecasts };
}

/** The file exactly as it was uploaded. */
export async function logOriginal(db: Kysely<DB>, logId: string): Promise<{ name: string; bytes: Uint8Array }> {
  const r = await db.selectFrom('monitor_logs').select(['name', 'original']).where('id', '=', logId).executeTakeFirstOrThrow();
  return { name: r.name, bytes: r.original };
}

/** Removes a log and its readings while it still has the version read (else 409 with the log as it is). */
export async function deleteLog(db: Kysely<DB>, logId: string, version: number): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const res = await trx.deleteFrom('monitor_logs').where('id', '=', logId).where('version', '=', version).executeTakeFirst();
    if (res.numDeletedRows === 0n) {
      const now = await rows(trx).where('monitor_logs.id', '=', logId).executeTakeFirst();
      if (!now) throw new HttpError('not_found', "There is no monitor log with this id among your crews' rigs.");
      throw conflict('monitor log', toDto(now));
    }
  });
}
