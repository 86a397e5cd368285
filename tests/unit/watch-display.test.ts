import { describe, expect, it } from 'vitest';
import { zoneClock } from '../../src/lib/clock';
import {
  bandSentence,
  dateIn,
  formatCutoff,
  formatInstant,
  formatInstantNamed,
  isWorse,
  runSentence,
  startsSentence,
  windowState,
} from '../../src/features/watch/watch-display';
import type { WatchRun } from '../../src/features/watch/watch.api';

// The trip watch panel's words: times in an explicit zone (the same text on the server and in the
// browser), the cutoff in the stop's own offset, the window, and the band's narrowing.

function run(over: Partial<WatchRun>): WatchRun {
  return {
    forecastId: 'f1',
    ranAt: '2026-12-05T16:00:00.000Z',
    verdict: 'makes-it',
    minSocPct: 41.4,
    firstCutoffAt: null,
    firstCutoffLocal: null,
    changed: false,
    reason: null,
    band: null,
    ...over,
  };
}

describe('trip watch panel words', () => {
  it('writes an instant in the zone given, whatever the runtime zone', () => {
    // 16:00 UTC on Sat 5 Dec is 09:00 in Denver (MST, UTC−7) and 03:00 on Sun 6 Dec in Sydney (AEDT, UTC+11).
    expect(formatInstant('2026-12-05T16:00:00.000Z', 'America/Denver')).toBe('Sat 5 Dec, 09:00');
    expect(formatInstant('2026-12-05T16:00:00.000Z', 'Australia/Sydney')).toBe('Sun 6 Dec, 03:00');
    expect(dateIn('2026-12-05T16:00:00.000Z', 'Australia/Sydney')).toBe('2026-12-06');
    expect(dateIn('2026-12-05', 'Australia/Sydney')).toBe('2026-12-05');
    // The same from a zone clock handed over by the server (its offsets as plain JSON).
    const denver = zoneClock('America/Denver', Date.parse('2026-12-04T00:00:00Z'));
    expect(formatInstant('2026-12-05T16:00:00.000Z', denver)).toBe('Sat 5 Dec, 09:00');
    expect(formatInstantNamed('2026-12-05T16:00:00.000Z', denver)).toBe('Sat 5 Dec, 09:00 Denver time (UTC−07:00)');
    // In July Denver keeps daylight time, UTC−06:00: 16:00 UTC is 10:00.
    expect(formatInstantNamed('2027-07-05T16:00:00.000Z', denver)).toBe('Mon 5 Jul, 10:00 Denver time (UTC−06:00)');
    expect(formatInstantNamed('2026-12-05T16:00:00.000Z', 'UTC')).toBe('Sat 5 Dec, 16:00 UTC');
  });

  it('reads the cutoff from the row time’s own wall clock and offset, not the zone of the page', () => {
    // A cutoff at a stop in Arizona (UTC−7 all year) on a trip that starts in Denver.
    expect(formatCutoff(run({ firstCutoffAt: '2026-12-11T03:00-07:00', firstCutoffLocal: 'Fri 11 Dec, 03:00' }))).toBe(
      'Fri 11 Dec, 03:00 (UTC−07:00)',
    );
    // Without a row time, the server's own words stand.
    expect(formatCutoff(run({ firstCutoffAt: null, firstCutoffLocal: 'Fri 11 Dec, 03:00' }))).toBe('Fri 11 Dec, 03:00');
    expect(formatCutoff(run({}))).toBeNull();
  });

  it('places now before, during or after the watch window', () => {
    const w = { from: '2026-12-03T07:00:00.000Z', to: '2026-12-24T19:00:00.000Z' };
    expect(windowState(w, Date.parse('2026-12-03T06:59:59Z'))).toBe('before');
    expect(windowState(w, Date.parse('2026-12-03T07:00:00Z'))).toBe('during');
    expect(windowState(w, Date.parse('2026-12-24T19:00:00Z'))).toBe('after');
    // 07:00 UTC on 3 Dec is local midnight in Denver: the date said is 3 Dec there, 2 Dec in Honolulu.
    expect(startsSentence(w, 'America/Denver')).toBe('The watch starts 16 days before you arrive: on Thu 3 Dec.');
    expect(startsSentence(w, 'Pacific/Honolulu')).toBe('The watch starts 16 days before you arrive: on Wed 2 Dec.');
  });

  it('ranks a change as worse only when the verdict moves toward running out', () => {
    expect(isWorse('makes-it', 'runs-out')).toBe(true);
    expect(isWorse('below-reserve', 'runs-out')).toBe(true);
    expect(isWorse('runs-out', 'makes-it')).toBe(false);
    expect(isWorse('makes-it', 'makes-it')).toBe(false);
    expect(isWorse(null, 'runs-out')).toBe(false);
  });

  it('says each run in words: the verdict, its cutoff or lowest, and whether it changed', () => {
    expect(runSentence(run({}), 'America/Denver')).toBe('Sat 5 Dec, 09:00: Makes it, lowest 41 %');
    expect(runSentence(run({ verdict: 'runs-out', firstCutoffAt: '2026-12-11T03:00-07:00', changed: true }), 'America/Denver')).toBe(
      'Sat 5 Dec, 09:00: Runs out Fri 11 Dec, 03:00 (UTC−07:00) (changed)',
    );
  });

  it('says how the band narrowed between the first and the latest run', () => {
    expect(bandSentence([run({})])).toBeNull();
    expect(bandSentence([run({ band: { lowSocPct: 30, highSocPct: 70 } })])).toBe(
      'The lowest state of charge lies between 30 % and 70 % on the one run so far.',
    );
    const runs = [
      run({ forecastId: 'a', band: { lowSocPct: 22, highSocPct: 78 } }),
      run({ forecastId: 'b', band: null }),
      run({ forecastId: 'c', band: { lowSocPct: 35, highSocPct: 55 } }),
    ];
    // Spread 78 − 22 = 56 points at the first run, 55 − 35 = 20 at the latest; two runs have a band.
    expect(bandSentence(runs)).toBe(
      'The lowest state of charge lay between 22 % and 78 % at the first run and between 35 % and 55 % at the latest: the band narrowed from 56 to 20 points over 2 runs.',
    );
    expect(bandSentence([runs[2]!, runs[0]!])).toMatch(/widened from 20 to 56 points over 2 runs\.$/);
  });
});
