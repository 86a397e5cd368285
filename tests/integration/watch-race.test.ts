import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeWeather, turnFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';
import { uniqueEmail } from '../helpers/api';
import { cleanup, startServer, type RunningServer } from '../helpers/server';

// The last guard against telling one change twice, without the lease and the per-trip claim in
// front of it: five runs of the same trip at the same moment, in this process (the app's own
// modules, the worker pool, the real database of a built server: SQLite here, PostgreSQL in
// `npm run test:integration:pg`). Each run saves its forecast, but only the one whose transaction
// still finds the answer seen it compared with writes the notice and queues the e-mails.

let server: RunningServer;
let weather: FakeWeather;

type Db = import('kysely').Kysely<import('../../db/schema').DB>;
let db: Db;
let closeDb: () => Promise<void>;
let runWatchedTrip: typeof import('../../src/server/watch-run').runWatchedTrip;

beforeAll(async () => {
  weather = await startFakeWeather({ quiet: true });
  server = await startServer({ WEATHER_FORECAST_URL: weather.forecastUrl, WEATHER_ARCHIVE_URL: weather.archiveUrl });
  // The app's modules read their settings on import: this test's database and fake weather, no mail server.
  const onPostgres = /^postgres(ql)?:\/\//.test(server.dbPath);
  if (onPostgres) process.env.DATABASE_URL = server.dbPath;
  else process.env.DATABASE_PATH = server.dbPath;
  process.env.WEATHER_FORECAST_URL = weather.forecastUrl;
  process.env.WEATHER_ARCHIVE_URL = weather.archiveUrl;
  process.env.BETTER_AUTH_SECRET = 'test-secret-test-secret-test-secret-0001';
  delete process.env.SMTP_URL;
  const app = await import('../../src/server/db');
  db = app.db;
  closeDb = () => app.database.close();
  ({ runWatchedTrip } = await import('../../src/server/watch-run'));
}, 180_000);

afterAll(async () => {
  await closeDb?.();
  await server?.stop();
  await weather?.stop();
  if (server) cleanup(server.dir);
});

async function call(path: string, init: { method?: string; cookie?: string; json?: unknown } = {}): Promise<Response> {
  const headers: Record<string, string> = { origin: server.url };
  if (init.cookie) headers.cookie = init.cookie;
  if (init.json !== undefined) headers['content-type'] = 'application/json';
  return fetch(`${server.url}${path}`, { method: init.method ?? 'GET', headers, body: init.json === undefined ? undefined : JSON.stringify(init.json) });
}

describe('trip watch, runs racing', () => {
  it('five runs of one trip at once tell its change once', async () => {
    const email = uniqueEmail('race');
    const su = await call('/api/auth/sign-up/email', { method: 'POST', json: { name: 'Race Owner', email, password: 'race-race-race-1', kind: 'camper' } });
    expect(su.status).toBe(200);
    const cookie = su.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const rig = (await (
      await call('/api/rigs', {
        method: 'POST',
        cookie,
        json: { name: 'Race van', bank: { chemistry: 'lifepo4', capacityAh: 100, nominalVolts: 12.8 }, arrays: [{ name: 'Roof', ratedWatts: 300, tiltDeg: 0, azimuthDeg: 180, controller: 'mppt' }] },
      })
    ).json()) as { id: string };
    expect((await call(`/api/rigs/${rig.id}/loads`, { method: 'POST', cookie, json: { name: 'Compressor fridge', watts: 45, dutyPct: 40 } })).status).toBe(201);
    const arrive = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
    const made = await call('/api/trips', { method: 'POST', cookie, json: { rigId: rig.id, name: 'Race loop', stops: [{ name: 'Flat camp', lat: 32.6, lon: -111.9, timeZone: 'America/Phoenix', arrive, nights: 4 }] } });
    expect(made.status).toBe(201);
    const tripId = ((await made.json()) as { id: string }).id;
    const trip = await db.selectFrom('trips').selectAll().where('id', '=', tripId).executeTakeFirstOrThrow();
    const rigRow = await db.selectFrom('rigs').selectAll().where('id', '=', rig.id).executeTakeFirstOrThrow();

    // The answer the crew sees, in the fake's normal weather.
    await turnFakeWeather(weather.url, 'normal');
    const t0 = Date.now();
    expect(await runWatchedTrip(db, trip, rigRow, new Date(t0), server.url)).toEqual({ ran: true, changed: false, mailed: 0 });

    await turnFakeWeather(weather.url, 'storm');
    try {
      const at = new Date(t0 + 6 * 3_600_000);
      // All five have read the answer seen (the normal weather's) before any of them writes.
      let waiting = 0;
      let release!: () => void;
      const together = new Promise<void>((resolve) => (release = resolve));
      const compared = async () => {
        if (++waiting === 5) release();
        await together;
      };
      const results = await Promise.all(Array.from({ length: 5 }, () => runWatchedTrip(db, trip, rigRow, at, server.url, { compared })));
      expect(results.filter((r) => r.ran)).toHaveLength(5);
      expect(results.filter((r) => r.changed)).toHaveLength(1);
      expect(results.reduce((n, r) => n + r.mailed, 0)).toBe(1);
    } finally {
      await turnFakeWeather(weather.url, 'normal');
    }
    const queued = await db.selectFrom('outbox').select('id').where('to_address', '=', email).where('kind', '=', 'trip-watch').execute();
    expect(queued).toHaveLength(1);
    const runs = await db.selectFrom('watch_runs').select(['changed']).where('trip_id', '=', tripId).execute();
    expect(runs).toHaveLength(6);
    expect(runs.filter((r) => Boolean(r.changed))).toHaveLength(1);
    const forecasts = await db.selectFrom('forecasts').select('id').where('trip_id', '=', tripId).where('kind', '=', 'watch').execute();
    expect(forecasts).toHaveLength(6);
  });
});
