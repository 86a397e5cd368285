import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { api } from '../helpers/api';
import { ACTORS, LISTS, ROUTES, type Actor, type Cast, type RouteCase, type World } from '../helpers/routes';
import { ROOT } from '../helpers/server';
import { makeCast, makeWorld, sessionOf } from '../helpers/world';

// Authorization is enforced on the server for every API route: each route of the table in
// tests/helpers/routes.ts, for each kind of caller, answers exactly the expected status. A row of
// another crew is 404 — never a 403 that would reveal that it exists.

let cast: Cast;
let shared: World;

beforeAll(async () => {
  cast = await makeCast();
  shared = await makeWorld(cast);
}, 120_000);

async function call(rc: RouteCase, w: World, actor: Actor): Promise<Response> {
  const session = sessionOf(w.cast, actor);
  if (rc.raw) return api(rc.url(w), { method: rc.method, session, body: rc.raw.body, headers: { 'content-type': rc.raw.contentType } });
  const json = rc.body ? await rc.body(w) : undefined;
  return api(rc.url(w), { method: rc.method, session, json });
}

describe.each(ROUTES)('$method $route', (rc) => {
  it.each(ACTORS)('%s', async (actor) => {
    const w = rc.fresh ? await makeWorld(cast, rc.needs) : { ...shared, member: undefined };
    const res = await call(rc, w, actor);
    const text = await res.text();
    expect(res.status, `${rc.method} ${rc.url(w)} as ${actor}: ${text.slice(0, 300)}`).toBe(rc.expect[actor]);
    if (res.status >= 400) {
      // One error envelope everywhere, with the code that matches the status.
      const code = ({ 401: 'unauthorized', 403: 'forbidden', 404: 'not_found' } as Record<number, string>)[res.status];
      if (code && rc.route !== '/api/auth/[...all]') expect(JSON.parse(text)).toMatchObject({ error: { code } });
    }
  });
});

describe('lists show the crew’s rows to exactly those who may read them', () => {
  describe.each(LISTS)('$url', (list) => {
    it.each(ACTORS.filter((a) => a !== 'anonymous'))('%s', async (actor) => {
      const res = await api(list.url, { session: sessionOf(cast, actor) });
      const body = res.status === 200 ? await res.json() : null;
      expect(list.find(body, shared)).toBe(list.visibleTo.includes(actor));
    });
  });
});

/** `METHOD /api/route` for every handler exported by a file under src/pages/api. */
function routesInApp(): string[] {
  const base = path.join(ROOT, 'src/pages');
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const file = path.join(dir, name);
      if (statSync(file).isDirectory()) walk(file);
      else if (/\.(ts|js)$/.test(name)) {
        const route = '/' + path.relative(base, file).replace(/\\/g, '/').replace(/\.(ts|js)$/, '').replace(/\/index$/, '');
        const src = readFileSync(file, 'utf8');
        const methods = [...src.matchAll(/export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE|ALL)\b/g)].map((m) => m[1]!);
        for (const m of methods) out.push(`${m} ${route}`);
      }
    }
  };
  walk(path.join(base, 'api'));
  return out.sort();
}

describe('the route table', () => {
  it('lists every method of every API route in the app (add new routes to tests/helpers/routes.ts)', () => {
    const table = new Set(ROUTES.map((r) => `${r.method} ${r.route}`));
    const missing = routesInApp().filter((r) => {
      const [method, route] = r.split(' ');
      return method === 'ALL' ? !ROUTES.some((x) => x.route === route) : !table.has(r);
    });
    expect(missing).toEqual([]);
  });

  it('lists no route that the app does not have', () => {
    const app = routesInApp();
    const stale = ROUTES.filter((r) => !app.includes(`${r.method} ${r.route}`) && !app.includes(`ALL ${r.route}`)).map((r) => `${r.method} ${r.route}`);
    expect(stale).toEqual([]);
  });
});
