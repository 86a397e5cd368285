import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Issue 16, item 17: one in-page confirmation everywhere (components/ui/AskFirst.tsx), never the
// browser's own confirm box, which looks foreign, cannot show what goes with a deletion and blocks the page.

const SRC = path.resolve(import.meta.dirname, '../../src');

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = path.join(dir, name);
    return statSync(p).isDirectory() ? files(p) : /\.(tsx?|astro|mjs|js)$/.test(name) ? [p] : [];
  });
}

describe('confirmations', () => {
  it('no source file opens the browser’s confirm box', () => {
    const offenders = files(SRC).flatMap((f) =>
      readFileSync(f, 'utf8')
        .split('\n')
        .map((line, i) => ({ line, at: `${path.relative(SRC, f)}:${i + 1}` }))
        .filter(({ line }) => /(^|[^\w.])(window\.)?confirm\s*\(/.test(line) && !/^\s*(\/\/|\*)/.test(line))
        .map(({ at }) => at),
    );
    expect(offenders).toEqual([]);
  });
});
