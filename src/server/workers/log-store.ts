// Saving a monitor log and making its overview, inside the worker pool: the thread opens its own
// connection to the app's database (SQLite in WAL, or PostgreSQL) and inserts the readings in
// batches inside one transaction, so the request thread only waits for the answer.
import type { Kysely } from 'kysely';
import { openDatabase, type OpenDatabase } from '../../../db/client';
import type { DB } from '../../../db/schema';
import { dailyAh, nightBaseline, nightTemperature, type BaselineResult, type DayAh } from '../../domain/monitor/baseline';
import type { ColumnMapping } from '../../domain/monitor/monitor.schema';
import type { Sample } from '../../domain/monitor/parse';
import { downsample, type SeriesPoint } from '../../domain/monitor/series';

/** Where the app's data lives, as the server opened it (DATABASE_URL / DATABASE_PATH). */
export interface DbTarget {
  url?: string;
  path: string;
}

/** What a log page shows before any single reading: made once, stored with the log. */
export interface LogSeries {
  series: SeriesPoint[];
  baseline: BaselineResult;
  nightTempC: number | null;
  days: DayAh[];
}

const open = new Map<string, OpenDatabase>();

/** This thread's own connection (kept for the thread's life; one per database). */
export function threadDb(target: DbTarget): Kysely<DB> {
  const key = `${target.url ?? ''}|${target.path}`;
  let d = open.get(key);
  if (!d) {
    d = openDatabase({ url: target.url, path: target.path, poolMax: 2 });
    open.set(key, d);
  }
  return d.db;
}

/** The overview of a log's readings (time-ordered). */
export function overviewOf(samples: Sample[], timeZone: string): LogSeries {
  return {
    series: downsample(samples),
    baseline: nightBaseline(samples, timeZone),
    nightTempC: nightTemperature(samples, timeZone),
    days: dailyAh(samples, timeZone),
  };
}

/** Readings are inserted in batches of this many rows (6 values each, well under SQLite's variable limit). */
const BATCH = 2000;

export interface NewLog {
  rigId: string;
  crewId: string;
  userId: string;
  name: string;
  original: Uint8Array;
  mapping: ColumnMapping;
  samples: Sample[];
}

/**
 * Saves the file as uploaded, every reading and the overview in one transaction: if any insert
 * fails, neither the log nor any of its readings is left behind. Returns the new log's id.
 */
export async function insertLog(db: Kysely<DB>, input: NewLog): Promise<string> {
  const { samples } = input;
  const first = samples[0];
  const last = samples.at(-1);
  if (!first || !last) throw new Error('a log without readings is never saved');
  const id = crypto.randomUUID();
  const overview = JSON.stringify(overviewOf(samples, input.mapping.timeZone));
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
        created_at: new Date().toISOString(),
        overview,
      })
      .execute();
    for (let i = 0; i < samples.length; i += BATCH) {
      await trx
        .insertInto('monitor_samples')
        .values(samples.slice(i, i + BATCH).map((s) => ({ log_id: id, t: s.t, volts: s.volts, amps: s.amps, soc_pct: s.socPct, temp_c: s.tempC })))
        .execute();
    }
  });
  return id;
}

/** A saved log's overview made from its stored readings (logs saved before overviews were kept), and stored. */
export async function storedOverview(target: DbTarget, logId: string, timeZone: string): Promise<LogSeries> {
  const db = threadDb(target);
  const rows = await db.selectFrom('monitor_samples').select(['t', 'volts', 'amps', 'soc_pct', 'temp_c']).where('log_id', '=', logId).orderBy('t').execute();
  const overview = overviewOf(
    rows.map((r) => ({ t: r.t, volts: r.volts, amps: r.amps, socPct: r.soc_pct, tempC: r.temp_c })),
    timeZone,
  );
  await db.updateTable('monitor_logs').set({ overview: JSON.stringify(overview) }).where('id', '=', logId).where('overview', 'is', null).execute();
  return overview;
}
