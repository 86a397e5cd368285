import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { startMailCatcher } from '../../src/server/mail-catcher';
import { startFakeWeather } from '../../scripts/fakes/weather';
import { buildOnce, cleanup, freshTestDatabase, startServer } from './server';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    dbPath: string;
    smtpUrl: string;
    /** The local fake weather service's base URL (its /__fake/ controls are there). */
    weatherUrl: string;
  }
}

/**
 * Global setup of the integration and e2e suites: the real built server on a throw-away database,
 * sending its mail over SMTP to a real local catcher that stores it in the same database, and
 * asking the local fake weather service for weather.
 */
export default async function setup(project: TestProject) {
  buildOnce();
  const dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-test-'));
  // A SQLite file, or a fresh PostgreSQL database's URL when the suite runs on PostgreSQL.
  const dbPath = await freshTestDatabase(dir);
  const catcher = await startMailCatcher({ dbPath, quiet: true });
  const weather = await startFakeWeather({ quiet: true });
  const server = await startServer({ SMTP_URL: catcher.url, WEATHER_FORECAST_URL: weather.forecastUrl, WEATHER_ARCHIVE_URL: weather.archiveUrl }, { dir, dbPath }).catch(async (err: unknown) => {
    await catcher.stop();
    await weather.stop();
    throw err;
  });
  project.provide('baseUrl', server.url);
  project.provide('dbPath', server.dbPath);
  project.provide('smtpUrl', catcher.url);
  project.provide('weatherUrl', weather.url);
  return async () => {
    // SUNRECKON_TEST_LOGS=1 prints the shared server's output (its errors behind a 500) at the end.
    if (process.env.SUNRECKON_TEST_LOGS === '1') console.log(server.logs());
    await server.stop();
    await catcher.stop();
    await weather.stop();
    cleanup(server.dir);
  };
}
