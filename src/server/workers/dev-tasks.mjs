// The worker pool's entry under `astro dev`, vitest and tsx scripts, where no build has bundled the
// tasks: tsx is registered in the worker thread first, then the TypeScript tasks are loaded.
import { register } from 'tsx/esm/api';

register();
const tasks = await import('./tasks.ts');

export const { sweep, monitorLog, logSeries, handPlan, weatherBand, watchRun } = tasks;
