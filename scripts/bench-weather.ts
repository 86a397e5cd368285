// `npm run bench` (weather part): how long filling a 5-stop trip's weather takes against the
// local fake weather service, cold (empty cache: every request goes over HTTP and is decoded by
// the SDK) and cached (answered from SQLite). Prints medians in milliseconds; a script, not a test.
// Targets from issue 14: ≤ 300 ms cold, ≤ 20 ms cached.
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { createDb } from '../db/client';
import { migrateToLatest } from '../db/migrate';
import type { StopLike } from '../src/domain/weather/weather';
import { fillTripWeather, type WeatherConfig } from '../src/server/weather';
import { startFakeWeather } from './fakes/weather';

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
  await db.destroy();
  await fake.stop();
  rmSync(dir, { recursive: true, force: true });
}

await main();
