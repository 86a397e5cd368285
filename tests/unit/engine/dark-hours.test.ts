// The shortcut that skips solar sub-steps in dark hours must never skip an hour with sun in it.
import fc from 'fast-check';
import { getPosition } from 'suncalc';
import { describe, expect, it } from 'vitest';
import { darkBelowDeg, SUBSTEPS } from '../../../src/engine/prepare';

describe('darkBelowDeg', () => {
  it('an hour whose midpoint is below the threshold has the sun below the horizon at every sub-step', () => {
    let dark = 0;
    fc.assert(
      fc.property(
        fc.double({ min: -66, max: 66, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.integer({ min: Date.UTC(2020, 0, 1), max: Date.UTC(2040, 0, 1) }),
        (lat, lon, t0) => {
          const mid = getPosition(new Date(t0 + 1_800_000), lat, lon).altitude;
          if (mid >= darkBelowDeg(lat)) return;
          dark++;
          for (let k = 0; k <= SUBSTEPS; k++) {
            // Sub-step midpoints and both ends of the hour.
            const t = t0 + (k === SUBSTEPS ? 3_600_000 : ((k + 0.5) * 3_600_000) / SUBSTEPS);
            expect(getPosition(new Date(t), lat, lon).altitude).toBeLessThan(0);
          }
        },
      ),
      { numRuns: 2000 },
    );
    expect(dark).toBeGreaterThan(500);
  }, 30_000);

  it('holds on a dense sweep of hours starting near sunrise and sunset', () => {
    let nearThreshold = 0;
    for (const lat of [-60, -35, 0, 20, 38, 50, 60, 66]) {
      for (const [m, d] of [[0, 5], [2, 20], [5, 21], [8, 23], [11, 21]]) {
        for (let minute = 0; minute < 1440; minute += 2) {
          const t0 = Date.UTC(2027, m, d, 0, minute);
          const thr = darkBelowDeg(lat);
          const mid = getPosition(new Date(t0 + 1_800_000), lat, 10).altitude;
          if (mid >= thr || mid < thr - 1) continue;
          nearThreshold++;
          let max = -90;
          for (let k = 0; k <= 60; k++) max = Math.max(max, getPosition(new Date(t0 + k * 60_000), lat, 10).altitude);
          expect(max).toBeLessThan(0);
        }
      }
    }
    expect(nearThreshold).toBeGreaterThan(50);
  }, 30_000);

  it('is about −8.2° at the equator and −6.5° at 38° N', () => {
    expect(darkBelowDeg(0)).toBeCloseTo(-8.15, 2);
    expect(darkBelowDeg(38)).toBeCloseTo(-6.55, 2);
  });
});
