// What changed between two saved forecasts (#16 item 11), and their names in the first stop's local time.
import { describe, expect, it } from 'vitest';
import { snapshotDiff } from '../../src/domain/forecasts/snapshot-diff';
import { defaultSnapshotName, distinctNames, snapshotLabel, snapshotTime } from '../../src/domain/forecasts/snapshot-name';
import type { WeatherSources } from '../../src/domain/weather/band';
import { basePlan, resolved } from '../reference/plan-helpers';

const older = resolved(
  basePlan({
    bank: { chemistry: 'lifepo4', capacityAh: 200, initialSocPct: 90 },
    arrays: [{ name: 'Roof', ratedWatts: 400 }],
    chargers: [{ kind: 'alternator', amps: 30 }],
    loads: [
      { name: 'Fridge', watts: 45, dutyPct: 35, response: 'cooling' },
      { name: 'Hair dryer', watts: 1200, supply: 'ac', windows: [[7, 8]], dutyPct: 10 },
    ],
    stop: { name: 'Mesa camp', nights: 2 },
  }),
);

describe('differences between two snapshots', () => {
  it('finds nothing between a plan and itself', () => {
    expect(snapshotDiff({ plan: older, engineRevision: 2 }, { plan: structuredClone(older), engineRevision: 2 })).toEqual([]);
  });

  it('lists the bank, panels, chargers and loads added, removed and changed with old → new values', () => {
    const newer = structuredClone(older);
    newer.bank.capacityAh = 300;
    newer.bank.maxChargeAmps = 150; // the 0.5 C default follows the capacity: 0.5 × 300
    newer.arrays[0]!.ratedWatts = 600;
    newer.arrays.push({ ...newer.arrays[0]!, name: 'Suitcase', ratedWatts: 200 });
    newer.chargers = [];
    newer.loads = [
      { ...newer.loads[0]!, dutyPct: 50, windows: [[6, 22]] },
      { ...newer.loads[0]!, name: 'Coffee maker', watts: 900, supply: 'ac', windows: [[7, 8]], dutyPct: 25, response: 'none' },
    ];
    const diff = snapshotDiff({ plan: older }, { plan: newer });
    expect(diff.map((s) => s.title)).toEqual(['Bank', 'Panels', 'Chargers', 'Loads']);
    const lines = Object.fromEntries(diff.map((s) => [s.title, s.changes.map((c) => `${c.kind}: ${c.what}: ${c.detail}`)]));
    expect(lines.Bank).toEqual([
      'changed: Capacity: 200\u00a0Ah → 300\u00a0Ah',
      'changed: Maximum charge current: 100\u00a0A → 150\u00a0A',
    ]);
    expect(lines.Panels).toEqual(['changed: Roof: rated 400\u00a0W → 600\u00a0W', 'added: Suitcase: rated 200\u00a0W, controller MPPT']);
    expect(lines.Chargers).toEqual(['removed: Alternator (DC-DC charger): current 30\u00a0A']);
    expect(lines.Loads).toEqual([
      'changed: Fridge: hours 00:00–24:00 → 06:00–22:00; duty 35\u00a0% → 50\u00a0%',
      'removed: Hair dryer: watts 1,200\u00a0W, how many 1, supply AC (through the inverter), hours 07:00–08:00, duty 10\u00a0%',
      'added: Coffee maker: watts 900\u00a0W, how many 1, supply AC (through the inverter), hours 07:00–08:00, duty 25\u00a0%',
    ]);
  });

  it('names each stop-day whose weather or its source changed, in the reader’s units, and the engine revision', () => {
    const newer = structuredClone(older);
    const day = newer.stops[0]!.weather[1]!; // constantWeather: 25 °C high and low, 8 oktas, on 11 Jun 2027
    day.cloudOktas = 3;
    day.highC = 30; // 30 °C = 86 °F (× 9/5 + 32); 25 °C = 77 °F
    const sources = (d: 'typed' | 'forecast'): WeatherSources => ({
      kind: 'near',
      status: 'ok',
      message: null,
      medianYear: null,
      stops: [{ name: 'Mesa camp', days: [{ date: '2027-06-12', source: d }] }],
    });
    const diff = snapshotDiff(
      { plan: older, engineRevision: 1, weatherSources: sources('typed') },
      { plan: newer, engineRevision: 2, weatherSources: sources('forecast') },
      'imperial',
    );
    const weather = diff.find((s) => s.title === 'Weather')?.changes ?? [];
    expect(weather.map((c) => `${c.what}: ${c.detail}`)).toEqual([
      'Mesa camp, Fri 11 Jun 2027: cloud 8 → 3 eighths of the sky; high 77 °F → 86 °F',
      'Mesa camp, Sat 12 Jun 2027: from typed in → weather forecast',
    ]);
    expect(diff.find((s) => s.title === 'Engine')?.changes[0]?.detail).toMatch(/^1 → 2: /);
  });

  it('compares the day’s sunshine from hour-by-hour figures in kWh/m²', () => {
    const a = structuredClone(older);
    const b = structuredClone(older);
    // 10 hours of 500 W/m² = 5.0 kWh/m²; 10 hours of 300 W/m² = 3.0 kWh/m².
    a.stops[0]!.weather[0]!.hourly = Array.from({ length: 10 }, (_, i) => ({ hour: 8 + i, ghiWm2: 500, tempC: 20 }));
    b.stops[0]!.weather[0]!.hourly = Array.from({ length: 10 }, (_, i) => ({ hour: 8 + i, ghiWm2: 300, tempC: 20 }));
    const diff = snapshotDiff({ plan: a }, { plan: b });
    expect(diff.find((s) => s.title === 'Weather')?.changes.map((c) => c.detail)).toEqual(['sunshine 5 → 3 kWh/m²']);
  });
});

describe('snapshot names in the first stop’s local time', () => {
  const toronto = { stops: [{ name: 'Lakeshore camp', timeZone: 'America/Toronto' }] };

  it('says the time at the first stop, not UTC', () => {
    // 15:08 UTC on Sat 12 Dec 2026 is 10:08 in Toronto (EST, UTC−5, no daylight saving in December).
    expect(snapshotTime('2026-12-12T15:08:00.000Z', toronto)).toBe('Sat 12 Dec, 10:08 (local time at Lakeshore camp)');
    expect(defaultSnapshotName('2026-12-12T15:08:00.000Z', toronto)).toBe('Forecast of Sat 12 Dec, 10:08 (local time at Lakeshore camp)');
    // 03:30 UTC on Sun 13 Dec is still Sat 12 Dec, 22:30 in Toronto.
    expect(snapshotTime('2026-12-13T03:30:00.000Z', toronto)).toBe('Sat 12 Dec, 22:30 (local time at Lakeshore camp)');
  });

  it('renames an old UTC default name and keeps a name someone chose', () => {
    expect(snapshotLabel('Forecast of 2026-12-12 15:08 UTC', '2026-12-12T15:08:00.000Z', toronto)).toBe(
      'Forecast of Sat 12 Dec, 10:08 (local time at Lakeshore camp)',
    );
    expect(snapshotLabel('Before the bigger bank', '2026-12-12T15:08:00.000Z', toronto)).toBe('Before the bigger bank');
  });
});

describe('two names a reader can tell apart', () => {
  it('marks two equal names first and second, in the order picked', () => {
    const same = 'Forecast of Fri 4 Dec, 14:48 (local time at Mesa camp)';
    expect(distinctNames(same, same)).toEqual([`${same} (first)`, `${same} (second)`]);
  });
  it('leaves different names as they are', () => {
    expect(distinctNames('Before the upgrade', 'After the upgrade')).toEqual(['Before the upgrade', 'After the upgrade']);
  });
});
