// The worker pool's tasks: CPU-heavy work that must never run on the request thread (an upgrade
// sweep, reading and saving a monitor log). No environment: a task that writes is told where the database is. The build bundles this
// file on its own into <build>/server/workers/tasks.mjs (astro.config.mjs), which the pool runs.
import { runSweep, type SweepResult } from '../../domain/proposals/sweep';
import { runHandPlan, type HandPlan, type HandPlanResult } from '../../domain/proposals/sweep-edit';
import { PlanValidationError, type ResolvedPlan } from '../../engine';
import type { Candidates, PriceList } from '../../domain/proposals/proposals.schema';
import { readMonitorLog, saveMonitorLog, type MonitorLogTask, type MonitorLogOutcome, type SaveLogOutcome, type SaveLogTask } from './monitor-task';
import { storedOverview, type DbTarget, type LogSeries } from './log-store';
import { runBandTask } from '../../domain/weather/band-run';
import type { BandTask, RunOutcome } from '../../domain/weather/band';
import { runWatchTask, type WatchRunOutcome, type WatchRunTask } from './watch-task';

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

/** A trip re-run under each weather of its band ("how sure is this?"): its plans built here, one engine run each. */
export function weatherBand(task: BandTask): RunOutcome[] {
  return runBandTask(task);
}

/** One trip watch run: the engine with fresh weather (from the latest check-in during the trip) and the advice. */
export function watchRun(task: WatchRunTask): WatchRunOutcome {
  return runWatchTask(task);
}

/** Reads an uploaded monitor log's form, then decodes, detects and parses it within the caps. */
export function monitorLog(task: MonitorLogTask): Promise<MonitorLogOutcome> {
  return readMonitorLog(task);
}

/** Reads an uploaded log with its confirmed mapping and saves it, readings and overview, on this thread's connection. */
export function saveLog(task: SaveLogTask): Promise<SaveLogOutcome> {
  return saveMonitorLog(task);
}

export interface LogDetailTask {
  db: DbTarget;
  logId: string;
  timeZone: string;
}

/** A saved log's overview made from its readings (a log saved before overviews were kept), and stored. */
export function logSeries(task: LogDetailTask): Promise<LogSeries> {
  return storedOverview(task.db, task.logId, task.timeZone);
}

export type { LogSeries };
