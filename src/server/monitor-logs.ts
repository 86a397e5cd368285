import type { Kysely } from 'kysely';
import type { DB, MonitorLogRow } from '../../db/schema';
import { planTimeline, type ResolvedPlan } from '../engine';
import type { ForecastOverlap, MonitorLogDetail, MonitorLogDto, ColumnMapping, ReadingsPage } from '../domain/monitor/monitor.schema';
import { bankLimits, type LogPreview } from '../domain/monitor/monitor';
import { rigAccess, type Actor, type Need, type RigGrant } from './access';
import { HttpError } from './errors';
import { readLimited } from './http';
import { MAX_BODY_BYTES, SEND_AS, tooLarge } from './workers/monitor-task';
import type { LogSeries } from './workers/log-store';
import { logSeriesInPool, monitorLogInPool, saveLogInPool } from './workers/pool';
import { env } from './env';
import { conflict } from './versions';

// Monitor logs: a battery monitor's CSV (kept as uploaded) and its readings, saved together in one
// transaction, and what they tell (night-time baseline, daily amp-hours, saved forecasts of the
// same dates).

type Row = Omit<MonitorLogRow, 'original' | 'overview'> & { creator_name: string | null };

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

/** Step 1 of an upload, in the worker pool: the detected (or sent) mapping, the first readings and every problem by line and column. */
export async function previewUpload(rig: RigGrant['rig'], upload: RawLogUpload): Promise<LogPreview & { fileName: string; bytes: number }> {
  const out = await monitorLogInPool({ body: upload.body, contentType: upload.contentType, limits: limitsOf(rig), withSamples: false });
  if (!out.ok) throw new HttpError(out.code, out.message, out.issues, out.extra);
  return { ...out.preview, fileName: out.fileName, bytes: out.fileBytes };
}

function limitsOf(rig: RigGrant['rig']) {
  return bankLimits(JSON.parse(rig.bank) as { chemistry: string; capacityAh: number; nominalVolts?: number });
}

/**
 * Step 2: saves the log read with the confirmed mapping. Reading, the readings' insert (one
 * transaction, in batches) and the overview all happen in the worker pool on its own connection;
 * this thread only waits. Any problem refuses the whole file (400, issues `line 12.Voltage (V)`).
 */
export async function saveUpload(db: Kysely<DB>, ctx: { rig: RigGrant['rig']; userId: string }, upload: RawLogUpload): Promise<MonitorLogDto & { warnings: string[] }> {
  const out = await saveLogInPool({
    body: upload.body,
    contentType: upload.contentType,
    limits: limitsOf(ctx.rig),
    db: { url: env.DATABASE_URL, path: env.DATABASE_PATH },
    rigId: ctx.rig.id,
    crewId: ctx.rig.crew_id,
    userId: ctx.userId,
  });
  if (!out.ok) throw new HttpError(out.code, out.message, out.issues, out.extra);
  const row = await rows(db).where('monitor_logs.id', '=', out.id).executeTakeFirstOrThrow();
  return { ...toDto(row), warnings: out.warnings };
}

/** The most readings one page gives, and how many when the caller names no limit. */
export const MAX_READINGS_PAGE = 1000;
export const DEFAULT_READINGS_PAGE = 200;

/** `?after=<ms>&limit=<n>` of a readings page, checked (a 400 naming the field otherwise). */
export function pageFrom(url: URL): { after: number | null; limit: number } {
  const a = url.searchParams.get('after');
  const l = url.searchParams.get('limit');
  let after: number | null = null;
  if (a !== null && a !== '') {
    after = Number(a);
    if (!Number.isSafeInteger(after))
      throw new HttpError('invalid_request', 'after must be the time of the last reading you have, in milliseconds since 1970.', [{ path: 'after', message: 'expected a whole number of milliseconds' }]);
  }
  let limit = DEFAULT_READINGS_PAGE;
  if (l !== null && l !== '') {
    limit = Number(l);
    if (!Number.isInteger(limit) || limit < 1 || limit > MAX_READINGS_PAGE)
      throw new HttpError('invalid_request', `limit must be a whole number from 1 to ${MAX_READINGS_PAGE}.`, [{ path: 'limit', message: `from 1 to ${MAX_READINGS_PAGE}` }]);
  }
  return { after, limit };
}

/** One page of a log's readings in time order, after `after` (exclusive); `next` is the cursor of the following page, null at the end. */
export async function logReadings(db: Kysely<DB>, logId: string, page: { after: number | null; limit: number }): Promise<ReadingsPage> {
  let q = db.selectFrom('monitor_samples').select(['t', 'volts', 'amps', 'soc_pct', 'temp_c']).where('log_id', '=', logId);
  if (page.after !== null) q = q.where('t', '>', page.after);
  const r = await q.orderBy('t').limit(page.limit + 1).execute();
  const items = r.slice(0, page.limit).map((x) => ({ t: x.t, volts: x.volts, amps: x.amps, socPct: x.soc_pct, tempC: x.temp_c }));
  return { items, limit: page.limit, after: page.after, next: r.length > page.limit ? (items.at(-1)?.t ?? null) : null };
}

/** Saved forecasts of the rig that share hours with [fromMs, toMs]. */
async function overlappingForecasts(db: Kysely<DB>, rigId: string, fromMs: number, toMs: number): Promise<ForecastOverlap[]> {
  const list = await db
    .selectFrom('forecasts')
    .innerJoin('trips', 'trips.id', 'forecasts.trip_id')
    .select(['forecasts.id', 'forecasts.name', 'forecasts.trip_id', 'forecasts.plan', 'forecasts.created_at', 'trips.name as trip_name'])
    .where('forecasts.rig_id', '=', rigId)
    .where('forecasts.kind', '=', 'plan')
    .where('trips.deleted_at', 'is', null)
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

/** The log's stored overview; a log saved before overviews were kept gets one made in the worker pool (once). */
async function overview(db: Kysely<DB>, log: MonitorLogDto): Promise<LogSeries> {
  const r = await db.selectFrom('monitor_logs').select('overview').where('id', '=', log.id).executeTakeFirst();
  if (r?.overview) return JSON.parse(r.overview) as LogSeries;
  return logSeriesInPool({ db: { url: env.DATABASE_URL, path: env.DATABASE_PATH }, logId: log.id, timeZone: log.timeZone });
}

/** A log with its thinned overview, what it tells, and one page of its readings. */
export async function logDetail(db: Kysely<DB>, log: MonitorLogDto, page: { after: number | null; limit: number }): Promise<MonitorLogDetail> {
  const [told, forecasts, readings] = await Promise.all([
    overview(db, log),
    overlappingForecasts(db, log.rigId, Date.parse(log.startedAt), Date.parse(log.endedAt)),
    logReadings(db, log.id, page),
  ]);
  return { ...log, ...told, forecasts, readings };
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
