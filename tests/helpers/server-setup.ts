import type { TestProject } from 'vitest/node';
import { buildOnce, cleanup, startServer } from './server';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    dbPath: string;
  }
}

/** Global setup of the integration and e2e suites: the real built server on a throw-away database. */
export default async function setup(project: TestProject) {
  buildOnce();
  const server = await startServer();
  project.provide('baseUrl', server.url);
  project.provide('dbPath', server.dbPath);
  return async () => {
    await server.stop();
    cleanup(server.dir);
  };
}
