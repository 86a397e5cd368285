import { describe, expect, it } from 'vitest';
import { buildQuickPlan, type QuickPlanForm } from '../../src/domain/quick-plan/quick-plan';
import { validatePlan } from '../../src/engine';
import { api, openTestDb, signUp } from '../helpers/api';
import { at } from '../../src/lib/invariant';

const ENTRY: QuickPlanForm = {
  chemistry: 'agm',
  capacityAh: 200,
  panelWatts: 300,
  mounting: 'flat',
  shadePct: 0,
  loads: ['fridge', 'lights', 'parasitic'],
  placeName: 'Ridge camp',
  lat: 36.1,
  lon: -112.1,
  timeZone: 'America/Phoenix',
  arrive: '2027-05-10',
  nights: 2,
  cloudOktas: 2,
  tempUnit: 'C',
  high: 24,
  low: 8,
};

const count = (sql: string, id: string) => {
  const db = openTestDb();
  const n = (db.prepare(sql).get(id) as { n: number }).n;
  db.close();
  return n;
};

describe('POST /api/quick-plan/keep', () => {
  it('saves the plan as a rig with its loads and a trip, in the camper\'s crew', async () => {
    const s = await signUp();
    const plan = buildQuickPlan(ENTRY);
    const res = await api('/api/quick-plan/keep', { method: 'POST', session: s, json: plan });
    expect(res.status).toBe(201);
    const { rigId, tripId } = await res.json();
    expect(res.headers.get('location')).toBe(`/trips/${tripId}`);
    expect(count('select count(*) as n from loads where rig_id = ?', rigId)).toBe(plan.loads!.length);
    const trip = await (await api(`/api/trips/${tripId}`, { session: s })).json();
    expect(trip.rigId).toBe(rigId);
    expect(trip.stops[0]?.name).toBe(at(plan.stops, 0, 'stop').name);
    // The kept rig, loads and trip are the quick plan's: a saved run forecasts them as the preview
    // does. (A saved run fills the untyped second and third days from the weather service, so the
    // preview is of the plan the run saved; its bank, panels, loads and typed day are the quick plan's.)
    const saved = await (await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: s })).json();
    const resolved = validatePlan(plan);
    if (!resolved.ok) throw new Error('the quick plan is valid');
    expect(saved.plan.bank).toEqual(resolved.plan.bank);
    expect(saved.plan.arrays).toEqual(resolved.plan.arrays);
    expect(saved.plan.loads).toEqual(resolved.plan.loads);
    expect(saved.plan.stops[0].weather[0]).toMatchObject({ date: '2027-05-10', cloudOktas: 2, highC: 24, lowC: 8 });
    const preview = await (await api('/api/forecasts/preview', { method: 'POST', json: saved.plan })).json();
    expect(saved.forecast.summary).toEqual(preview.summary);
  });

  it('saves nothing when the plan is refused, and names the field', async () => {
    const s = await signUp();
    const plan = buildQuickPlan(ENTRY) as { bank: { capacityAh: number } };
    plan.bank.capacityAh = -1;
    const res = await api('/api/quick-plan/keep', { method: 'POST', session: s, json: plan });
    expect(res.status).toBe(400);
    expect((await res.json()).issues.map((i: { path: string }) => i.path)).toContain('bank.capacityAh');
    expect(count('select count(*) as n from rigs where created_by = ?', s.userId)).toBe(0);
  });

  it('refuses an installer, who has no crew to keep rigs in', async () => {
    const s = await signUp({ kind: 'installer' });
    const res = await api('/api/quick-plan/keep', { method: 'POST', session: s, json: buildQuickPlan(ENTRY) });
    expect(res.status).toBe(403);
  });
});
