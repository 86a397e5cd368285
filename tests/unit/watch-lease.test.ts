// The watch's lease through the database: two server instances (two connections to one SQLite file,
// as two processes would have) never both hold the work at once; an expired lease passes on.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createDb } from '../../db/client';
import { migrateToLatest } from '../../db/migrate';
import { claimLease, releaseLease } from '../../src/server/watch';

describe('watch lease', () => {
  let dir = '';
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('goes to one instance at a time and passes on when it expires or is released', async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-lease-'));
    const file = path.join(dir, 't.sqlite');
    const a = createDb(file).db;
    await migrateToLatest(a);
    const b = createDb(file).db;
    const t = Date.UTC(2026, 11, 4, 12);
    const lease = 60_000;

    const [gotA, gotB] = await Promise.all([claimLease(a, 'watch-run', 'A', t, lease), claimLease(b, 'watch-run', 'B', t, lease)]);
    expect([gotA, gotB].filter(Boolean)).toHaveLength(1);
    const winner = gotA ? 'A' : 'B';
    const [win, lose] = gotA ? [a, b] : [b, a];
    const loser = gotA ? 'B' : 'A';

    expect(await claimLease(lose, 'watch-run', loser, t + lease - 1, lease)).toBe(false);
    expect(await claimLease(win, 'watch-run', winner, t + 1000, lease)).toBe(true);
    expect(await claimLease(lose, 'watch-run', loser, t + 1000 + lease, lease)).toBe(true);
    expect(await claimLease(win, 'watch-run', winner, t + 1000 + lease + 1, lease)).toBe(false);

    await releaseLease(lose, 'watch-run', loser);
    expect(await claimLease(win, 'watch-run', winner, t + 1000 + lease + 2, lease)).toBe(true);
    await a.destroy();
    await b.destroy();
  });
});
