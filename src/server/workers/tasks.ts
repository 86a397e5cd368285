// The worker pool's tasks: CPU-heavy work that must never run on the request thread (an upgrade
// sweep, reading a monitor log). Pure: no database, no environment, no clock. The build bundles this
// file on its own into <build>/server/workers/tasks.mjs (astro.config.mjs), which the pool runs.
import { runSweep, type SweepResult } from '../../domain/proposals/sweep';
import { runHandPlan, type HandPlan, type HandPlanResult } from '../../domain/proposals/sweep-edit';
import { PlanValidationError, type ResolvedPlan } from '../../engine';
import type { Candidates, PriceList } from '../../domain/proposals/proposals.schema';
import Database from 'better-sqlite3';
import { dailyAh, nightBaseline, nightTemperature, type BaselineResult, type DayAh } from '../../domain/monitor/baseline';
import type { Sample } from '../../domain/monitor/parse';
import { downsample, type SeriesPoint } from '../../domain/monitor/series';
import { readMonitorLog, type MonitorLogTask, type MonitorLogOutcome } from './monitor-task';
import { runBandPlans } from '../../domain/weather/band-run';
import type { RunOutcome } from '../../domain/weather/band';

export interface SweepTask {
  forecastId: string;
  plan: ResolvedPlan;
  reserveSocPct: number | null;
  candidates: Candidates;
  prices: PriceList;
}

/**
 * Every combination of the candidates rerun with the engine, as the JSON the route answers (a
 * string crosses threads as one copy; the request thread neither rebuilds nor serialises the
 * options); `ms` is how long the runs took.
 */
export function sweep(task: SweepTask): string {
  const started = performance.now();
  const result: SweepResult = runSweep(task);
  return JSON.stringify({ ...result, forecastId: task.forecastId, ms: Math.round((performance.now() - started) * 10) / 10 });
}

export interface HandPlanTask {
  plan: ResolvedPlan;
  reserveSocPct: number | null;
  edit: HandPlan;
}

/** A hand-edited after-plan run against the saved forecast's trip, judged as a sweep option; the engine's refusal comes back as its issues. */
export function handPlan(task: HandPlanTask): { ok: true; result: HandPlanResult } | { ok: false; message: string; issues: { path: string; message: string }[] } {
  try {
    return { ok: true, result: runHandPlan(task) };
  } catch (e) {
    if (e instanceof PlanValidationError) return { ok: false, message: e.envelope.error.message, issues: e.envelope.issues };
    throw e;
  }
}

/** A trip re-run under each weather of its band ("how sure is this?"): one engine run per plan. */
export function weatherBand(plans: ResolvedPlan[]): RunOutcome[] {
  return runBandPlans(plans);
}

/** Reads an uploaded monitor log's form, then decodes, detects and parses it within the caps. */
export function monitorLog(task: MonitorLogTask): Promise<MonitorLogOutcome> {
  return readMonitorLog(task);
}

export interface LogDetailTask {
  dbPath: string;
  logId: string;
  timeZone: string;
}

export interface LogSeries {
  series: SeriesPoint[];
  baseline: BaselineResult;
  nightTempC: number | null;
  days: DayAh[];
}

const readers = new Map<string, Database.Database>();

/** A read-only connection of this thread's own (WAL: it never holds up the server's writes). */
function reader(dbPath: string): Database.Database {
  let d = readers.get(dbPath);
  if (!d) {
    d = new Database(dbPath, { readonly: true, fileMustExist: true });
    d.pragma('busy_timeout = 5000');
    readers.set(dbPath, d);
  }
  return d;
}

/** A saved log's readings thinned for a chart, its night-time baseline and daily amp-hours, read and computed here. */
export function logSeries(task: LogDetailTask): LogSeries {
  const rows = reader(task.dbPath)
    .prepare('select t, volts, amps, soc_pct, temp_c from monitor_samples where log_id = ? order by t')
    .raw()
    .all(task.logId) as [number, number | null, number | null, number | null, number | null][];
  const samples: Sample[] = rows.map(([t, volts, amps, socPct, tempC]) => ({ t, volts, amps, socPct, tempC }));
  return {
    series: downsample(samples),
    baseline: nightBaseline(samples, task.timeZone),
    nightTempC: nightTemperature(samples, task.timeZone),
    days: dailyAh(samples, task.timeZone),
  };
}
