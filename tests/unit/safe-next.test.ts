import { describe, expect, it } from 'vitest';
import { safeNext } from '../../src/lib/auth-client';

describe('safeNext: where a sign-in may send the camper next', () => {
  it('keeps a same-site path with its query and fragment', () => {
    expect(safeNext('/rigs/abc?tab=loads#logs')).toBe('/rigs/abc?tab=loads#logs');
  });

  it.each(['/.//evil.example', '/./\\evil.example', '/a/..//evil.example', '/.//', '/x/../..//evil.example'])(
    'refuses %s, whose dot segments resolve to a path a browser reads as another site',
    (raw) => {
      expect(safeNext(raw)).toBe('/trips');
    },
  );

  it('resolves harmless dot segments to the plain path', () => {
    expect(safeNext('/rigs/./abc/../def')).toBe('/rigs/def');
  });
});
