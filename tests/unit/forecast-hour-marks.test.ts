// What the hourly chart shades (drive hours, hours the bank is cut off) and how the solar card names
// unused solar by cause (#16 item 10).
import { describe, expect, it } from 'vitest';
import type { Forecast } from '../../src/engine';
import { rowsOfDay } from '../../src/features/forecast/chart-data';
import {
  hourBands,
  isCutOff,
  isDriving,
  unusedSolarOf,
  unusedSolarSentence,
  unusedSolarShort,
} from '../../src/features/forecast/hour-marks';
import { basePlan, run } from '../reference/plan-helpers';

// 100 Ah LiFePO4 at 30 °C (capacity factor 1), Peukert off, no resistance, 15 % at 15:00 with a steady 128 W
// load: it reaches its 10 % floor inside the first hour (tests/unit/engine/cutoff.test.ts) and stays cut off
// (no panels). On 11 Jun a 2-hour drive from 08:00 with a 30 A alternator: the 08:00 hour starts cut off
// (10 % < 10 + 5), charges 30 × 0.99 = 29.7 Ah → 39.7 %, so the bank reconnects at 09:00.
const f = run(
  basePlan({
    bank: { chemistry: 'lifepo4', capacityAh: 100, peukertExponent: 1, floorSocPct: 10, internalResistanceMilliohm: 0, initialSocPct: 15 },
    loads: [{ name: '10 A', watts: 128 }],
    chargers: [{ kind: 'alternator', amps: 30 }],
    drives: [{ date: '2027-06-11', startHour: 8, hours: 2 }],
    tempC: 30,
    stop: { nights: 2 },
  }),
);
const day = (date: string) => rowsOfDay(f, date).map(({ row }) => row);

describe('bands of the hourly chart', () => {
  it('shades the first day cut off from 15:00 to midnight (positions 0–9) and no drive', () => {
    expect(hourBands(day('2027-06-10'), isCutOff)).toEqual([{ x1: 0, x2: 9 }]);
    expect(hourBands(day('2027-06-10'), isDriving)).toEqual([]);
  });

  it('shades the drive 08:00–10:00 and the cut-off hours 00:00–09:00 and 15:00–24:00 on the drive day', () => {
    // 09:00, still driving: 30 A in, 128 W / ~13.17 V = 9.72 A out, net 20.28 A × 0.99 = 20.08 Ah → 59.78 %.
    // From 10:00 the 128 W load alone: 59.78 → 10 % holds 260.49 (40→59.78 %: (13.13 + 13.209)/2 × 19.78)
    // + 261.3 + 77.4 + 50.72 = 649.9 Wh (mean OCV × points, as in cutoff.test.ts) = 5.08 h of 128 W, so
    // the floor comes at about 15:05: cut off again from the 15:00 hour to midnight.
    const rows = day('2027-06-11');
    expect(rows[0]?.time).toBe('2027-06-11T00:00-07:00');
    expect(hourBands(rows, isDriving)).toEqual([{ x1: 8, x2: 10 }]);
    expect(hourBands(rows, isCutOff)).toEqual([
      { x1: 0, x2: 9 },
      { x1: 15, x2: 24 },
    ]);
  });
});

describe('unused solar by cause', () => {
  const withSummary = (s: Partial<Forecast['summary']>): Forecast => ({ ...f, summary: { ...f.summary, ...s } });

  it('names each cause with its Wh, leaving out causes under 1 Wh', () => {
    expect(unusedSolarSentence(withSummary({ curtailedWh: 1234, curtailedFullWh: 1000, curtailedColdWh: 234, curtailedLimitWh: 0 }))).toBe(
      '1,234 Wh left unused: 1,000 Wh bank full, 234 Wh battery too cold to charge',
    );
  });

  it('says it short for the compare table: one cause by name, several with their Wh', () => {
    expect(unusedSolarShort(withSummary({ curtailedWh: 48, curtailedFullWh: 48, curtailedColdWh: 0, curtailedLimitWh: 0 }))).toBe(
      '48 Wh (bank full)',
    );
    expect(unusedSolarShort(withSummary({ curtailedWh: 300, curtailedFullWh: 200, curtailedColdWh: 100, curtailedLimitWh: 0 }))).toBe(
      '300 Wh (200 Wh bank full, 100 Wh battery too cold to charge)',
    );
    expect(unusedSolarShort(withSummary({ curtailedWh: 0 }))).toBe('0 Wh');
  });

  it('says when a saved forecast does not know why', () => {
    const old = withSummary({ curtailedWh: 300, curtailedColdWh: undefined, curtailedFullWh: undefined, curtailedLimitWh: undefined });
    expect(unusedSolarSentence(old)).toBe('300 Wh left unused (bank full or too cold: this saved forecast does not say which)');
    expect(unusedSolarSentence(withSummary({ curtailedWh: 0 }))).toBe('None left unused');
  });

  it('reads a row’s causes, or null for a row saved before the engine gave them', () => {
    const r = f.hourly[0]!;
    expect(unusedSolarOf({ ...r, curtailedFullWatts: 5, curtailedColdWatts: 7, curtailedLimitWatts: 0 })).toEqual({
      full: 5,
      cold: 7,
      limit: 0,
    });
    const { curtailedColdWatts: _c, ...old } = r;
    expect(unusedSolarOf(old)).toBeNull();
  });
});
