import fc from 'fast-check';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { request } from 'node:http';
import { api, baseUrl, openTestDb, signUp, type Session } from '../helpers/api';
import { ACTORS, monitorLogUpload, ROUTES, type Actor, type Cast, type RouteCase, type World } from '../helpers/routes';
import { makeCast, makeWorld, sessionOf } from '../helpers/world';

// Hostile input against every route of the authorization table (tests/helpers/routes.ts): random
// and malformed bodies, query strings and headers never get a 5xx, and callers who may not change a
// crew's rows leave them exactly as they were. Runs are bounded (numRuns) and seeded by fast-check;
// a failure prints the seed and the shrunk request.

let cast: Cast;
/** Rows the owner and editor fuzz freely (only "no 5xx" is checked there). */
let playground: World;
/** Rows only callers without write access fuzz; compared row for row before and after. */
let guarded: World;

beforeAll(async () => {
  cast = await makeCast();
  // With a member of their own, so the member routes have someone to target.
  playground = await makeWorld(cast, ['member']);
  guarded = await makeWorld(cast, ['member']);
}, 180_000);

const printable = fc.string({ unit: fc.constantFrom(...' !"#$%&\'()*+,-./0123456789:;<=>?@AZaz[\\]^_`{|}~é€'.split('')), maxLength: 40 });
const junkText = fc.oneof(fc.string({ maxLength: 200 }), fc.string({ unit: 'binary', maxLength: 200 }), printable);
const CONTENT_TYPES = ['application/json', 'application/json; charset=utf-8', 'text/plain', 'text/csv', 'multipart/form-data; boundary=x', 'multipart/form-data', 'application/x-www-form-urlencoded', 'application/octet-stream', ''];

/** A JSON value shaped like the route's valid body with some fields swapped for anything. */
function mutate(valid: unknown, swaps: { key: string; value: unknown }[]): unknown {
  if (!valid || typeof valid !== 'object' || Array.isArray(valid)) return valid;
  const out: Record<string, unknown> = { ...(valid as Record<string, unknown>) };
  const keys = Object.keys(out);
  for (const [i, s] of swaps.entries()) {
    const key = keys.length && i % 2 === 0 ? keys[s.key.length % keys.length]! : s.key;
    out[key] = s.value;
  }
  return out;
}

const bodyArb = fc.oneof(
  fc.record({ kind: fc.constant('mutated' as const), swaps: fc.array(fc.record({ key: printable, value: fc.jsonValue({ maxDepth: 3 }) }), { minLength: 1, maxLength: 4 }) }),
  fc.record({ kind: fc.constant('json' as const), value: fc.jsonValue({ maxDepth: 4 }) }),
  fc.record({ kind: fc.constant('raw' as const), text: junkText, type: fc.constantFrom(...CONTENT_TYPES) }),
  fc.record({ kind: fc.constant('none' as const) }),
);

const queryArb = fc.oneof(
  fc.constant(''),
  fc.array(fc.tuple(fc.constantFrom('version', 'preview', 'q', 'lat', 'lon', 'limit', 'x'), junkText), { maxLength: 3 }).map((pairs) => new URLSearchParams(pairs).toString()),
  printable.map((s) => s.replace(/#/g, '')),
);

/** Header values: HTTP carries bytes, so Latin-1 only (fetch refuses anything wider). */
const headerText = fc.string({ unit: fc.constantFrom(...' !"#$%&\'()*+,-./0123456789:;<=>?@AZaz[\\]^_`{|}~\u00e9\u00ff'.split('')), maxLength: 60 });
const headerArb = fc.dictionary(
  fc.constantFrom('accept', 'accept-language', 'x-forwarded-for', 'x-forwarded-host', 'x-forwarded-proto', 'if-none-match', 'range', 'accept-encoding', 'x-sunreckon-client-ip', 'cookie'),
  headerText,
  { maxKeys: 3 },
);

const requestArb = fc.record({ route: fc.constantFrom(...ROUTES), body: bodyArb, query: queryArb, headers: headerArb });

type FuzzRequest = typeof requestArb extends fc.Arbitrary<infer T> ? T : never;

async function send(rc: RouteCase, w: World, actor: Actor, r: FuzzRequest): Promise<{ status: number; text: string; url: string; json: boolean }> {
  const base = rc.url(w);
  const url = r.query ? `${base}${base.includes('?') ? '&' : '?'}${r.query}` : base;
  const headers = new Headers();
  const session: Session | undefined = sessionOf(w.cast, actor);
  for (const [k, v] of Object.entries(r.headers)) headers.set(k, k === 'cookie' && session ? `${session.cookie}; ${v}` : v);
  let body: BodyInit | undefined;
  if (rc.method !== 'GET') {
    if (r.body.kind === 'mutated') {
      const valid = rc.body ? await rc.body(w) : {};
      headers.set('content-type', 'application/json');
      body = JSON.stringify(mutate(valid, r.body.swaps));
    } else if (r.body.kind === 'json') {
      headers.set('content-type', 'application/json');
      body = JSON.stringify(r.body.value);
    } else if (r.body.kind === 'raw') {
      if (r.body.type) headers.set('content-type', r.body.type);
      body = r.body.text;
    }
  }
  const res = await api(url, { method: rc.method, session, headers, body });
  return { status: res.status, text: await res.text(), url, json: (res.headers.get('content-type') ?? '').includes('application/json') };
}

/** Everything the guarded world's crew owns, read straight from SQLite. */
function snapshot(w: World): string {
  const db = openTestDb();
  try {
    const rigIds = [w.rig.id];
    const q = (sql: string, ...args: unknown[]) => db.prepare(sql).all(...args);
    return JSON.stringify({
      crew: q('select * from crews where id = ?', w.crewId),
      members: q('select * from crew_members where crew_id = ? order by user_id', w.crewId),
      invitations: q('select * from invitations where crew_id = ? order by id', w.crewId),
      rigs: q(`select * from rigs where id in (${rigIds.map(() => '?').join(',')})`, ...rigIds),
      loads: q('select * from loads where rig_id = ? order by id', w.rig.id),
      trips: q('select * from trips where rig_id = ? order by id', w.rig.id),
      forecasts: q('select id, name, created_at from forecasts where trip_id = ? order by id', w.trip.id),
      grants: q('select * from rig_grants where rig_id = ? order by id', w.rig.id),
      proposals: q('select * from proposals where id in (?, ?) order by id', w.proposal.id, w.draft.id),
      monitorLogs: q('select id, version from monitor_logs where rig_id = ? order by id', w.rig.id),
    });
  } finally {
    db.close();
  }
}

/** Another crew's rows: the outsider's crews, rigs and loads. */
function otherCrew(): string {
  const db = openTestDb();
  try {
    const crews = 'select crew_id from crew_members where user_id = ?';
    return JSON.stringify({
      crews: db.prepare(`select * from crews where id in (${crews}) order by id`).all(cast.outsider.userId),
      members: db.prepare(`select * from crew_members where crew_id in (${crews}) order by crew_id, user_id`).all(cast.outsider.userId),
      rigs: db.prepare(`select * from rigs where crew_id in (${crews}) order by id`).all(cast.outsider.userId),
      loads: db.prepare(`select * from loads where rig_id in (select id from rigs where crew_id in (${crews})) order by id`).all(cast.outsider.userId),
    });
  } finally {
    db.close();
  }
}

describe('fuzzed requests to every route', () => {
  it('the crew’s owner, editor and a granted installer never get a 5xx, and never touch another crew', async () => {
    const before = otherCrew();
    expect(JSON.parse(before).rigs.length).toBeGreaterThan(0);
    await fc.assert(
      fc.asyncProperty(requestArb, fc.constantFrom<Actor>('owner', 'editor', 'installer'), async (r, actor) => {
        const res = await send(r.route, playground, actor, r);
        expect(res.status, `${r.route.method} ${res.url} as ${actor}: ${res.text.slice(0, 300)}`).toBeLessThan(500);
        // (A URL that cannot be decoded, e.g. "?%", is refused by the server before any route: a plain-text 400.)
        if (res.status >= 400 && res.json && !r.route.route.startsWith('/api/auth/')) {
          // The error envelope, with fields named when the input was refused.
          const body = JSON.parse(res.text) as { error: { code: string; message: string }; issues: unknown[] };
          expect(typeof body.error.code).toBe('string');
          expect(Array.isArray(body.issues)).toBe(true);
        }
      }),
      { numRuns: 600 },
    );
    expect(otherCrew()).toBe(before);
  }, 240_000);

  it('callers who may not write change nothing of the crew’s, and never get a 5xx', async () => {
    const before = snapshot(guarded);
    const intruders = ACTORS.filter((a) => !['owner', 'editor'].includes(a) && a !== 'installer') as Actor[];
    await fc.assert(
      fc.asyncProperty(requestArb, fc.constantFrom(...intruders), async (r, actor) => {
        const res = await send(r.route, guarded, actor, r);
        expect(res.status, `${r.route.method} ${res.url} as ${actor}: ${res.text.slice(0, 300)}`).toBeLessThan(500);
      }),
      { numRuns: 600 },
    );
    expect(snapshot(guarded)).toBe(before);
  }, 240_000);
});

/** A POST on a connection of its own (the server may close it after refusing a large body early). */
function rawPost(pathname: string, headers: Record<string, string>, chunks: string[]): Promise<number> {
  const target = new URL(pathname, baseUrl());
  return new Promise((resolve, reject) => {
    const req = request(target, { method: 'POST', agent: false, headers: { ...headers, origin: baseUrl(), cookie: cast.owner.cookie } }, (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    });
    req.on('error', reject);
    for (const c of chunks) req.write(c);
    req.end();
  });
}

describe('uploads', () => {
  // A world of its own: the fuzzing above may have deleted the playground's rig.
  let w: World;
  beforeAll(async () => {
    w = await makeWorld(cast);
  }, 60_000);
  const importUrl = () => `/api/rigs/${w.rig.id}/loads/import`;
  const loadCount = async () => ((await (await api(`/api/rigs/${w.rig.id}/loads`, { session: cast.owner })).json()) as unknown[]).length;

  it('CSV import: a wrong content type is 415 naming the header', async () => {
    const res = await api(importUrl(), { method: 'POST', session: cast.owner, body: 'name,watts\nFan,10\n', headers: { 'content-type': 'application/pdf' } });
    expect(res.status).toBe(415);
    expect(((await res.json()) as { issues: { path: string }[] }).issues[0]!.path).toBe('(headers).content-type');
  });

  it('CSV import: over 1 MB is 413, with or without a Content-Length, and nothing is saved', async () => {
    const before = await loadCount();
    const big = 'name,watts\n' + 'Fan,10\n'.repeat(160_000);
    expect(await rawPost(importUrl(), { 'content-type': 'text/csv', 'content-length': String(Buffer.byteLength(big)) }, [big])).toBe(413);
    // Chunked, no Content-Length: the limit holds while reading.
    expect(await rawPost(importUrl(), { 'content-type': 'text/csv' }, [big.slice(0, 600_000), big.slice(600_000)])).toBe(413);
    expect(await loadCount()).toBe(before);
  });

  it('CSV import: binary garbage is a 4xx and saves nothing', async () => {
    const before = await loadCount();
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ minLength: 1, maxLength: 2000 }), fc.constantFrom('text/csv', 'text/plain', 'application/json'), async (bytes, type) => {
        const res = await api(importUrl(), { method: 'POST', session: cast.owner, body: bytes, headers: { 'content-type': type } });
        expect(res.status).toBeGreaterThanOrEqual(400);
        expect(res.status).toBeLessThan(500);
      }),
      { numRuns: 40 },
    );
    expect(await loadCount()).toBe(before);
  });

  it('monitor log: wrong type, garbage, a broken form and an oversized file are 4xx and save nothing', async () => {
    const url = `/api/rigs/${w.rig.id}/monitor-logs`;
    const count = async () => ((await (await api(url, { session: cast.owner })).json()) as unknown[]).length;
    const before = await count();
    const good = monitorLogUpload(true);
    const cases: { body: BodyInit; type: string }[] = [
      { body: good.body, type: 'text/csv' },
      { body: 'not a form at all', type: good.contentType },
      { body: good.body.replace('sunreckon-matrix-boundary--', 'x'), type: 'multipart/form-data; boundary=other' },
      { body: good.body.replace('2027-10-20 22:00:00,13.2', '\u0000\u0001\u00ff,\u0007'), type: good.contentType },
    ];
    for (const c of cases) {
      const res = await api(url, { method: 'POST', session: cast.owner, body: c.body, headers: { 'content-type': c.type } });
      expect(res.status, await res.clone().text()).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
    }
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ minLength: 1, maxLength: 3000 }), async (bytes) => {
        const form = new FormData();
        form.set('file', new Blob([bytes], { type: 'text/csv' }), 'garbage.csv');
        form.set('timeZone', 'America/Phoenix');
        const res = await api(url, { method: 'POST', session: cast.owner, body: form });
        expect(res.status).toBeLessThan(500);
      }),
      { numRuns: 25 },
    );
    const huge = new FormData();
    huge.set('file', new Blob([new Uint8Array(11 * 1024 * 1024).fill(0x41)], { type: 'text/csv' }), 'huge.csv');
    const res = await api(url, { method: 'POST', session: cast.owner, body: huge });
    expect(res.status).toBe(413);
    expect(await count()).toBe(before);
  });
});

/** A cell a spreadsheet would run: starts with = + - @ TAB or CR, and is not a plain number. */
function runnable(cell: string): boolean {
  return /^[=+\-@\t\r]/.test(cell) && !/^-?\d+(\.\d+)?([eE][+-]?\d+)?$/.test(cell);
}

const formulaText = fc
  .tuple(fc.constantFrom('=', '+', '-', '@', '\t', '\r', '-1+', '=cmd|', '+1-', '-2+3', '@SUM('), printable)
  .map(([head, tail]) => (head + tail).slice(0, 60))
  .filter((s) => s.trim().length > 0);

describe('formulas are never exported runnable', () => {
  it('loads.csv escapes formula-like names and notes', async () => {
    const w = await makeWorld(cast);
    await fc.assert(
      fc.asyncProperty(formulaText, formulaText, async (name, note) => {
        const made = await api(`/api/rigs/${w.rig.id}/loads`, { method: 'POST', session: cast.owner, json: { name, note, watts: 12 } });
        if (made.status !== 201) {
          // Refused input names its field and saves nothing.
          expect(made.status, await made.text()).toBe(400);
          return;
        }
        const { id } = (await made.json()) as { id: string };
        const csv = await (await api(`/api/rigs/${w.rig.id}/loads.csv`, { session: cast.owner })).text();
        const rows = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true }).data;
        for (const row of rows) for (const cell of row) expect(runnable(cell), JSON.stringify(cell)).toBe(false);
        await api(`/api/loads/${id}?version=1`, { method: 'DELETE', session: cast.owner });
      }),
      { numRuns: 40 },
    );
  }, 120_000);

  it('hourly.csv escapes a formula-like stop name', async () => {
    const w = await makeWorld(cast);
    await fc.assert(
      fc.asyncProperty(formulaText, async (stopName) => {
        const trip = await api('/api/trips', {
          method: 'POST',
          session: cast.owner,
          json: { rigId: w.rig.id, name: 'Formula trip', stops: [{ name: stopName, lat: 36.1, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-20', nights: 1 }] },
        });
        if (trip.status !== 201) {
          expect(trip.status, await trip.text()).toBe(400);
          return;
        }
        const { id } = (await trip.json()) as { id: string };
        const run = await api(`/api/trips/${id}/forecasts`, { method: 'POST', session: cast.owner, json: {} });
        expect(run.status).toBe(201);
        const f = (await run.json()) as { id: string };
        const csv = await (await api(`/api/forecasts/${f.id}/hourly.csv`, { session: cast.owner })).text();
        const rows = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true }).data;
        expect(rows.length).toBeGreaterThan(1);
        for (const row of rows) for (const cell of row) expect(runnable(cell), JSON.stringify(cell)).toBe(false);
      }),
      { numRuns: 15 },
    );
  }, 120_000);
});

describe('sign-in redirect and names (issue 15)', () => {
  // Characters that turn a path into another site or a broken header once a browser has read it.
  const tricky = fc.constantFrom('/', '\\', '%09', '%0A', '%0D', '%00', '%2F', '%5C', '\t', '@', ':', '.', 'evil.example', '//', '%2F%2F', '?', '#', 'é', '%E2%80%AE', ' ');
  const nextArb = fc.oneof(fc.array(tricky, { maxLength: 8 }).map((a) => a.join('')), printable);

  it('next= never leaves our origin and never answers 5xx', async () => {
    const s = cast.owner;
    const origin = new URL(baseUrl());
    let redirected = 0;
    await fc.assert(
      fc.asyncProperty(nextArb, fc.constantFrom('/sign-in', '/sign-up'), async (next, page) => {
        const res = await api(`${page}?next=${next}`, { session: s });
        // A malformed query (a lone "%") is refused before the page runs: a 4xx, never a 5xx.
        expect(res.status).toBeLessThan(500);
        if (res.status !== 302) return;
        redirected++;
        const location = res.headers.get('location') ?? '';
        // As a browser reads it: tabs and line breaks dropped, then resolved against our origin.
        const seen = new URL(location.replace(/[\t\n\r]/g, ''), origin);
        expect(seen.origin, location).toBe(origin.origin);
      }),
      { numRuns: 150 },
    );
    // Most inputs reach the page: the property is about redirects, not refusals.
    expect(redirected).toBeGreaterThan(100);
  });

  it('any name to sign-up and update-user is stored trimmed within 1–80 characters or refused with a 4xx', async () => {
    const s = await signUp({ name: 'Name Fuzz' });
    const nameArb = fc.oneof(fc.string({ maxLength: 120 }), fc.string({ unit: 'binary', maxLength: 120 }), fc.jsonValue({ maxDepth: 1 }));
    await fc.assert(
      fc.asyncProperty(nameArb, async (name) => {
        const res = await api('/api/auth/update-user', { method: 'POST', session: s, json: { name } });
        expect(res.status).toBeLessThan(500);
        const db = openTestDb();
        const stored = (db.prepare('select name from user where id = ?').get(s.userId) as { name: string }).name;
        db.close();
        expect(stored.length).toBeGreaterThanOrEqual(1);
        expect(stored.length).toBeLessThanOrEqual(80);
        expect(stored).toBe(stored.trim());
        if (res.status === 200) expect(stored).toBe((name as string).trim());
      }),
      { numRuns: 120 },
    );
  });
});
