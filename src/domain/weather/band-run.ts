// The band's engine runs, for the worker pool (kept apart from band.ts so pages that only read a
// band do not load the engine).
import { CUTOFF_VOLTS, prepareSun, prepareWithSun, simulatePrepared, sunKey, type PreparedSun, type ResolvedPlan } from '../../engine';
import { bandPlans, type BandTask, type RunOutcome } from './band';

/**
 * Runs each plan through the engine: CPU-heavy, for the worker pool. The plans are the trip's
 * validated plan with other weather days of the same shape (band.ts keeps every hour inside the
 * schema's ranges), so they are not validated again. They share places, dates and panels, so the
 * sun is prepared once (the costly part) and only each plan's weather and loads on top of it.
 */
export function runBandPlans(plans: ResolvedPlan[]): RunOutcome[] {
  const suns = new Map<string, PreparedSun>();
  return plans.map((p) => {
    try {
      const key = sunKey(p);
      let sun = suns.get(key);
      if (!sun) {
        sun = prepareSun(p);
        suns.set(key, sun);
      }
      const sim = simulatePrepared(prepareWithSun(sun, p));
      // Usable charge (Revision 2): the floor and the cutoff are judged on it, so the band shows it.
      const usable = Array.from(sim.usablePct, (x) => Math.round(x * 10) / 10);
      let minRow = 0;
      for (let r = 1; r < usable.length; r++) if (usable[r]! < usable[minRow]!) minRow = r;
      return {
        socEndPct: usable,
        minSocPct: usable[minRow] ?? NaN,
        minSocRow: minRow,
        firstCutoffRow: sim.summary.firstCutoffRow,
        ...(sim.summary.firstCutoffRow === null
          ? {}
          : { cutoffBy: sim.cutoffEvent[sim.summary.firstCutoffRow] === CUTOFF_VOLTS ? ('volts' as const) : ('floor' as const) }),
      };
    } catch (err) {
      return { socEndPct: [], minSocPct: NaN, minSocRow: 0, firstCutoffRow: null, error: String(err) };
    }
  });
}

/** A band task (band.ts `bandTask`) built into its plans and run, all in the worker. */
export function runBandTask(task: BandTask): RunOutcome[] {
  return runBandPlans(bandPlans(task));
}
