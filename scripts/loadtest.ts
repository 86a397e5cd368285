import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import os from 'node:os';
import { DEMO_ACCOUNTS } from './seed';
import { demoPlan } from '../src/engine';
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
 *      remove); 409s are expected and counted;
 *   4. heavy work (10 maximal sweeps, 2 previews of a 10 MB monitor log) while /api/health is
 *      called: prints health p99 (target ≤ 100 ms) and the server's peak RSS (target ≤ 400 MB).
 * Prints requests/s, p50/p99 latency and errors per run. Fails on any 5xx or a lost write: every
 * acknowledged add must be there, every acknowledged removal gone, every load at least at its last
 * acknowledged version and, when at it, with that write's watts.
 */

const SECONDS = Number(process.env.LOADTEST_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.LOADTEST_CONNECTIONS ?? 10);
const EDITORS = 5;
const BASE_LOADS = 10;

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

  const JSON_HEADERS = { 'content-type': 'application/json', origin: url };
  const cookieOf = (res: Response) => res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  async function must<T>(res: Response, status: number, what: string): Promise<T> {
    if (res.status !== status) throw new Error(`${what}: ${res.status} ${await res.text()}`);
    return (await res.json()) as T;
  }

  // The demo camper, the demo trip and its saved forecast.
  const signIn = await fetch(`${url}/api/auth/sign-in/email`, { method: 'POST', headers: JSON_HEADERS, body: JSON.stringify({ email: DEMO_ACCOUNTS.camper.email, password: DEMO_ACCOUNTS.camper.password }) });
  await must(signIn, 200, 'demo sign-in');
  const camper = cookieOf(signIn);
  const trips = await must<{ id: string; name: string }[]>(await fetch(`${url}/api/trips`, { headers: { cookie: camper } }), 200, 'trips');
  let forecastPage = '';
  for (const t of trips) {
    const list = await must<{ id: string }[]>(await fetch(`${url}/api/trips/${t.id}/forecasts`, { headers: { cookie: camper } }), 200, 'forecasts');
    if (list.length) {
      forecastPage = `/trips/${t.id}/forecasts/${list[0]!.id}`;
      break;
    }
  }
  if (!forecastPage) throw new Error('The seed has no saved forecast to load.');
  const page = await fetch(`${url}${forecastPage}`, { headers: { cookie: camper }, redirect: 'manual' });
  if (page.status !== 200) throw new Error(`The forecast page answered ${page.status} when signed in.`);

  // 0. Throughput side by side (issue 21): bare server, health, landing, preview, saved forecast page.
  const tp = await throughputRun({ url, serverPid: server.child.pid!, forecastPage, camperCookie: camper, seconds: SECONDS });
  for (const line of tp.lines) console.log(line);
  if (!tp.ok) failed = true;
  if (process.env.LOADTEST_ONLY === 'throughput') {
    await shutdown(failed ? 1 : 0);
  }

  // Editors of the demo crew, sharing one rig of loads.
  const crews = await must<{ id: string; role: string }[]>(await fetch(`${url}/api/crews`, { headers: { cookie: camper } }), 200, 'crews');
  const crewId = crews.find((c) => c.role === 'owner')?.id ?? crews[0]!.id;
  const editors: string[] = [];
  const sqlite = new Database(dbPath);
  sqlite.pragma('busy_timeout = 5000');
  for (let i = 0; i < EDITORS; i++) {
    const up = await fetch(`${url}/api/auth/sign-up/email`, {
      method: 'POST',
      headers: JSON_HEADERS,
      body: JSON.stringify({ name: `Load editor ${i + 1}`, email: `load.editor.${i + 1}@reyes-okafor.test`, password: 'load-editor-password', kind: 'camper' }),
    });
    const { user } = await must<{ user: { id: string } }>(up, 200, 'editor sign-up');
    sqlite.prepare('insert into crew_members (crew_id, user_id, role, created_at) values (?, ?, ?, ?)').run(crewId, user.id, 'editor', new Date().toISOString());
    editors.push(cookieOf(up));
  }
  sqlite.close();
  const rig = await must<{ id: string }>(
    await fetch(`${url}/api/rigs`, { method: 'POST', headers: { ...JSON_HEADERS, cookie: camper }, body: JSON.stringify({ name: 'Shared load rig', bank: { chemistry: 'lifepo4', capacityAh: 300 }, crewId }) }),
    201,
    'rig',
  );
  const baseIds: string[] = [];
  for (let i = 0; i < BASE_LOADS; i++) {
    const l = await must<{ id: string }>(
      await fetch(`${url}/api/rigs/${rig.id}/loads`, { method: 'POST', headers: { ...JSON_HEADERS, cookie: camper }, body: JSON.stringify({ name: `Shared load ${i + 1}`, watts: 10 + i, dutyPct: 50 }) }),
      201,
      'load',
    );
    baseIds.push(l.id);
  }

  const machine = `${os.cpus()[0]?.model.trim() ?? 'unknown CPU'}, ${os.cpus().length} cores, ${Math.round(os.totalmem() / 2 ** 30)} GB, Node ${process.version}, ${os.platform()} ${os.release()}`;
  console.log(`\nMachine: ${machine}`);
  console.log(`Each run: ${SECONDS} s, ${CONNECTIONS} connections, loopback only.\n`);

  type Row = { name: string; requests: number; rps: number; p50: number; p99: number; codes: Record<string, number>; errors: number; timeouts: number; fiveXx: number };
  const rows: Row[] = [];
  const summarize = (name: string, r: autocannon.Result): Row => {
    const codes: Record<string, number> = {};
    for (const [code, v] of Object.entries(r.statusCodeStats ?? {})) codes[code] = Number(v.count);
    const row = { name, requests: r.requests.total, rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, codes, errors: r.errors, timeouts: r.timeouts, fiveXx: r['5xx'] };
    rows.push(row);
    return row;
  };
  const run = (opts: autocannon.Options) => autocannon({ url, connections: CONNECTIONS, duration: SECONDS, timeout: 20, ...opts });

  // 1. Anonymous preview forecasts of the demo trip.
  summarize('preview forecast (anonymous POST /api/forecasts/preview)', await run({ method: 'POST', headers: JSON_HEADERS, body: JSON.stringify(demoPlan()) }));

  // 2. The signed-in forecast page.
  summarize('forecast page (signed in, GET /trips/:id/forecasts/:fid)', await run({ requests: [{ method: 'GET', path: forecastPage, headers: { cookie: camper } }] }));

  // 3. Editors reading and writing one rig's loads.
  const acked = { added: new Set<string>(), removed: new Set<string>(), patched: new Map<string, { version: number; watts: number }>() };
  // Removals sent: when the run's time limit cuts a DELETE in flight, the server may have done it
  // without the answer arriving, so such a load may be present or gone — neither is a lost write.
  const removalSent = new Set<string>();
  const tally = { read: 0, patched: 0, conflicts: 0, added: 0, removed: 0, otherRefusals: 0 };
  type Ctx = { cookie?: string; versions?: Record<string, number>; target?: string; watts?: number; posted?: string };
  const pick = <T>(xs: T[]) => xs[Math.floor(Math.random() * xs.length)]!;
  const refused = (status: number, what: string, body: string) => {
    tally.otherRefusals++;
    if (tally.otherRefusals <= 5) console.log(`  refused ${what}: ${status} ${body.slice(0, 160)}`);
  };
  const mixed = await run({
    requests: [
      {
        method: 'GET',
        path: `/api/rigs/${rig.id}/loads`,
        setupRequest: (req, ctx: Ctx) => {
          ctx.cookie = pick(editors);
          return { ...req, headers: { cookie: ctx.cookie } };
        },
        onResponse: (status, body, ctx: Ctx) => {
          if (status !== 200) return refused(status, 'read', body);
          tally.read++;
          ctx.versions = Object.fromEntries((JSON.parse(body) as { id: string; version: number }[]).map((l) => [l.id, l.version]));
        },
      },
      {
        method: 'PATCH',
        setupRequest: (req, ctx: Ctx) => {
          ctx.target = pick(baseIds);
          ctx.watts = Math.round(Math.random() * 2000) / 10;
          return { ...req, path: `/api/loads/${ctx.target}`, headers: { ...JSON_HEADERS, cookie: ctx.cookie! }, body: JSON.stringify({ watts: ctx.watts, version: ctx.versions?.[ctx.target] ?? 1 }) };
        },
        onResponse: (status, body, ctx: Ctx) => {
          if (status === 409) return void tally.conflicts++;
          if (status !== 200) return refused(status, 'PATCH', body);
          tally.patched++;
          const { version, watts } = JSON.parse(body) as { version: number; watts: number };
          const prev = acked.patched.get(ctx.target!);
          if (watts !== ctx.watts) console.log(`  PATCH answered watts ${watts}, sent ${ctx.watts}`);
          if (!prev || version > prev.version) acked.patched.set(ctx.target!, { version, watts: ctx.watts! });
        },
      },
      {
        method: 'POST',
        path: `/api/rigs/${rig.id}/loads`,
        setupRequest: (req, ctx: Ctx) => ({ ...req, headers: { ...JSON_HEADERS, cookie: ctx.cookie! }, body: JSON.stringify({ name: `Added ${Math.random().toString(36).slice(2, 8)}`, watts: 25, dutyPct: 20 }) }),
        onResponse: (status, body, ctx: Ctx) => {
          if (status !== 201) return refused(status, 'POST', body);
          tally.added++;
          ctx.posted = (JSON.parse(body) as { id: string }).id;
          acked.added.add(ctx.posted);
        },
      },
      {
        method: 'DELETE',
        setupRequest: (req, ctx: Ctx): autocannon.Request => {
          if (!ctx.posted) return { ...req, method: 'GET', path: `/api/rigs/${rig.id}/loads`, headers: { cookie: ctx.cookie! } };
          removalSent.add(ctx.posted);
          return { ...req, path: `/api/loads/${ctx.posted}?version=1`, headers: { origin: url, cookie: ctx.cookie! } };
        },
        onResponse: (status, body, ctx: Ctx) => {
          if (!ctx.posted) return;
          if (status !== 204) return refused(status, 'DELETE', body);
          tally.removed++;
          acked.removed.add(ctx.posted);
        },
      },
    ],
  });
  summarize(`loads, ${EDITORS} editors of one crew (GET, PATCH with version, POST, DELETE)`, mixed);

  // Lost writes: what was acknowledged must be what the database holds.
  const db = new Database(dbPath, { readonly: true });
  const lost: string[] = [];
  const integrity = db.pragma('integrity_check', { simple: true });
  const has = db.prepare('select version, watts from loads where id = ?');
  for (const id of acked.added) if (!removalSent.has(id) && !has.get(id)) lost.push(`added load ${id} is missing`);
  for (const id of acked.removed) if (has.get(id)) lost.push(`removed load ${id} is still there`);
  for (const [id, last] of acked.patched) {
    const row = has.get(id) as { version: number; watts: number } | undefined;
    if (!row) lost.push(`patched load ${id} is missing`);
    else if (row.version < last.version) lost.push(`load ${id} is at version ${row.version}, below the acknowledged ${last.version}`);
    else if (row.version === last.version && row.watts !== last.watts) lost.push(`load ${id} at version ${row.version} holds ${row.watts} W, not the acknowledged ${last.watts} W`);
  }
  db.close();

  console.log('| run | requests | req/s | p50 ms | p99 ms | status codes | errors | 5xx |');
  console.log('|---|---:|---:|---:|---:|---|---:|---:|');
  for (const r of rows) {
    const codes = Object.entries(r.codes).map(([c, n]) => `${c}: ${n}`).join(', ');
    console.log(`| ${r.name} | ${r.requests} | ${r.rps.toFixed(0)} | ${r.p50} | ${r.p99} | ${codes} | ${r.errors + r.timeouts} | ${r.fiveXx} |`);
  }
  console.log(
    `\nLoads run: ${tally.read} reads, ${tally.patched} edits, ${tally.conflicts} stale edits answered 409 (expected), ${tally.added} added, ${tally.removed} removed, ${tally.otherRefusals} other refusals.`,
  );
  console.log(`Writes checked against the database: ${acked.added.size} adds, ${acked.removed.size} removals, ${acked.patched.size} loads' last edits; integrity_check: ${String(integrity)}.`);

  // 4. Heavy work in the worker pool (sweeps, 10 MB log previews) while /api/health is called.
  const heavy = describeHeavy(await heavyRun({ url, server, ownerCookie: camper, rigId: rig.id }));
  for (const line of heavy.lines) console.log(line);
  if (!heavy.ok) {
    failed = true;
    console.error('\nFAIL: the heavy run missed a target (health p99, RSS) or a heavy request was refused.');
  }

  const fiveXx = rows.reduce((n, r) => n + r.fiveXx, 0);
  if (fiveXx > 0) {
    failed = true;
    console.error(`\nFAIL: ${fiveXx} responses were 5xx.\n${server.logs().slice(-3000)}`);
  }
  if (lost.length || integrity !== 'ok') {
    failed = true;
    console.error(`\nFAIL: lost writes:\n  ${lost.slice(0, 20).join('\n  ')}`);
  }
  if (!failed) console.log('\nNo 5xx, no lost write.');
} catch (err) {
  failed = true;
  console.error(err);
}
await shutdown(failed ? 1 : 0);
