import os from 'node:os';
import { crewRuns, demoCamper, sqliteStore } from './loadtest-crew';
import { describeHeavy, heavyRun } from './loadtest-heavy';
import { throughputRun } from './loadtest-throughput';

/**
 * `npm run loadtest`: builds the server (into SUNRECKON_DIST, default .dist-loadtest; set
 * SUNRECKON_PREBUILT=1 to reuse a build there), seeds a throw-away database with the demo crew and
 * drives the server from this process with autocannon over loopback. The server runs on every core
 * (WEB_CONCURRENCY, default the core count). Runs, each bounded in time (LOADTEST_SECONDS, default
 * 10) and connections:
 *   0. the throughput table (loadtest-throughput.ts): a bare Node server, health, landing, preview of
 *      a 30-day 40-load trip, the saved forecast page, with ratios and RSS per server process
 *      (LOADTEST_ONLY=throughput stops after it),
 *   1. anonymous preview forecasts of the demo trip (rate limit off for the run),
 *   2. the signed-in forecast page of the demo trip,
 *   3. several editors of one crew reading and writing one rig's loads (PATCH with versions, add,
 *      remove); 409s are expected and counted (loadtest-crew.ts; LOADTEST_ONLY=crew runs only these;
 *      `npm run loadtest:pg` runs them against two instances over one PostgreSQL database);
 *   4. heavy work (10 maximal sweeps, 2 previews of a 10 MB monitor log) while /api/health is
 *      called: prints health p99 (target ≤ 100 ms) and the server's peak RSS (target ≤ 400 MB).
 * Prints requests/s, p50/p99 latency and errors per run. Fails on any 5xx or a lost write: every
 * acknowledged add must be there, every acknowledged removal gone, every load at least at its last
 * acknowledged version and, when at it, with that write's watts.
 */

const SECONDS = Number(process.env.LOADTEST_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.LOADTEST_CONNECTIONS ?? 10);

// The same harness as the integration tests: build once, a throw-away migrated database, the
// built server on a free loopback port (rate limits off), then the demo crew seeded into it.
process.env.SUNRECKON_DIST ??= '.dist-loadtest';
// The server on every core, as in production (server.mjs; the test harness alone defaults to one).
process.env.WEB_CONCURRENCY ??= String(os.availableParallelism());
const { startDemoServer } = await import('../tests/helpers/server');
const { server, shutdown } = await startDemoServer();
const { url, dbPath } = server;
let failed = false;
process.on('SIGINT', () => void shutdown(130));

try {
  // The demo camper, the demo trip and its saved forecast.
  const { cookie: camper, forecastPage } = await demoCamper(url);

  // 0. Throughput side by side (issue 21): bare server, health, landing, preview, saved forecast page.
  if (process.env.LOADTEST_ONLY !== 'crew') {
    const tp = await throughputRun({ url, serverPid: server.child.pid!, forecastPage, camperCookie: camper, seconds: SECONDS });
    for (const line of tp.lines) console.log(line);
    if (!tp.ok) failed = true;
    if (process.env.LOADTEST_ONLY === 'throughput') await shutdown(failed ? 1 : 0);
  }

  const machine = `${os.cpus()[0]?.model.trim() ?? 'unknown CPU'}, ${os.cpus().length} cores, ${Math.round(os.totalmem() / 2 ** 30)} GB, Node ${process.version}, ${os.platform()} ${os.release()}`;
  console.log(`\nMachine: ${machine}`);
  // 1–3. Previews, the forecast page and five editors of one rig's loads; every write read back.
  const store = sqliteStore(dbPath);
  const crew = await crewRuns({ urls: [url], store, camperCookie: camper, forecastPage, seconds: SECONDS, connections: CONNECTIONS }).finally(() => store.close());
  for (const line of crew.lines) console.log(line);
  if (!crew.ok) failed = true;
  if (process.env.LOADTEST_ONLY === 'crew') await shutdown(failed ? 1 : 0);

  // 4. Heavy work in the worker pool (sweeps, 10 MB log previews) while /api/health is called.
  const heavy = describeHeavy(await heavyRun({ url, server, ownerCookie: camper, rigId: crew.rigId }));
  for (const line of heavy.lines) console.log(line);
  if (!heavy.ok) {
    failed = true;
    console.error('\nFAIL: the heavy run missed a target (health p99, RSS) or a heavy request was refused.');
  }

  if (crew.fiveXx > 0) {
    failed = true;
    console.error(`\nFAIL: ${crew.fiveXx} responses were 5xx.\n${server.logs().slice(-3000)}`);
  }
  if (!failed) console.log('\nNo 5xx, no lost write.');
} catch (err) {
  failed = true;
  console.error(err);
}
await shutdown(failed ? 1 : 0);
