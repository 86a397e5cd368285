import { beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { api, openTestDb, signUp, type Session } from '../helpers/api';

interface Setup {
  rigId: string;
  tripId: string;
  loadIds: string[];
}

/** Creates the demo plan's rig, loads and trip through the real API. */
async function createDemoTrip(session: Session): Promise<Setup> {
  const plan = demoPlan() as Record<string, any>;
  const rigRes = await api('/api/rigs', { method: 'POST', session, json: { name: 'Test van', bank: plan.bank, arrays: plan.arrays, chargers: plan.chargers, inverter: plan.inverter ?? null } });
  expect(rigRes.status).toBe(201);
  const rig = await rigRes.json();
  const loadIds: string[] = [];
  for (const load of plan.loads) {
    const r = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session, json: load });
    expect(r.status).toBe(201);
    loadIds.push((await r.json()).id);
  }
  const tripRes = await api('/api/trips', { method: 'POST', session, json: { rigId: rig.id, name: 'Desert loop', stops: plan.stops, drives: plan.drives } });
  expect(tripRes.status).toBe(201);
  return { rigId: rig.id, tripId: (await tripRes.json()).id, loadIds };
}

describe('saved forecasts', () => {
  let owner: Session;
  let stranger: Session;
  let setup: Setup;

  beforeAll(async () => {
    owner = await signUp({ name: 'Owner' });
    stranger = await signUp({ name: 'Stranger' });
    setup = await createDemoTrip(owner);
  });

  it('runs the engine on the trip and saves plan and result', async () => {
    const res = await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Before the new panel' } });
    expect(res.status).toBe(201);
    const f = await res.json();
    expect(f.name).toBe('Before the new panel');
    expect(f.createdBy.name).toBe('Owner');
    expect(f.forecast.hourly.length).toBe(f.forecast.summary.hoursSimulated);
    expect(f.plan.loads.length).toBe(setup.loadIds.length);
    expect(JSON.stringify(f)).not.toMatch(/NaN|Infinity/);
    // The preview of the same plan gives the same numbers: one engine, no re-implementation.
    const preview = await (await api('/api/forecasts/preview', { method: 'POST', json: demoPlan() })).json();
    expect(f.forecast.summary).toEqual(preview.summary);
    expect(f.forecast.hourly).toEqual(preview.hourly);
  });

  it('accepts a run without a body and names it', async () => {
    const res = await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner });
    expect(res.status).toBe(201);
    expect((await res.json()).name).toMatch(/^Forecast of /);
  });

  it('lists saved forecasts newest first with summaries and no hourly series', async () => {
    const res = await api(`/api/trips/${setup.tripId}/forecasts`, { session: owner });
    expect(res.status).toBe(200);
    const list = await res.json();
    expect(list.length).toBeGreaterThanOrEqual(2);
    expect(list[0].createdAt >= list[1].createdAt).toBe(true);
    expect(list[0].summary.hoursSimulated).toBeGreaterThan(0);
    expect(list[0].forecast).toBeUndefined();
  });

  it('keeps a saved forecast unchanged when the loads change later', async () => {
    const saved = await (await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Snapshot' } })).json();
    const load = await (await api(`/api/rigs/${setup.rigId}/loads`, { session: owner })).json();
    const target = load[0];
    const patch = await api(`/api/loads/${target.id}`, { method: 'PATCH', session: owner, json: { version: target.version, watts: target.watts * 10 } });
    expect(patch.status).toBe(200);
    const again = await (await api(`/api/forecasts/${saved.id}`, { session: owner })).json();
    expect(again.forecast).toEqual(saved.forecast);
    expect(again.plan).toEqual(saved.plan);
    const fresh = await (await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner })).json();
    expect(fresh.forecast.summary.loadWh).toBeGreaterThan(saved.forecast.summary.loadWh);
  });

  it('stores the hourly series column-wise', async () => {
    const db = openTestDb();
    const row = db.prepare('select result from forecasts where trip_id = ? limit 1').get(setup.tripId) as { result: string };
    db.close();
    const stored = JSON.parse(row.result);
    expect(Array.isArray(stored.hourly.socPct)).toBe(true);
  });

  it('downloads the hourly CSV with one line per hour', async () => {
    const [first] = await (await api(`/api/trips/${setup.tripId}/forecasts`, { session: owner })).json();
    const res = await api(`/api/forecasts/${first.id}/hourly.csv`, { session: owner });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename=".+-hourly\.csv"/);
    const lines = (await res.text()).trim().split('\r\n');
    expect(lines[0]?.split(',').slice(0, 3)).toEqual(['stop', 'time', 'socPct']);
    expect(lines.length - 1).toBe(first.summary.hoursSimulated);
  });

  it('hides another crew\'s trips and forecasts behind 404', async () => {
    const [first] = await (await api(`/api/trips/${setup.tripId}/forecasts`, { session: owner })).json();
    for (const [method, path] of [
      ['GET', `/api/trips/${setup.tripId}/forecasts`],
      ['POST', `/api/trips/${setup.tripId}/forecasts`],
      ['GET', `/api/forecasts/${first.id}`],
      ['GET', `/api/forecasts/${first.id}/hourly.csv`],
      ['DELETE', `/api/forecasts/${first.id}`],
    ] as const) {
      const res = await api(path, { method, session: stranger });
      expect(res.status, `${method} ${path}`).toBe(404);
      expect((await res.json()).error.code).toBe('not_found');
    }
  });

  it('answers anonymous callers with 401', async () => {
    for (const path of [`/api/trips/${setup.tripId}/forecasts`, '/api/forecasts/anything', '/api/forecasts/anything/hourly.csv']) {
      expect((await api(path)).status).toBe(401);
    }
  });

  it('names the field of a bad run request', async () => {
    const bad = await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'x'.repeat(200) } });
    expect(bad.status).toBe(400);
    expect((await bad.json()).issues[0].path).toBe('name');
    const wrongType = await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner, body: 'name=x', headers: { 'content-type': 'text/plain' } });
    expect(wrongType.status).toBe(400);
  });

  it('deletes a saved forecast', async () => {
    const saved = await (await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner })).json();
    expect((await api(`/api/forecasts/${saved.id}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(`/api/forecasts/${saved.id}`, { session: owner })).status).toBe(404);
  });
});
