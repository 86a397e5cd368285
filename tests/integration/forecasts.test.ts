import { openTestDb as openDb } from '../helpers/test-db';
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

  it('records the engine revision, and builds the plan with each load’s place and surge and the bank’s place and lag', async () => {
    const rig = await (
      await api('/api/rigs', {
        method: 'POST',
        session: owner,
        json: {
          name: 'Cold van',
          bank: { chemistry: 'lifepo4', capacityAh: 200, location: 'cabin', selfHeating: true, thermalHours: 8 },
          inverter: { efficiencyPct: 90, idleWatts: 10, continuousWatts: 1000, surgeWatts: 2000 },
        },
      })
    ).json();
    expect(rig.bank).toMatchObject({ location: 'cabin', selfHeating: true, thermalHours: 8 });
    expect(rig.inverter).toMatchObject({ continuousWatts: 1000, surgeWatts: 2000 });
    for (const load of [
      { name: 'Locker fridge', watts: 50, dutyPct: 35, response: 'cooling', location: 'outside', surgeWatts: 180 },
      { name: 'Microwave', watts: 1200, supply: 'ac', windows: [[18, 19]], dutyPct: 10, surgeWatts: 1500 },
    ]) {
      expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: load })).status).toBe(201);
    }
    const plan = demoPlan();
    const trip = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'Cold loop', stops: plan.stops, drives: plan.drives } })).json();
    const res = await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner });
    expect(res.status).toBe(201);
    const f = await res.json();
    expect(f.engineRevision).toBe(2);
    expect(f.forecast.engineRevision).toBe(2);
    expect(f.plan.bank).toMatchObject({ location: 'cabin', selfHeating: true, thermalHours: 8 });
    expect(f.plan.inverter).toMatchObject({ continuousWatts: 1000, surgeWatts: 2000 });
    expect(f.plan.loads.map((l: { name: string; location: string; surgeWatts: number | null }) => [l.name, l.location, l.surgeWatts])).toEqual([
      ['Locker fridge', 'outside', 180],
      ['Microwave', 'cabin', 1500],
    ]);
    // Revision 2 rows carry usable charge and the hour's lowest volts.
    expect(typeof f.forecast.hourly[0].usablePct).toBe('number');
    expect(typeof f.forecast.hourly[0].minVolts).toBe('number');
    const db = openTestDb();
    const row = db.prepare('select engine_revision from forecasts where id = ?').get(f.id) as { engine_revision: number | null };
    db.close();
    expect(row.engine_revision).toBe(2);
    const list = await (await api(`/api/trips/${trip.id}/forecasts`, { session: owner })).json();
    expect(list[0].engineRevision).toBe(2);
  });

  it('an old snapshot (saved before revisions were recorded) reads as revision 1 with its own numbers, and its page offers "Run again"', async () => {
    // A revision 1 row as it was stored: no engine_revision column value, no engineRevision in the
    // result, and hourly columns without usablePct / minVolts / cabinC.
    const [newest] = await (await api(`/api/trips/${setup.tripId}/forecasts`, { session: owner })).json();
    const db = openDb({ write: true });
    const oldId = crypto.randomUUID();
    try {
      const src = db.prepare('select * from forecasts where id = ?').get(newest.id) as Record<string, unknown>;
      const result = JSON.parse(src.result as string);
      delete result.engineRevision;
      for (const k of ['usablePct', 'minVolts', 'cabinC']) delete result.hourly[k];
      result.summary.minSocPct = 12.3; // the old engine's own figure, which must come back untouched
      const summary = { ...JSON.parse(src.summary as string), minSocPct: 12.3 };
      db.prepare('insert into forecasts (id, crew_id, trip_id, rig_id, name, plan, summary, result, reserve_soc_pct, created_by, created_at, engine_revision) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, null)').run(
        oldId, src.crew_id, src.trip_id, src.rig_id, 'Last spring', src.plan, JSON.stringify(summary), JSON.stringify(result), src.reserve_soc_pct, src.created_by, '2026-04-01T10:00:00.000Z',
      );
    } finally {
      db.close();
    }
    const old = await (await api(`/api/forecasts/${oldId}`, { session: owner })).json();
    expect(old.engineRevision).toBe(1);
    expect(old.forecast.engineRevision).toBe(1);
    expect(old.forecast.summary.minSocPct).toBe(12.3);
    expect(old.forecast.hourly[0].usablePct).toBeUndefined();

    const page = await (await api(`/trips/${setup.tripId}/forecasts/${oldId}`, { session: owner })).text();
    expect(page).toMatch(/Made by forecast engine revision (<!-- -->)?1(<!-- -->)?; the engine is now at revision (<!-- -->)?2/);
    expect(page).toContain('Run again');
    const fresh = await (await api(`/trips/${setup.tripId}/forecasts/${newest.id}`, { session: owner })).text();
    expect(fresh).not.toContain('engine-revision-note');

    // Its hourly CSV leaves the revision 2 columns empty (never "undefined").
    const csv = await (await api(`/api/forecasts/${oldId}/hourly.csv`, { session: owner })).text();
    const [header, firstRow] = csv.split('\r\n');
    const cols = header!.split(',');
    expect(cols).toEqual(expect.arrayContaining(['usablePct', 'minVolts']));
    const cells = firstRow!.split(',');
    expect(cells[cols.indexOf('usablePct')]).toBe('');
    expect(cells[cols.indexOf('minVolts')]).toBe('');
    expect(csv).not.toContain('undefined');

    // "Run again" runs the trip's current plan and saves a new forecast; the old one stays as it was.
    const again = await api(`/api/trips/${setup.tripId}/forecasts`, { method: 'POST', session: owner });
    expect(again.status).toBe(201);
    expect((await again.json()).engineRevision).toBe(2);
    const still = await (await api(`/api/forecasts/${oldId}`, { session: owner })).json();
    expect(still.forecast.summary.minSocPct).toBe(12.3);
  });

  it('downloads the hourly CSV with one line per hour', async () => {
    const [first] = await (await api(`/api/trips/${setup.tripId}/forecasts`, { session: owner })).json();
    const res = await api(`/api/forecasts/${first.id}/hourly.csv`, { session: owner });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename=".+-hourly\.csv"/);
    const lines = (await res.text()).trim().split('\r\n');
    expect(lines[0]?.split(',').slice(0, 6)).toEqual(['stop', 'time', 'socPct', 'usablePct', 'volts', 'minVolts']);
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
