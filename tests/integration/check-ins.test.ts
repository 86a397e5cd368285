import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { createLoad, createRig, dbGet } from '../helpers/fixtures';

// Check-ins against the built server: the re-forecast of the rest of the trip, resting voltage
// through the chemistry's table, the saved forecast beside it, and an idempotent insert keyed by
// the client's id.

let owner: Session;
let tripId: string;
let forecast: { id: string; forecast: { summary: { firstCutoffAt: string | null; minSocPct: number } } };

const TZ = 'America/Denver';
const STOPS = [
  { name: 'Juniper Mesa', lat: 35.6, lon: -105.9, timeZone: TZ, arrive: '2027-10-21', nights: 2 },
  { name: 'Cinder Flat', lat: 35.2, lon: -111.6, timeZone: 'America/Phoenix', arrive: '2027-10-23', nights: 2 },
];

beforeAll(async () => {
  owner = await signUp({ name: 'Check-in Owner' });
  // A small bank with no panels and a steady draw: it runs out on every trip, earlier from a lower reading.
  const rig = await createRig(owner, { name: 'Small van', bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 100 }, arrays: [], chargers: [] });
  await createLoad(owner, rig.id, { name: 'Fridge', watts: 45, dutyPct: 50 });
  await createLoad(owner, rig.id, { name: 'Standby draw', watts: 12, standby: true });
  const trip = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'Two camps', stops: STOPS } })).json();
  tripId = trip.id;
  forecast = await (await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Plan' } })).json();
});

const post = (body: unknown, session = owner, trip = tripId) => api(`/api/trips/${trip}/check-ins`, { method: 'POST', session, json: body });
const storedCount = (id: string) => dbGet<{ n: number }>('select count(*) as n from check_ins where id = ?', id)!.n;

describe('a check-in re-forecasts the rest of the trip', () => {
  it('from a SOC reading, beside the latest saved forecast', async () => {
    const id = crypto.randomUUID();
    const res = await post({ id, at: '2027-10-22T07:40-06:00', socPct: 70 });
    expect(res.status).toBe(201);
    const c = await res.json();
    expect(c).toMatchObject({ id, tripId, source: 'soc', socPct: 70, restingVolts: null, forecastId: forecast.id, version: 1 });
    expect(c.outcome).toMatchObject({ startAt: '2027-10-22T07:00-06:00', startSocPct: 70 });
    expect(c.previous).toMatchObject({ forecastId: forecast.id, name: 'Plan', firstCutoffAt: forecast.forecast.summary.firstCutoffAt, minSocPct: forecast.forecast.summary.minSocPct });
    expect(c.outcome.firstCutoffAt).not.toBeNull();
  });

  it('the new cutoff moves with the reading', async () => {
    const at = '2027-10-22T07:40-06:00';
    const high = await (await post({ id: crypto.randomUUID(), at, socPct: 95 })).json();
    const low = await (await post({ id: crypto.randomUUID(), at, socPct: 30 })).json();
    expect(Date.parse(low.outcome.firstCutoffAt)).toBeLessThan(Date.parse(high.outcome.firstCutoffAt));
  });

  it('turns a resting voltage into SOC through the LiFePO4 table and says the voltage is flat', async () => {
    // 13.13 V is 40 % on the LiFePO4 open-circuit table (forecast-engine.md, common practice).
    const res = await post({ id: crypto.randomUUID(), at: '2027-10-23T20:00-07:00', restingVolts: 13.13 });
    expect(res.status).toBe(201);
    const c = await res.json();
    expect(c).toMatchObject({ source: 'volts', restingVolts: 13.13, socPct: 40 });
    expect(c.note).toMatch(/battery monitor/);
    expect(c.outcome.startAt).toBe('2027-10-23T20:00-07:00');
  });

  it('refuses readings a bank cannot give, times outside the trip and bad bodies, naming the field', async () => {
    const volts = await post({ id: crypto.randomUUID(), at: '2027-10-22T07:40-06:00', restingVolts: 30 });
    expect(volts.status).toBe(400);
    expect((await volts.json()).issues[0].path).toBe('restingVolts');
    const early = await post({ id: crypto.randomUUID(), at: '2027-10-20T07:40-06:00', socPct: 50 });
    expect(early.status).toBe(400);
    const e = await early.json();
    expect(e.issues[0]).toMatchObject({ path: 'at', message: expect.stringContaining('before the trip starts') });
    const bad = await post({ id: 'x', at: 'yesterday', socPct: 150 });
    expect(bad.status).toBe(400);
    expect((await bad.json()).issues.map((i: { path: string }) => i.path).sort()).toEqual(['at', 'id', 'socPct']);
    const both = await post({ id: crypto.randomUUID(), at: '2027-10-22T07:40-06:00', socPct: 50, restingVolts: 13.2 });
    expect((await both.json()).issues[0].path).toBe('restingVolts');
  });

  it('a forecast id from another trip is refused', async () => {
    const otherTrip = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId: (await dbGet<{ rig_id: string }>('select rig_id from trips where id = ?', tripId))!.rig_id, name: 'Other', stops: STOPS } })).json();
    const res = await post({ id: crypto.randomUUID(), at: '2027-10-22T07:40-06:00', socPct: 50, forecastId: forecast.id }, owner, otherTrip.id);
    expect(res.status).toBe(400);
    expect((await res.json()).issues[0].path).toBe('forecastId');
  });

  it('without a saved forecast, re-forecasts the trip as it is, with nothing beside it', async () => {
    const rigId = dbGet<{ rig_id: string }>('select rig_id from trips where id = ?', tripId)!.rig_id;
    const fresh = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId, name: 'Unforecast', stops: STOPS } })).json();
    const res = await post({ id: crypto.randomUUID(), at: '2027-10-22T07:40-06:00', socPct: 70 }, owner, fresh.id);
    expect(res.status).toBe(201);
    const c = await res.json();
    expect(c.previous).toBeNull();
    expect(c.forecastId).toBeNull();
    expect(c.outcome.startAt).toBe('2027-10-22T07:00-06:00');
  });
});

describe('stored exactly once', () => {
  it('the same check-in sent again is 200 with the stored one', async () => {
    const body = { id: crypto.randomUUID(), at: '2027-10-22T21:15-06:00', socPct: 55 };
    const first = await post(body);
    expect(first.status).toBe(201);
    const again = await post(body);
    expect(again.status).toBe(200);
    expect(await again.json()).toEqual(await first.json());
    expect(storedCount(body.id)).toBe(1);
  });

  it('sent many times at once, it is created once', async () => {
    const body = { id: crypto.randomUUID(), at: '2027-10-22T22:00-06:00', socPct: 52 };
    const statuses = (await Promise.all(Array.from({ length: 6 }, () => post(body)))).map((r) => r.status).sort();
    expect(statuses).toEqual([200, 200, 200, 200, 200, 201]);
    expect(storedCount(body.id)).toBe(1);
  });

  it('the same id with a different reading is a 409, and nothing changes', async () => {
    const body = { id: crypto.randomUUID(), at: '2027-10-22T23:00-06:00', socPct: 50 };
    await post(body);
    const res = await post({ ...body, socPct: 49 });
    expect(res.status).toBe(409);
    expect((await res.json()).current).toMatchObject({ id: body.id, socPct: 50 });
    expect(dbGet<{ soc_pct: number }>('select soc_pct from check_ins where id = ?', body.id)!.soc_pct).toBe(50);
  });
});

describe('the trip’s check-ins', () => {
  it('are listed latest reading first, and one is removed with its version', async () => {
    const list = await (await api(`/api/trips/${tripId}/check-ins`, { session: owner })).json();
    const times = list.map((c: { at: string }) => Date.parse(c.at));
    expect(times).toEqual([...times].sort((a, b) => b - a));
    const last = list[0];
    expect((await api(`/api/check-ins/${last.id}?version=7`, { method: 'DELETE', session: owner })).status).toBe(409);
    expect((await api(`/api/check-ins/${last.id}?version=${last.version}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect(storedCount(last.id)).toBe(0);
  });

  it('someone outside the crew can neither read them nor check in (404)', async () => {
    const outsider = await signUp({ name: 'Someone else' });
    expect((await api(`/api/trips/${tripId}/check-ins`, { session: outsider })).status).toBe(404);
    expect((await post({ id: crypto.randomUUID(), at: '2027-10-22T07:40-06:00', socPct: 50 }, outsider)).status).toBe(404);
  });
});
