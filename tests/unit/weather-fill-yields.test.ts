import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Kysely } from 'kysely';
import { createDb } from '../../db/client';
import { migrateToLatest } from '../../db/migrate';
import type { DB } from '../../db/schema';
import { fillTripWeather, type WeatherConfig } from '../../src/server/weather';
import type { StopLike } from '../../src/domain/weather/weather';
import { startFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';

// Turning a long trip's hourly series into stop-days is CPU work on the request thread: it must
// let other requests run between stops and past years instead of mapping the whole trip in one
// go. Seen from outside: a task queued with setImmediate keeps getting turns while a fill that the
// cache answers entirely (no network, so no other reason to wait) is under way.

let fake: FakeWeather;
let db: Kysely<DB>;
let dir: string;
let config: WeatherConfig;
const DAY = 86_400_000;
const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** A far trip of four stops, 15 nights each (60 nights), 4 months ahead. */
const longTrip: StopLike[] = [0, 1, 2, 3].map((i) => ({
  name: `Long camp ${i + 1}`,
  lat: 37 + i,
  lon: -111 + i,
  timeZone: 'America/Denver',
  arrive: iso(Date.now() + (120 + i * 15) * DAY),
  nights: 15,
}));

beforeAll(async () => {
  fake = await startFakeWeather({ quiet: true });
  dir = mkdtempSync(path.join(os.tmpdir(), 'sunreckon-fill-yields-'));
  db = createDb(path.join(dir, 'fill.sqlite')).db;
  await migrateToLatest(db);
  config = { forecastUrl: fake.forecastUrl, archiveUrl: fake.archiveUrl, timeoutMs: 5000 };
});
afterAll(async () => {
  await db.destroy();
  await fake.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe('filling a long trip', () => {
  it('gives other work a turn between stops and past years while it maps the series', async () => {
    const first = await fillTripWeather(db, longTrip, config);
    expect(first.status).toBe('ok');
    expect(first.pastYears).toHaveLength(10);

    let turns = 0;
    let running = true;
    const other = () => {
      turns++;
      if (running) setImmediate(other);
    };
    setImmediate(other);
    const again = await fillTripWeather(db, longTrip, config);
    running = false;
    expect(again.requests.fromCache).toBe(again.requests.total);
    expect(again.stops.flatMap((s) => s.days).every((d) => d.source === 'past-year')).toBe(true);
    // At least one turn per stop of each past year (4 × 10), not one for the whole trip.
    expect(turns).toBeGreaterThanOrEqual(40);
  });
});
