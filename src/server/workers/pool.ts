import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { HttpError } from '../errors';
import type { MonitorLogOutcome, MonitorLogTask, SaveLogOutcome, SaveLogTask } from './monitor-task';
import type { HandPlanTask, LogDetailTask, LogSeries, SweepTask, handPlan, sweep } from './tasks';
import type { BandTask, RunOutcome } from '../../domain/weather/band';
import type { WatchRunOutcome, WatchRunTask } from './watch-task';

// The worker pool for CPU-heavy work (upgrade sweeps, reading monitor logs): the request thread only
// hands the task over and waits, so /api/health and every other request keep answering.
// The production build carries the tasks as one file of their own (<build>/server/workers/tasks.mjs,
// bundled by astro.config.mjs); under `astro dev` and vitest dev-tasks.mjs loads the TypeScript through tsx.

/** Tasks waiting for a thread beyond this many are refused (429) instead of piling up in memory. */
const MAX_QUEUE = 32;
/**
 * A thread's heap: enough for the largest task (a 10 MB log's preview holds under 100 MB at its
 * peak, read line by line), small enough that V8 collects early and the server stays within its memory budget.
 */
const WORKER_HEAP_MB = 128;

function workerFile(): string {
  const here = path.dirname(fileURLToPath(import.meta.url));
  // The server chunk that holds this module lives in <build>/server or one of its subfolders.
  for (let dir = here, i = 0; i < 4; i++, dir = path.dirname(dir)) {
    const built = path.join(dir, 'workers', 'tasks.mjs');
    if (existsSync(built)) return pathToFileURL(built).href;
  }
  const dev = path.join(here, 'dev-tasks.mjs');
  if (existsSync(dev)) return pathToFileURL(dev).href;
  throw new Error(`The worker tasks were not found near ${here}: build with "astro build" (it writes server/workers/tasks.mjs).`);
}

let pool: Piscina | null = null;

/** The one pool: one thread fewer than the machine has cores (at least one), so the request thread keeps a core. */
export function workerPool(): Piscina {
  if (!pool) {
    const filename = workerFile();
    const threads = Math.max(1, availableParallelism() - 1);
    pool = new Piscina({
      filename,
      minThreads: 1,
      maxThreads: threads,
      maxQueue: MAX_QUEUE,
      idleTimeout: 60_000,
      resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB, maxYoungGenerationSizeMb: 16 },
    });
  }
  return pool;
}

async function run<T>(name: string, task: unknown, transferList?: ArrayBuffer[]): Promise<T> {
  const p = workerPool();
  if (p.queueSize >= MAX_QUEUE)
    throw new HttpError(
      'rate_limited',
      'The server is busy with other long calculations. Try again in a minute.',
      [],
      {},
      { 'Retry-After': '30' },
    );
  try {
    return (await p.run(task, { name, transferList: transferList as never })) as T;
  } catch (err) {
    // The thread ran out of its heap: the task was too big for one calculation (the pool starts a new thread).
    if ((err as { code?: string }).code === 'ERR_WORKER_OUT_OF_MEMORY') {
      throw new HttpError('payload_too_large', 'This is too large to calculate in one go: send a shorter log or fewer options.');
    }
    throw err;
  }
}

/** An upgrade sweep, off the request thread: the answer's JSON text. */
export function sweepInPool(task: SweepTask): Promise<ReturnType<typeof sweep>> {
  return run('sweep', task);
}

/** A hand-edited after-plan run against a saved forecast's trip, off the request thread. */
export function handPlanInPool(task: HandPlanTask): Promise<ReturnType<typeof handPlan>> {
  return run('handPlan', task);
}

/**
 * Reads an uploaded monitor log (its multipart form and the CSV in it) off the request thread. The
 * body is moved to the thread, not copied (it is unusable here afterwards; a save gets the file back).
 */
export function monitorLogInPool(task: MonitorLogTask): Promise<MonitorLogOutcome> {
  const own = whole(task.body);
  return run('monitorLog', { ...task, body: own }, [own.buffer as ArrayBuffer]);
}

/** The body as the whole of its own buffer (what readLimited gives): then it moves without a copy. */
function whole(body: Uint8Array): Uint8Array {
  return body.byteOffset === 0 && body.byteLength === body.buffer.byteLength ? body : body.slice();
}

/**
 * Reads an uploaded log and saves it, readings and overview, all in the worker pool (its own
 * connection, one transaction): the request thread only waits. The body moves to the thread.
 */
export function saveLogInPool(task: SaveLogTask): Promise<SaveLogOutcome> {
  const own = whole(task.body);
  return run('saveLog', { ...task, body: own }, [own.buffer as ArrayBuffer]);
}

/** A saved log's thinned series and what it tells, read and computed off the request thread. */
export function logSeriesInPool(task: LogDetailTask): Promise<LogSeries> {
  return run('logSeries', task);
}

/** A trip re-run under each weather of its band, off the request thread (the plans are built there too). */
export function weatherBandInPool(task: BandTask): Promise<RunOutcome[]> {
  return run('weatherBand', task);
}

/** One trip watch run (engine and advice), off the serving thread. */
export function watchRunInPool(task: WatchRunTask): Promise<WatchRunOutcome> {
  return run('watchRun', task);
}
