// `npm run bench` (weather part): how long filling a 5-stop trip's weather takes against the
// local fake weather service, cold (empty cache: every request goes over HTTP and is decoded by
// the SDK) and cached (answered from SQLite). Prints medians in milliseconds; a script, not a test.
// Targets from issue 14: ≤ 300 ms cold, ≤ 20 ms cached. Then the "how sure is this?" band of the
// 30-day / 40-load benchmark trip under its ten past years (target ≤ 50 ms): the engine runs the
// worker pool does (the sun prepared once, then each year's weather and a simulation) and the band
// and sentence.
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { createDb } from '../db/client';
import { migrateToLatest } from '../db/migrate';
import type { StopLike } from '../src/domain/weather/weather';
import { fillTripWeather, type WeatherConfig } from '../src/server/weather';
import { startFakeWeather } from './fakes/weather';
import { validatePlan, forecast } from '../src/engine/index';
import { bandTask, buildBand, yearPlans } from '../src/domain/weather/band';
import { runBandPlans } from '../src/domain/weather/band-run';
import { benchPlan } from './bench-plan';

const RUNS = 9;
const DAY = 86_400_000;
const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** Five stops of two nights each, starting `startInDays` from today, across three zones. */
function trip(startInDays: number): StopLike[] {
  const zones = ['America/Denver', 'America/Denver', 'America/Phoenix', 'America/Los_Angeles', 'America/Los_Angeles'];
  return zones.map((timeZone, i) => ({
    name: `Stop ${i + 1}`,
    lat: 38 + i * 0.7,
    lon: -108 - i * 1.9,
    timeZone,
    arrive: iso(Date.now() + (startInDays + i * 2) * DAY),
    nights: 2,
  }));
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const figure = (xs: number[]) => `${median(xs).toFixed(1).padStart(6)} ms (${Math.min(...xs).toFixed(1)})`;

async function main(): Promise<void> {
  const fake = await startFakeWeather({ quiet: true });
  const dir = mkdtempSync(path.join(os.tmpdir(), 'sunreckon-bench-weather-'));
  const { db } = createDb(path.join(dir, 'bench.sqlite'));
  await migrateToLatest(db);
  const config: WeatherConfig = { forecastUrl: fake.forecastUrl, archiveUrl: fake.archiveUrl, timeoutMs: 5000 };
  console.log(
    `Weather fill for a 5-stop trip from the local fake (${os.cpus()[0]?.model ?? 'cpu'}, ${os.cpus().length} cores, load ${os.loadavg()[0]!.toFixed(1)}, Node ${process.version}), median (best) of ${RUNS}:`,
  );
  for (const [label, stops] of [
    ['near trip (forecast, 5 requests)', trip(2)],
    ['far trip (10 past years, 50 requests)', trip(60)],
  ] as const) {
    const cold: number[] = [];
    const cached: number[] = [];
    for (let r = 0; r < RUNS; r++) {
      await db.deleteFrom('weather_cache').execute();
      let t = performance.now();
      const first = await fillTripWeather(db, stops, config);
      cold.push(performance.now() - t);
      if (first.status !== 'ok') throw new Error(`fill failed: ${first.message}`);
      t = performance.now();
      const again = await fillTripWeather(db, stops, config);
      cached.push(performance.now() - t);
      if (again.requests.fromCache !== again.requests.total) throw new Error('the second fill was not answered from the cache');
    }
    console.log(`  ${label.padEnd(40)} cold ${figure(cold)}, target ≤ 300 ms   cached ${figure(cached)}, target ≤ 20 ms`);
  }
  // A long trip (4 stops × 15 nights, far: ten past years) answered from the cache: how long the
  // fill keeps other requests waiting at most (a setImmediate probe's longest gap), and in all.
  const long: StopLike[] = [0, 1, 2, 3].map((i) => ({
    name: `Long camp ${i + 1}`,
    lat: 37 + i,
    lon: -111 + i,
    timeZone: i < 2 ? 'America/Denver' : 'America/Phoenix',
    arrive: iso(Date.now() + (120 + i * 15) * DAY),
    nights: 15,
  }));
  await fillTripWeather(db, long, config);
  const blocks: number[] = [];
  const totals: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    let longest = 0;
    let last = performance.now();
    let running = true;
    const probe = () => {
      const t = performance.now();
      longest = Math.max(longest, t - last);
      last = t;
      if (running) setImmediate(probe);
    };
    setImmediate(probe);
    const t0 = performance.now();
    const f = await fillTripWeather(db, long, config);
    totals.push(performance.now() - t0);
    running = false;
    await new Promise((res) => setImmediate(res));
    blocks.push(longest);
    if (f.requests.fromCache !== f.requests.total || f.pastYears.length !== 10) throw new Error('the long trip was not answered from the cache');
  }
  console.log(`  ${'60-night far trip, cached'.padEnd(40)} ${figure(totals)} in all; longest wait it causes another request ${figure(blocks)}, target a few ms`);
  // The band: the benchmark trip with no typed weather, three months or more ahead (a far trip).
  const base = benchPlan(30);
  const stops = base.stops.map((st) => ({ ...st, weather: [] })) as unknown as StopLike[];
  const fill = await fillTripWeather(db, stops, config);
  if (fill.kind !== 'far' || fill.pastYears.length !== 10) throw new Error(`expected ten past years, got ${fill.pastYears.length} (${fill.message})`);
  const checked = validatePlan({ ...base, stops: base.stops.map((st, i) => ({ ...st, weather: fill.stops[i]!.weather })) });
  if (!checked.ok) throw new Error(checked.envelope.error.message);
  const times = forecast(checked.plan).hourly.map((r) => r.time);
  const band: number[] = [];
  const cpu: number[] = [];
  let sentence = '';
  for (let r = -3; r < RUNS; r++) {
    const t = performance.now();
    const c = process.cpuUsage();
    const runs = yearPlans(checked.plan, stops, fill.pastYears);
    const b = buildBand('years', runs, runBandPlans(runs.map((x) => x.plan)), times);
    const used = process.cpuUsage(c);
    if (r >= 0) band.push(performance.now() - t);
    if (r >= 0) cpu.push((used.user + used.system) / 1000);
    if (!b || b.total !== 10) throw new Error('the band did not have ten years');
    sentence = b.sentence;
  }
  // The request thread's share of the band: the task (plan, stops, past years packed) and handing it
  // to a worker (a structured clone); the worker builds the ten plans itself.
  const handOff: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const t = performance.now();
    structuredClone(bandTask(checked.plan, stops, fill)!.task);
    handOff.push(performance.now() - t);
  }
  console.log(`  ${'10-year band, 30-day / 40-load trip'.padEnd(40)} ${figure(band)}, CPU ${median(cpu).toFixed(1)} ms, target ≤ 50 ms (${times.length} h × 10 years, after 3 warm-up runs)`);
  console.log(`    "${sentence}"`);
  console.log(`  ${'  its task packed and handed to a worker'.padEnd(40)} ${figure(handOff)} on the request thread, target a few ms`);
  await db.destroy();
  await fake.stop();
  rmSync(dir, { recursive: true, force: true });
}

await main();
