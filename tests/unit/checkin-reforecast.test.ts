import { describe, expect, it } from 'vitest';
import { outcomeOf, reforecastFrom } from '../../src/domain/checkins/reforecast';
import { checkInInputSchema } from '../../src/domain/checkins/checkins.schema';
import { computeCheckIn, reforecastReading } from '../../src/domain/checkins/checkins';
import { socFromRestingVolts } from '../../src/domain/checkins/ocv';
import { demoPlan, forecast, validatePlan, type ResolvedPlan } from '../../src/engine';
import { at as entry } from '../../src/lib/invariant';

// The rest of a trip from a check-in, run by the engine: the demo trip (Juniper Mesa, 3 nights,
// America/Denver; a drive day; Cinder Flat, 2 nights, America/Phoenix).

const v = validatePlan(demoPlan());
if (!v.ok) throw new Error('demo plan');
const plan: ResolvedPlan = v.plan;
const full = forecast(plan);
const at = (iso: string) => Date.parse(iso);
const hourOf = (i: number) => entry(full.hourly, i, 'forecast hour');
/** The forecast's state of charge at the start of hour `k`. */
const socBefore = (k: number) => (k === 0 ? full.summary.startSocPct : hourOf(k - 1).socPct);

function run(iso: string, soc: number) {
  const r = reforecastFrom(plan, at(iso), soc);
  if (!r.ok) throw new Error(r.message);
  return r.forecast;
}

describe('re-forecast from a check-in', () => {
  it('from the trip’s first hour with its starting SOC, it is the forecast itself', () => {
    const r = run(hourOf(0).time, plan.bank.initialSocPct);
    expect(r.hourly).toEqual(full.hourly);
    expect(r.summary).toEqual(full.summary);
  });

  // A check-in that reads exactly what the forecast said must continue the forecast's line. The
  // times cover a camp evening, the drive-day morning before the next stop (two runs joined) and
  // the last morning (a run cut at the trip's end), across two time zones.
  it.each(['2027-10-22T19:20-06:00', '2027-10-24T08:10-06:00', '2027-10-25T03:00-07:00', '2027-10-26T07:45-07:00'])('continues the forecast when the reading agrees with it (%s)', (iso) => {
    const t = at(iso);
    const k = full.hourly.findIndex((r) => Date.parse(r.time) <= t && t < Date.parse(r.time) + 3_600_000);
    const socAtStart = socBefore(k);
    const r = run(iso, socAtStart);
    expect(r.hourly[0]?.time).toBe(hourOf(k).time);
    expect(r.hourly.length).toBe(full.hourly.length - k);
    expect(r.hourly.at(-1)!.time).toBe(full.hourly.at(-1)!.time);
    r.hourly.forEach((row, i) => {
      const want = hourOf(k + i);
      expect(row.time).toBe(want.time);
      expect(Math.abs(row.socPct - want.socPct)).toBeLessThanOrEqual(0.3);
      expect(row.driving).toBe(want.driving);
      expect(r.stops[row.stop]?.name).toBe(full.stops[want.stop]?.name);
    });
  });

  // Revision 2: the battery's lagged temperature is not in the reading; the re-forecast takes the
  // forecast's own at that hour and carries it between pieces, so the cold lockout falls on the same hours.
  it('continues the forecast from every hour of the trip', () => {
    full.hourly.forEach((row, k) => {
      const soc = socBefore(k);
      const r = run(row.time, soc);
      expect(r.hourly.length, row.time).toBe(full.hourly.length - k);
      const worst = Math.max(...r.hourly.map((x, i) => Math.abs(x.socPct - hourOf(k + i).socPct)));
      expect(worst, row.time).toBeLessThanOrEqual(0.3);
      expect(r.hourly.map((x) => x.loadWatts), row.time).toEqual(full.hourly.slice(k).map((x) => x.loadWatts));
    });
  });

  it('the new cutoff moves earlier as the reading falls, and goes away as it rises', () => {
    const cut = (soc: number) => outcomeOf(run('2027-10-22T07:30-06:00', soc)).firstCutoffAt;
    const times = [60, 40, 25, 18, 12].map(cut);
    expect(times[0]).toBeNull();
    const found = times.filter((x): x is string => x !== null).map(Date.parse);
    expect(found.length).toBeGreaterThanOrEqual(2);
    for (let i = 1; i < found.length; i++) expect(entry(found, i)).toBeLessThanOrEqual(entry(found, i - 1));
    expect(entry(found, 0)).toBeGreaterThan(entry(found, found.length - 1));
  });

  it('a reading at or below the floor cuts off at once', () => {
    const o = outcomeOf(run('2027-10-23T20:00-06:00', plan.bank.floorSocPct));
    expect(o.firstCutoffAt).toBe(o.startAt);
    expect(o.cutoffStop).toBe('Juniper Mesa');
  });

  it('after a reading at the floor, says when the bank runs out again once the sun has lifted it', () => {
    const small = validatePlan({
      bank: { chemistry: 'lifepo4', capacityAh: 100 },
      arrays: [{ name: 'Roof', ratedWatts: 100 }],
      loads: [{ name: 'Fridge and standby', watts: 40 }],
      stops: [{ name: 'Juniper Mesa', lat: 35.6, lon: -105.9, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 4, weather: [{ date: '2027-10-22', cloudOktas: 0, highC: 18, lowC: 2 }] }],
    });
    if (!small.ok) throw new Error('plan');
    const r = reforecastFrom(small.plan, at('2027-10-22T20:00-06:00'), 10);
    if (!r.ok) throw new Error(r.message);
    const o = outcomeOf(r.forecast);
    expect(o.firstCutoffAt).toBe('2027-10-22T20:00-06:00');
    expect(o.nextCutoffAt).not.toBeNull();
    expect(Date.parse(o.nextCutoffAt!)).toBeGreaterThan(at('2027-10-23T12:00-06:00'));
    // Without the panel nothing lifts it again.
    const dark = reforecastFrom({ ...small.plan, arrays: [] }, at('2027-10-22T20:00-06:00'), 10);
    expect(dark.ok && outcomeOf(dark.forecast).nextCutoffAt).toBeNull();
  });

  it('the start SOC is the reading, and the outcome names the stop of a cutoff', () => {
    // Revision 2: the reading's hour (15:00 at Cinder Flat) has the battery at the forecast's 8.0 °C
    // (it lags the air after the drive), so f = 1 − 0.008 × (25 − 8) = 0.864 and 13.6 points are
    // stranded. A 20 % reading would be 6.4 % usable, under the 10 % floor: cut off at once (that
    // case is the floor test above). 30 % is 16.4 % usable, so the bank runs on and cuts off later.
    const o = outcomeOf(run('2027-10-24T16:00-06:00', 30));
    expect(o.startSocPct).toBe(30);
    expect(o.cutoffStop).toBe('Cinder Flat');
    expect(Date.parse(o.firstCutoffAt!)).toBeGreaterThan(at('2027-10-24T16:00-06:00'));
  });

  it('refuses readings before the trip starts and after it ends, naming `at`', () => {
    const before = reforecastFrom(plan, at('2027-10-21T14:59-06:00'), 80);
    expect(before).toMatchObject({ ok: false, path: 'at', message: expect.stringContaining('before the trip starts (2027-10-21 15:00 at Juniper Mesa)') });
    const after = reforecastFrom(plan, at('2027-10-26T11:00-07:00'), 80);
    expect(after).toMatchObject({ ok: false, path: 'at', message: expect.stringContaining('after the trip ends') });
  });
});

describe('the check-in body', () => {
  const id = '0b4f7f0e-4a77-4c9b-9a57-5b1f2d0f6a11';
  it('takes a SOC or a resting voltage, never both or neither', () => {
    expect(checkInInputSchema.safeParse({ id, at: '2027-10-22T07:30-06:00', socPct: 64 }).success).toBe(true);
    expect(checkInInputSchema.safeParse({ id, at: '2027-10-22T07:30-06:00', restingVolts: 12.4 }).success).toBe(true);
    const both = checkInInputSchema.safeParse({ id, at: '2027-10-22T07:30-06:00', socPct: 64, restingVolts: 12.4 });
    expect(both.error?.issues.map((i) => i.path.join('.'))).toEqual(['restingVolts']);
    const neither = checkInInputSchema.safeParse({ id, at: '2027-10-22T07:30-06:00' });
    expect(neither.error?.issues.map((i) => i.path.join('.'))).toEqual(['socPct']);
  });
  it('needs a time with its offset and a UUID', () => {
    const r = checkInInputSchema.safeParse({ id: 'abc', at: '2027-10-22 07:30', socPct: 120 });
    expect(r.error?.issues.map((i) => i.path.join('.')).sort()).toEqual(['at', 'id', 'socPct']);
  });
});

// One rule for the server (storing a check-in) and the phone (showing it at once, offline):
// reading → state of charge → the rest of the trip.
describe('reforecastReading (server and phone)', () => {
  const iso = '2027-10-22T19:20-06:00';

  it('a state-of-charge reading re-forecasts from that SOC, as reforecastFrom does', () => {
    const r = reforecastReading(plan, at(iso), { socPct: 61 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.socPct).toBe(61);
    expect(r.note).toBeNull();
    expect(r.forecast).toEqual(run(iso, 61));
    expect(r.outcome).toEqual(outcomeOf(run(iso, 61)));
  });

  it('a resting voltage is read on the bank’s curve first', () => {
    const soc = socFromRestingVolts(plan.bank.chemistry, plan.bank.nominalVolts, 13.2);
    if (!soc.ok) throw new Error(soc.message);
    const r = reforecastReading(plan, at(iso), { restingVolts: 13.2 });
    expect(r).toMatchObject({ ok: true, socPct: soc.socPct });
    if (r.ok) expect(r.forecast.summary.startSocPct).toBe(soc.socPct);
  });

  it('names the field that is wrong: a voltage no such bank gives, a time outside the trip', () => {
    expect(reforecastReading(plan, at(iso), { restingVolts: 130 })).toMatchObject({ ok: false, path: 'restingVolts' });
    const early = reforecastReading(plan, at('2027-10-20T12:00-06:00'), { socPct: 80 });
    expect(early).toMatchObject({ ok: false, path: 'at', message: expect.stringContaining('before the trip starts') });
  });

  it('the phone words a refused time as a sentence of its own', () => {
    const basis = { forecastId: 'f1', name: 'Saved', plan, forecast: full };
    expect(computeCheckIn(basis, '2027-10-20T12:00-06:00', { socPct: 80 })).toMatchObject({ ok: false, path: 'at', message: expect.stringMatching(/^The time is before the trip starts/) });
    const ok = computeCheckIn(basis, iso, { socPct: 61 });
    expect(ok).toMatchObject({ ok: true, socPct: 61, previous: { forecastId: 'f1', name: 'Saved', minSocPct: full.summary.minSocPct } });
  });
});
