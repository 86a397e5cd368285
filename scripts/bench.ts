// `npm run bench`: times the forecast engine on the shapes the product needs (issue 3) and prints
// medians in milliseconds with the machine they ran on. A script, not a timed test.
import os from 'node:os';
import { performance } from 'node:perf_hooks';
import { forecast, prepareTrip, runForecast, simulatePrepared, toForecast, validatePlan, type Plan, type ResolvedPlan } from '../src/engine/index';
import { TEST_PRICES } from '../tests/helpers/prices';
import { at } from '../src/lib/invariant';

import { benchPlan } from './bench-plan';
export { benchPlan };

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? at(s, m) : (at(s, m - 1) + at(s, m)) / 2;
}

interface Timing {
  wall: number;
  cpu: number;
}

/** Median wall-clock and CPU milliseconds of `fn` (CPU time is steadier on a shared machine). */
function time(fn: () => void, runs: number, warmup = 30): Timing {
  for (let i = 0; i < warmup; i++) fn();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c = process.cpuUsage();
    const t = performance.now();
    fn();
    wall.push(performance.now() - t);
    const d = process.cpuUsage(c);
    cpu.push((d.user + d.system) / 1000);
  }
  return { wall: median(wall), cpu: median(cpu) };
}

const ms = (t: Timing, digits = 2) => `${t.wall.toFixed(digits)} ms (CPU ${t.cpu.toFixed(digits)} ms)`;

function resolved(plan: Plan): ResolvedPlan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
console.log(`Machine: ${cpu}, ${os.cpus().length} cores, Node ${process.version}, ${os.platform()} ${os.arch()}, load average ${os.loadavg()[0]?.toFixed(2) ?? 'unknown'}`);

// 1. One 30-day forecast, 3 arrays, 4 chargers, 40 loads, JSON in and out.
const plan30 = benchPlan(30);
const coldStart = performance.now();
runForecast(plan30);
const cold = performance.now() - coldStart;
const r30 = resolved(plan30);
const hours30 = forecast(r30).summary.hoursSimulated;
const tValidate = time(() => void validatePlan(plan30), 60);
const tPrepare = time(() => void prepareTrip(r30), 60);
const prepared30 = prepareTrip(r30);
const tSim = time(() => void simulatePrepared(prepared30), 60);
const sim30 = simulatePrepared(prepared30);
const tFormat = time(() => void toForecast(prepared30, sim30), 60);
const full = time(() => {
  const r = runForecast(plan30);
  if (!r.ok) throw new Error('invalid');
}, 100, 100);
console.log(`\n30-day forecast (${hours30} h, 3 arrays, 4 chargers, 40 loads)`);
console.log(`  runForecast (validate + prepare + simulate + JSON): median ${ms(full)}   [target ≤ 5 ms]`);
console.log(`    first call in a fresh process (cold JIT): ${cold.toFixed(2)} ms
    validate ${tValidate.wall.toFixed(2)} ms · prepare ${tPrepare.wall.toFixed(2)} ms · simulate ${tSim.wall.toFixed(3)} ms · JSON ${tFormat.wall.toFixed(2)} ms`);

// 2. 100 variants differing in bank and array size, prepared once.
const banks = [100, 200, 300, 400, 600];
const scales = [0.5, 0.75, 1, 1.5, 2, 2.5, 3, 3.5, 4, 5];
const variants = banks.flatMap((ah, i) =>
  scales.flatMap((s) => [0, 1].map((j) => ({ bank: { chemistry: j === 0 ? ('lifepo4' as const) : ('agm' as const), capacityAh: ah + i }, arrayWatts: r30.arrays.map((a) => a.ratedWatts * s) }))),
);
const sweep = time(() => {
  const p = prepareTrip(r30);
  for (const v of variants) simulatePrepared(p, v);
}, 20, 3);
const sweepJson = time(() => {
  const p = prepareTrip(r30);
  for (const v of variants) toForecast(p, simulatePrepared(p, v));
}, 10, 2);
console.log(`\n${variants.length} variants of the 30-day trip (bank and array size), prepared once`);
console.log(`  prepare + ${variants.length} simulations: median ${ms(sweep)}   [target ≤ 150 ms]`);
console.log(`  … with the full JSON of each variant: median ${ms(sweepJson)}`);

// 3. 200 combos of a 14-day trip (bank × array × charger), prepared once.
const r14 = resolved(benchPlan(14));
const combos: Parameters<typeof simulatePrepared>[1][] = [];
for (const ah of [100, 200, 300, 400, 500])
  for (const s of [0.5, 1, 1.5, 2, 3])
    for (const alt of [0, 20, 40, 60])
      for (const gen of [false, true])
        combos.push({
          bank: { chemistry: 'lifepo4', capacityAh: ah },
          arrayWatts: r14.arrays.map((a) => a.ratedWatts * s),
          chargers: [
            ...(alt > 0 ? [{ kind: 'alternator' as const, amps: alt }] : []),
            ...(gen ? [{ kind: 'generator' as const, amps: 40 }] : []),
          ],
        });
const combo = time(() => {
  const p = prepareTrip(r14);
  for (const c of combos) simulatePrepared(p, c);
}, 10, 2);
console.log(`\n${combos.length} combos of a 14-day trip (bank × array × alternator × generator), prepared once`);
console.log(`  prepare + ${combos.length} simulations: median ${ms(combo)}   [target < 1000 ms]`);

// ---------------------------------------------------------------------------------------------
// Installer upgrade sweep (issue 7, src/domain/proposals/sweep.ts): the whole POST /api/forecasts/:id/sweep
// computation on a 14-day trip — prepare the plan once plus once per new panel geometry, simulate
// every combination, price and rank. Target: 200 runs in under a second.
{
  const { runSweep } = await import('../src/domain/proposals/sweep');
  const { candidatesSchema, priceListSchema, countCombinations } = await import('../src/domain/proposals/proposals.schema');
  const plan14 = resolved(benchPlan(14));
  const candidates = candidatesSchema.parse({
    banks: [
      { chemistry: 'lifepo4', capacityAh: 400 },
      { chemistry: 'lifepo4', capacityAh: 500 },
      { chemistry: 'lifepo4', capacityAh: 600 },
      { chemistry: 'agm', capacityAh: 600 },
    ],
    panels: [
      { watts: 200, mounting: 'flat' },
      { watts: 400, mounting: 'flat' },
      { watts: 200, mounting: 'tilted' },
      { watts: 200, mounting: 'portable' },
    ],
    dcdcAmps: [20, 40, 60],
    generatorHours: [2],
  });
  const prices = priceListSchema.parse(TEST_PRICES);
  const runs = countCombinations(candidates) + 1;
  const t = time(() => void runSweep({ plan: plan14, reserveSocPct: 30, candidates, prices }), 10, 2);
  const r = runSweep({ plan: plan14, reserveSocPct: 30, candidates, prices });
  console.log(`\nUpgrade sweep of a 14-day trip: ${runs} runs (${r.combinations} options + the saved plan), ${r.prepared} preparations (plan + 3 panel geometries), priced and ranked`);
  console.log(`  runSweep: median ${ms(t)}   [target < 1000 ms]`);
}
