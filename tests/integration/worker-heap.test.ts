import { readdirSync, readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, startServer, type RunningServer } from '../helpers/server';

/** server.mjs caps each worker process's V8 old space (SUNRECKON_HEAP_MB, default 192 MB). */

let server: RunningServer | null = null;

afterEach(async () => {
  if (!server) return;
  await server.stop();
  cleanup(server.dir);
  server = null;
});

/** The command lines of the server's worker processes (children of the primary). */
function workerCommandLines(primary: number): string[][] {
  const out: string[][] = [];
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      if (Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) !== primary) continue;
      out.push(readFileSync(`/proc/${d}/cmdline`, 'utf8').split('\0').filter(Boolean));
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

describe('the worker processes’ heap', () => {
  it('is capped at 192 MB by default and at SUNRECKON_HEAP_MB when set; the server still answers', async () => {
    server = await startServer({ WEB_CONCURRENCY: '2' });
    const byDefault = workerCommandLines(server.child.pid!);
    expect(byDefault).toHaveLength(2);
    for (const argv of byDefault) expect(argv).toContain('--max-old-space-size=192');
    expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
    await server.stop();
    cleanup(server.dir);

    server = await startServer({ WEB_CONCURRENCY: '2', SUNRECKON_HEAP_MB: '256' });
    const set = workerCommandLines(server.child.pid!);
    expect(set).toHaveLength(2);
    for (const argv of set) expect(argv).toContain('--max-old-space-size=256');
    expect((await fetch(`${server.url}/sign-in`)).status).toBe(200);
  });

  it('0 leaves V8’s own limit; a value it cannot use stops the server with a message naming it', async () => {
    server = await startServer({ WEB_CONCURRENCY: '2', SUNRECKON_HEAP_MB: '0' });
    for (const argv of workerCommandLines(server.child.pid!)) expect(argv.join(' ')).not.toContain('--max-old-space-size');
    await server.stop();
    cleanup(server.dir);
    server = null;
    await expect(startServer({ WEB_CONCURRENCY: '2', SUNRECKON_HEAP_MB: 'lots' })).rejects.toThrow(/SUNRECKON_HEAP_MB must be 0 or a whole number/);
  });
});
