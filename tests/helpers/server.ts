import { spawn, execFileSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { weatherEnvFor } from '../../scripts/fakes/weather';

export const ROOT = path.resolve(import.meta.dirname, '../..');

/** Where the tests build and run the server; SUNRECKON_DIST lets parallel checkouts keep builds apart. */
export const DIST = process.env.SUNRECKON_DIST ?? 'dist';

/** A free TCP port on loopback. */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Builds the production server unless the caller already did (npm test builds once). */
export function buildOnce(): void {
  if (process.env.SUNRECKON_PREBUILT === '1') return;
  execFileSync('npx', ['astro', 'build', '--outDir', DIST], { cwd: ROOT, stdio: 'pipe', env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' } });
  process.env.SUNRECKON_PREBUILT = '1';
}

export interface RunningServer {
  url: string;
  port: number;
  dbPath: string;
  dir: string;
  child: ChildProcess;
  stop(signal?: NodeJS.Signals): Promise<void>;
  logs(): string;
}

/**
 * When the suite runs on PostgreSQL (TEST_POSTGRES_URL names a throw-away cluster's admin
 * database, see scripts/pg-cluster.sh), a fresh empty database for one server; its URL then
 * stands where a SQLite file's path stands elsewhere (RunningServer.dbPath, inject('dbPath')).
 */
export async function freshTestDatabase(dir: string): Promise<string> {
  const admin = process.env.TEST_POSTGRES_URL;
  if (!admin) return path.join(dir, 'test.sqlite');
  const name = `sunreckon_t_${randomBytes(6).toString('hex')}`;
  const client = new pg.Client({ connectionString: admin });
  await client.connect();
  try {
    await client.query(`create database ${name}`);
  } finally {
    await client.end();
  }
  const url = new URL(admin);
  url.pathname = `/${name}`;
  return url.toString();
}

/** Starts the built server on a throw-away database (migrated first) and waits for /api/health. */
export async function startServer(extraEnv: Record<string, string> = {}, reuse?: { dir: string; dbPath: string }): Promise<RunningServer> {
  const dir = reuse?.dir ?? mkdtempSync(path.join(tmpdir(), 'sunreckon-test-'));
  const dbPath = reuse?.dbPath ?? (await freshTestDatabase(dir));
  const onPostgres = /^postgres(ql)?:\/\//.test(dbPath);
  const port = await freePort();
  // Weather from the caller's URLs or the local fake, never the real service (not even when the shell names it).
  const { fake: _fake, ...weather } = await weatherEnvFor(extraEnv);
  const env = {
    ...process.env,
    ...weather,
    ...(onPostgres ? { DATABASE_URL: dbPath } : { DATABASE_PATH: dbPath }),
    HOST: '127.0.0.1',
    PORT: String(port),
    BETTER_AUTH_SECRET: 'test-secret-test-secret-test-secret-0001',
    PREVIEW_RATE_LIMIT: '0',
    AUTH_RATE_LIMIT: '0',
    // Mail, share and sweep limits are tested on servers of their own (hardening.test.ts).
    INVITE_CREW_HOURLY: '0',
    INVITE_ADDRESS_HOURLY: '0',
    GRANT_HOURLY: '0',
    SWEEP_RATE_LIMIT: '0',
    SUNRECKON_ENV: 'test',
    NODE_ENV: 'production',
    ...extraEnv,
  };
  execFileSync('npx', ['tsx', 'db/migrate.ts'], { cwd: ROOT, env, stdio: 'pipe' });
  const child = spawn(process.execPath, ['server.mjs'], { cwd: ROOT, env: { ...env, SUNRECKON_DIST: DIST }, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  child.stdout?.on('data', (d) => (out += d));
  child.stderr?.on('data', (d) => (out += d));
  const url = `http://127.0.0.1:${port}`;
  const started = Date.now();
  for (;;) {
    if (child.exitCode !== null) throw new Error(`Server exited early (${child.exitCode}):\n${out}`);
    try {
      const r = await fetch(`${url}/api/health`);
      if (r.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() - started > 30_000) throw new Error(`Server did not answer /api/health within 30 s:\n${out}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url,
    port,
    dbPath,
    dir,
    child,
    logs: () => out,
    stop: (signal: NodeJS.Signals = 'SIGTERM') =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode) return resolve();
        child.once('exit', () => resolve());
        child.kill(signal);
      }),
  };
}

/** Removes a server's throw-away folder. */
export function cleanup(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/**
 * For the measuring scripts (load test, page weight): builds into SUNRECKON_DIST unless prebuilt,
 * starts the server on a throw-away database with a random secret (rate limits off), seeds the
 * invented demo crew into it, and gives a shutdown that stops the server, removes its folder and exits.
 */
export async function startDemoServer(): Promise<{ server: RunningServer; shutdown: (code: number) => Promise<never> }> {
  if (process.env.SUNRECKON_PREBUILT !== '1') console.log(`Building into ${DIST} …`);
  buildOnce();
  const server = await startServer({ BETTER_AUTH_SECRET: randomBytes(24).toString('hex') });
  execFileSync('npx', ['tsx', 'scripts/seed.ts'], { cwd: ROOT, env: { ...process.env, ...(/^postgres/.test(server.dbPath) ? { DATABASE_URL: server.dbPath } : { DATABASE_PATH: server.dbPath }) }, stdio: 'pipe' });
  const shutdown = async (code: number): Promise<never> => {
    await server.stop();
    cleanup(server.dir);
    process.exit(code);
  };
  return { server, shutdown };
}
