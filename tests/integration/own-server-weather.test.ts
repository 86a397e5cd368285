import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cleanup, startServer, type RunningServer } from '../helpers/server';
import { weatherEnvFor } from '../../scripts/fakes/weather';

// A server a test starts on its own (not the suite's shared one) still gets its weather from the
// local fake: startServer points every server at it, so no test asks the real weather service —
// not even when the shell's environment names it.

const DAY = 86_400_000;
const isoDay = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

let server: RunningServer;
const shellForecast = process.env.WEATHER_FORECAST_URL;
const shellArchive = process.env.WEATHER_ARCHIVE_URL;

beforeAll(async () => {
  // As if the shell pointed at a service: an address nothing listens on (a closed loopback port).
  process.env.WEATHER_FORECAST_URL = 'http://127.0.0.1:9/v1/forecast';
  process.env.WEATHER_ARCHIVE_URL = 'http://127.0.0.1:9/v1/archive';
  server = await startServer();
}, 60_000);

afterAll(async () => {
  if (shellForecast === undefined) delete process.env.WEATHER_FORECAST_URL;
  else process.env.WEATHER_FORECAST_URL = shellForecast;
  if (shellArchive === undefined) delete process.env.WEATHER_ARCHIVE_URL;
  else process.env.WEATHER_ARCHIVE_URL = shellArchive;
  await server?.stop();
  if (server) cleanup(server.dir);
});

async function call(path: string, init: RequestInit & { cookie?: string; json?: unknown } = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  headers.set('origin', server.url);
  if (init.cookie) headers.set('cookie', init.cookie);
  if (init.json !== undefined) headers.set('content-type', 'application/json');
  return fetch(`${server.url}${path}`, {
    ...init,
    headers,
    body: init.json !== undefined ? JSON.stringify(init.json) : init.body,
    redirect: 'manual',
  });
}

describe('a server started by a test of its own', () => {
  it("asks the local fake for its trips' weather", async () => {
    const { fake } = await weatherEnvFor();
    if (!fake) throw new Error('no shared fake');
    const before = (await (await fetch(`${fake.url}/__fake/stats`)).json()) as { forecast: number; archive: number };
    const signUp = await call('/api/auth/sign-up/email', {
      method: 'POST',
      json: { name: 'Own server camper', email: `own.${Date.now()}@example.test`, password: 'correct-horse-1', kind: 'camper' },
    });
    expect(signUp.status).toBe(200);
    const cookie = signUp.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
    const rig = await call('/api/rigs', {
      method: 'POST',
      cookie,
      json: { name: 'Own van', bank: { chemistry: 'lifepo4', capacityAh: 200, nominalVolts: 12.8 } },
    });
    expect(rig.status).toBe(201);
    const rigId = ((await rig.json()) as { id: string }).id;
    const trip = await call('/api/trips', {
      method: 'POST',
      cookie,
      json: {
        rigId,
        name: 'Own trip',
        stops: [{ name: 'Own camp', lat: 38.2, lon: -109.1, timeZone: 'America/Denver', arrive: isoDay(3), nights: 1 }],
      },
    });
    expect(trip.status).toBe(201);
    const tripId = ((await trip.json()) as { id: string }).id;
    const res = await call(`/api/trips/${tripId}/weather`, { cookie });
    expect(res.status).toBe(200);
    const fill = (await res.json()) as { status: string; message: string | null; stops: { days: { source: string }[] }[] };
    expect(fill.message).toBeNull();
    expect(fill.status).toBe('ok');
    expect(fill.stops[0]!.days.map((d) => d.source)).toEqual(['forecast', 'forecast']);
    const after = (await (await fetch(`${fake.url}/__fake/stats`)).json()) as { forecast: number; archive: number };
    expect(after.forecast).toBeGreaterThan(before.forecast);
  });
});
