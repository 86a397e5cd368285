import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { startMailCatcher } from '../../src/server/mail-catcher';
import { buildOnce, cleanup, startServer } from './server';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    dbPath: string;
    smtpUrl: string;
  }
}

/**
 * Global setup of the integration and e2e suites: the real built server on a throw-away database,
 * sending its mail over SMTP to a real local catcher that stores it in the same database.
 */
export default async function setup(project: TestProject) {
  buildOnce();
  const dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-test-'));
  const dbPath = path.join(dir, 'test.sqlite');
  const catcher = await startMailCatcher({ dbPath, quiet: true });
  const server = await startServer({ SMTP_URL: catcher.url }, { dir, dbPath }).catch(async (err: unknown) => {
    await catcher.stop();
    throw err;
  });
  project.provide('baseUrl', server.url);
  project.provide('dbPath', server.dbPath);
  project.provide('smtpUrl', catcher.url);
  return async () => {
    await server.stop();
    await catcher.stop();
    cleanup(server.dir);
  };
}
