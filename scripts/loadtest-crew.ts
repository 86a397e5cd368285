import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import pg from 'pg';
import { demoPlan } from '../src/engine';
import { DEMO_ACCOUNTS } from './seed';

/**
 * The crew's runs of `npm run loadtest` (and of `npm run loadtest:pg`, two instances over one
 * PostgreSQL database): anonymous preview forecasts of the demo trip, the signed-in saved forecast
 * page, and five editors of one crew reading and writing one rig's loads (PATCH with the version
 * read, add, remove), spread over every instance given. Afterwards every acknowledged write is read
 * back from the database: each acknowledged add present, each acknowledged removal gone, each
 * edited load at (or past) its last acknowledged version with that edit's watts. Stale edits
 * answer 409 and are counted, not errors.
 */

export const EDITORS = 5;
const BASE_LOADS = 10;

/** What the runs need of the database: making an editor, and reading loads back. */
export interface CrewStore {
  addEditor(crewId: string, userId: string): Promise<void>;
  loads(ids: string[]): Promise<Map<string, { version: number; watts: number }>>;
  /** SQLite's `integrity_check`, or "ok" where the database checks itself. */
  integrity(): Promise<string>;
  close(): Promise<void>;
}

export function sqliteStore(file: string): CrewStore {
  const db = new Database(file);
  db.pragma('busy_timeout = 5000');
  return {
    addEditor: async (crewId, userId) => {
      db.prepare('insert into crew_members (crew_id, user_id, role, created_at) values (?, ?, ?, ?)').run(
        crewId,
        userId,
        'editor',
        new Date().toISOString(),
      );
    },
    loads: async (ids) => {
      const has = db.prepare('select version, watts from loads where id = ?');
      const out = new Map<string, { version: number; watts: number }>();
      for (const id of ids) {
        const row = has.get(id) as { version: number; watts: number } | undefined;
        if (row) out.set(id, row);
      }
      return out;
    },
    integrity: async () => String(db.pragma('integrity_check', { simple: true })),
    close: async () => void db.close(),
  };
}

export async function postgresStore(url: string): Promise<CrewStore> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  return {
    addEditor: async (crewId, userId) => {
      await client.query('insert into crew_members (crew_id, user_id, role, created_at) values ($1, $2, $3, $4)', [
        crewId,
        userId,
        'editor',
        new Date().toISOString(),
      ]);
    },
    loads: async (ids) => {
      const r = await client.query<{ id: string; version: number; watts: number }>(
        'select id, version, watts from loads where id = any($1)',
        [ids],
      );
      return new Map(r.rows.map((row) => [row.id, { version: Number(row.version), watts: Number(row.watts) }]));
    },
    integrity: async () => 'ok',
    close: async () => void (await client.end()),
  };
}

function cookieOf(res: Response): string {
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

async function must<T>(res: Response, status: number, what: string): Promise<T> {
  if (res.status !== status) throw new Error(`${what}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** The seeded demo camper signed in, and the page of a saved forecast of theirs (checked to answer 200). */
export async function demoCamper(url: string): Promise<{ cookie: string; forecastPage: string }> {
  const signIn = await fetch(`${url}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ email: DEMO_ACCOUNTS.camper.email, password: DEMO_ACCOUNTS.camper.password }),
  });
  await must(signIn, 200, 'demo sign-in');
  const cookie = cookieOf(signIn);
  const trips = await must<{ id: string }[]>(await fetch(`${url}/api/trips`, { headers: { cookie } }), 200, 'trips');
  for (const t of trips) {
    const list = await must<{ id: string }[]>(await fetch(`${url}/api/trips/${t.id}/forecasts`, { headers: { cookie } }), 200, 'forecasts');
    if (!list.length) continue;
    const forecastPage = `/trips/${t.id}/forecasts/${list[0]!.id}`;
    const page = await fetch(`${url}${forecastPage}`, { headers: { cookie }, redirect: 'manual' });
    if (page.status !== 200) throw new Error(`The forecast page answered ${page.status} when signed in.`);
    return { cookie, forecastPage };
  }
  throw new Error('The seed has no saved forecast to load.');
}

type Row = {
  name: string;
  requests: number;
  rps: number;
  p50: number;
  p99: number;
  codes: Record<string, number>;
  errors: number;
  fiveXx: number;
};

export async function crewRuns(o: {
  urls: string[];
  store: CrewStore;
  camperCookie: string;
  forecastPage: string;
  seconds: number;
  connections: number;
}): Promise<{ lines: string[]; ok: boolean; fiveXx: number; rigId: string }> {
  const { urls, store, camperCookie: camper, forecastPage } = o;
  const url = urls[0]!;
  const JSON_HEADERS = { 'content-type': 'application/json', origin: url };
  const lines: string[] = [];

  // Editors of the demo crew, sharing one rig of loads.
  const crews = await must<{ id: string; role: string }[]>(await fetch(`${url}/api/crews`, { headers: { cookie: camper } }), 200, 'crews');
  const crewId = crews.find((c) => c.role === 'owner')?.id ?? crews[0]!.id;
  const editors: string[] = [];
  for (let i = 0; i < EDITORS; i++) {
    const up = await fetch(`${url}/api/auth/sign-up/email`, {
      method: 'POST',
      headers: JSON_HEADERS,
      body: JSON.stringify({
        name: `Load editor ${i + 1}`,
        email: `load.editor.${i + 1}@reyes-okafor.test`,
        password: 'load-editor-password',
        kind: 'camper',
      }),
    });
    const { user } = await must<{ user: { id: string } }>(up, 200, 'editor sign-up');
    await store.addEditor(crewId, user.id);
    editors.push(cookieOf(up));
  }
  const rig = await must<{ id: string }>(
    await fetch(`${url}/api/rigs`, {
      method: 'POST',
      headers: { ...JSON_HEADERS, cookie: camper },
      body: JSON.stringify({ name: 'Shared load rig', bank: { chemistry: 'lifepo4', capacityAh: 300 }, crewId }),
    }),
    201,
    'rig',
  );
  const baseIds: string[] = [];
  for (let i = 0; i < BASE_LOADS; i++) {
    const l = await must<{ id: string }>(
      await fetch(`${url}/api/rigs/${rig.id}/loads`, {
        method: 'POST',
        headers: { ...JSON_HEADERS, cookie: camper },
        body: JSON.stringify({ name: `Shared load ${i + 1}`, watts: 10 + i, dutyPct: 50 }),
      }),
      201,
      'load',
    );
    baseIds.push(l.id);
  }

  const rows: Row[] = [];
  // One autocannon per instance, the connections shared out between them, at the same time; the
  // row adds their requests and takes the slower instance's p50 and p99.
  const runAll = async (name: string, opts: (base: string) => autocannon.Options): Promise<void> => {
    const per = Math.max(1, Math.round(o.connections / urls.length));
    const results = await Promise.all(
      urls.map((u) => autocannon({ url: u, connections: per, duration: o.seconds, timeout: 20, ...opts(u) })),
    );
    const codes: Record<string, number> = {};
    for (const r of results)
      for (const [code, v] of Object.entries(r.statusCodeStats ?? {})) codes[code] = (codes[code] ?? 0) + Number(v.count);
    rows.push({
      name,
      requests: results.reduce((n, r) => n + r.requests.total, 0),
      rps: results.reduce((n, r) => n + r.requests.average, 0),
      p50: Math.max(...results.map((r) => r.latency.p50)),
      p99: Math.max(...results.map((r) => r.latency.p99)),
      codes,
      errors: results.reduce((n, r) => n + r.errors + r.timeouts, 0),
      fiveXx: results.reduce((n, r) => n + r['5xx'], 0),
    });
  };

  // 1. Anonymous preview forecasts of the demo trip.
  const plan = JSON.stringify(demoPlan());
  await runAll('preview forecast (anonymous POST /api/forecasts/preview)', (u) => ({
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: u },
    body: plan,
  }));

  // 2. The signed-in forecast page.
  await runAll('forecast page (signed in, GET /trips/:id/forecasts/:fid)', () => ({
    requests: [{ method: 'GET', path: forecastPage, headers: { cookie: camper } }],
  }));

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
    if (tally.otherRefusals <= 5) lines.push(`  refused ${what}: ${status} ${body.slice(0, 160)}`);
  };
  await runAll(`loads, ${EDITORS} editors of one crew (GET, PATCH with version, POST, DELETE)`, (u) => ({
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
          return {
            ...req,
            path: `/api/loads/${ctx.target}`,
            headers: { 'content-type': 'application/json', origin: u, cookie: ctx.cookie! },
            body: JSON.stringify({ watts: ctx.watts, version: ctx.versions?.[ctx.target] ?? 1 }),
          };
        },
        onResponse: (status, body, ctx: Ctx) => {
          if (status === 409) return void tally.conflicts++;
          if (status !== 200) return refused(status, 'PATCH', body);
          tally.patched++;
          const { version, watts } = JSON.parse(body) as { version: number; watts: number };
          const prev = acked.patched.get(ctx.target!);
          if (watts !== ctx.watts) lines.push(`  PATCH answered watts ${watts}, sent ${ctx.watts}`);
          if (!prev || version > prev.version) acked.patched.set(ctx.target!, { version, watts: ctx.watts! });
        },
      },
      {
        method: 'POST',
        path: `/api/rigs/${rig.id}/loads`,
        setupRequest: (req, ctx: Ctx) => ({
          ...req,
          headers: { 'content-type': 'application/json', origin: u, cookie: ctx.cookie! },
          body: JSON.stringify({ name: `Added ${Math.random().toString(36).slice(2, 8)}`, watts: 25, dutyPct: 20 }),
        }),
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
          return { ...req, path: `/api/loads/${ctx.posted}?version=1`, headers: { origin: u, cookie: ctx.cookie! } };
        },
        onResponse: (status, body, ctx: Ctx) => {
          if (!ctx.posted) return;
          if (status !== 204) return refused(status, 'DELETE', body);
          tally.removed++;
          acked.removed.add(ctx.posted);
        },
      },
    ],
  }));

  // Lost writes: what was acknowledged must be what the database holds.
  const lost: string[] = [];
  const held = await store.loads([...acked.added, ...acked.removed, ...acked.patched.keys()]);
  for (const id of acked.added) if (!removalSent.has(id) && !held.has(id)) lost.push(`added load ${id} is missing`);
  for (const id of acked.removed) if (held.has(id)) lost.push(`removed load ${id} is still there`);
  for (const [id, last] of acked.patched) {
    const row = held.get(id);
    if (!row) lost.push(`patched load ${id} is missing`);
    else if (row.version < last.version) lost.push(`load ${id} is at version ${row.version}, below the acknowledged ${last.version}`);
    else if (row.version === last.version && row.watts !== last.watts)
      lost.push(`load ${id} at version ${row.version} holds ${row.watts} W, not the acknowledged ${last.watts} W`);
  }
  const integrity = await store.integrity();

  lines.push(
    `Each run: ${o.seconds} s, ${o.connections} connections${urls.length > 1 ? ` shared between ${urls.length} instances (p50 and p99: the slower instance's)` : ''}, loopback only.`,
  );
  lines.push('| run | requests | req/s | p50 ms | p99 ms | status codes | errors | 5xx |');
  lines.push('|---|---:|---:|---:|---:|---|---:|---:|');
  for (const r of rows) {
    const codes = Object.entries(r.codes)
      .map(([c, n]) => `${c}: ${n}`)
      .join(', ');
    lines.push(`| ${r.name} | ${r.requests} | ${r.rps.toFixed(0)} | ${r.p50} | ${r.p99} | ${codes} | ${r.errors} | ${r.fiveXx} |`);
  }
  lines.push(
    `\nLoads run: ${tally.read} reads, ${tally.patched} edits, ${tally.conflicts} stale edits answered 409 (expected), ${tally.added} added, ${tally.removed} removed, ${tally.otherRefusals} other refusals.`,
  );
  lines.push(
    `Writes checked against the database: ${acked.added.size} adds, ${acked.removed.size} removals, ${acked.patched.size} loads' last edits; lost: ${lost.length}; integrity: ${integrity}.`,
  );
  const fiveXx = rows.reduce((n, r) => n + r.fiveXx, 0);
  if (lost.length || integrity !== 'ok') lines.push(`\nFAIL: lost writes:\n  ${lost.slice(0, 20).join('\n  ')}`);
  return { lines, ok: lost.length === 0 && integrity === 'ok' && fiveXx === 0, fiveXx, rigId: rig.id };
}
