import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { crewRuns, demoCamper, postgresStore } from './loadtest-crew';

/**
 * `npm run loadtest:pg`: the crew's runs of `npm run loadtest` (previews, the saved forecast page,
 * five editors of one rig's loads with every acknowledged write read back) against **two server
 * instances over one PostgreSQL database**, as "Running more than one instance" in the README
 * deploys them: a throw-away cluster on a loopback port (scripts/pg-cluster.sh, as the PostgreSQL
 * test run starts it), one database migrated once and seeded with the demo crew, two built servers
 * on it with the same secret (one process each: `LOADTEST_INSTANCE_CONCURRENCY`, default 1), and
 * the connections shared between them. Fails on any 5xx or lost write.
 */

const SECONDS = Number(process.env.LOADTEST_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.LOADTEST_CONNECTIONS ?? 10);
process.env.SUNRECKON_DIST ??= '.dist-loadtest';
process.env.WEB_CONCURRENCY = process.env.LOADTEST_INSTANCE_CONCURRENCY ?? '1';

const ROOT = path.resolve(import.meta.dirname, '..');
process.env.PG_STATE = mkdtempSync(path.join(os.tmpdir(), 'sunreckon-pgstate-'));
const { buildOnce, cleanup, freePort, freshTestDatabase, startServer } = await import('../tests/helpers/server');
if (process.env.SUNRECKON_PREBUILT !== '1') console.log(`Building into ${process.env.SUNRECKON_DIST} …`);
buildOnce();

const port = await freePort();
process.env.TEST_POSTGRES_URL = execFileSync('bash', ['scripts/pg-cluster.sh', 'start', String(port)], {
  cwd: ROOT,
  encoding: 'utf8',
}).trim();
const stopCluster = () => execFileSync('bash', ['scripts/pg-cluster.sh', 'stop'], { cwd: ROOT, stdio: 'inherit' });
console.log(`PostgreSQL cluster on 127.0.0.1:${port}`);

let failed = false;
const servers: Awaited<ReturnType<typeof startServer>>[] = [];
const dir = mkdtempSync(path.join(os.tmpdir(), 'sunreckon-instances-'));
try {
  const databaseUrl = await freshTestDatabase(dir);
  const secret = randomBytes(24).toString('hex');
  // Migrated and seeded once (by the first start), then the second instance on the same database
  // (its start finds nothing left to migrate).
  servers.push(await startServer({ BETTER_AUTH_SECRET: secret }, { dir, dbPath: databaseUrl }));
  execFileSync('npx', ['tsx', 'scripts/seed.ts'], { cwd: ROOT, env: { ...process.env, DATABASE_URL: databaseUrl }, stdio: 'pipe' });
  servers.push(await startServer({ BETTER_AUTH_SECRET: secret }, { dir, dbPath: databaseUrl }));
  const urls = servers.map((s) => s.url);
  const { cookie, forecastPage } = await demoCamper(urls[0]!);
  // The same session must work on the other instance (the sessions are in the database).
  const other = await fetch(`${urls[1]}${forecastPage}`, { headers: { cookie }, redirect: 'manual' });
  if (other.status !== 200) throw new Error(`The second instance answered ${other.status} for the forecast page.`);

  console.log(
    `\nMachine: ${os.cpus()[0]?.model.trim() ?? 'unknown CPU'}, ${os.cpus().length} cores, Node ${process.version}; load average before: ${os
      .loadavg()
      .map((x) => x.toFixed(2))
      .join(', ')}`,
  );
  console.log(
    `Two instances (${process.env.WEB_CONCURRENCY} process each) over one PostgreSQL database (${execFileSync('bash', ['-c', 'ls -d /usr/lib/postgresql/*/ | sort -V | tail -1'], { encoding: 'utf8' }).trim()}).`,
  );
  const store = await postgresStore(databaseUrl);
  const crew = await crewRuns({ urls, store, camperCookie: cookie, forecastPage, seconds: SECONDS, connections: CONNECTIONS }).finally(() =>
    store.close(),
  );
  for (const line of crew.lines) console.log(line);
  console.log(
    `Load average after: ${os
      .loadavg()
      .map((x) => x.toFixed(2))
      .join(', ')}`,
  );
  if (!crew.ok) failed = true;
  if (crew.fiveXx > 0) console.error(`\nFAIL: ${crew.fiveXx} responses were 5xx.\n${servers.map((s) => s.logs().slice(-2000)).join('\n')}`);
  if (!failed) console.log('\nNo 5xx, no lost write.');
} catch (err) {
  failed = true;
  console.error(err);
} finally {
  for (const s of servers) await s.stop();
  stopCluster();
  cleanup(dir);
}
process.exit(failed ? 1 : 0);
