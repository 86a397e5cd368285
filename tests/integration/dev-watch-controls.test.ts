import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { createLoad, createRig, dbGet } from '../helpers/fixtures';
import { watchedTripInput } from '../../scripts/seed-demo';

// The /dev page's controls against the built server and the shared local fake: turning the fake's
// weather (bad input named by field; the cached forecast answers forgotten, past years kept) and
// making every watched trip due so "Run the watch now" re-runs it at once.

let camper: Session;
let tripId: string;

const count = (kind: 'forecast' | 'archive') =>
  Number(dbGet<{ n: number }>('select count(*) as n from weather_cache where kind = ?', kind)!.n);
const lastRunAt = () =>
  dbGet<{ last_run_at: string | null }>('select last_run_at from trip_watches where trip_id = ?', tripId)?.last_run_at ?? null;

beforeAll(async () => {
  await fetch(`${inject('weatherUrl')}/__fake/reset`, { method: 'POST' });
  camper = await signUp();
  const rig = await createRig(camper);
  await createLoad(camper, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 40 });
  const res = await api('/api/trips', { method: 'POST', session: camper, json: watchedTripInput(rig.id) });
  expect(res.status).toBe(201);
  tripId = ((await res.json()) as { id: string }).id;
});
afterAll(async () => {
  await fetch(`${inject('weatherUrl')}/__fake/reset`, { method: 'POST' });
});

describe('dev weather control', () => {
  it('refuses a bad turn with a 400 naming the field, and anyone signed out with a 401', async () => {
    const bad = async (json: unknown) => {
      const r = await api('/api/dev/weather', { method: 'POST', session: camper, json });
      return { status: r.status, paths: ((await r.json()) as { issues: { path: string }[] }).issues.map((i) => i.path) };
    };
    expect(await bad({ mode: 'hail' })).toEqual({ status: 400, paths: ['mode'] });
    expect(await bad({ mode: 'storm', from: '2026-02-30' })).toEqual({ status: 400, paths: ['from'] });
    expect(await bad({ mode: 'storm', from: 20261210 })).toEqual({ status: 400, paths: ['from'] });
    expect((await api('/api/dev/weather', { method: 'POST', json: { mode: 'storm' } })).status).toBe(401);
    // Nothing was turned by any of them.
    expect(await (await fetch(`${inject('weatherUrl')}/__fake/turn`)).json()).toEqual({ mode: 'normal', from: null });
  });

  it('turns the fake and forgets the cached forecast answers, keeping past years', async () => {
    // A forecast of the near trip caches the fake's forecast answers (and past years for the band).
    expect((await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: camper, json: {} })).status).toBe(201);
    expect(count('forecast')).toBeGreaterThan(0);
    const archived = count('archive');
    const r = await api('/api/dev/weather', { method: 'POST', session: camper, json: { mode: 'storm', from: '2026-12-10' } });
    expect(r.status).toBe(200);
    expect(await r.json()).toEqual({ mode: 'storm', from: '2026-12-10' });
    expect(count('forecast')).toBe(0);
    expect(count('archive')).toBe(archived);
    expect(await (await api('/api/dev/weather', { session: camper })).json()).toEqual({ mode: 'storm', from: '2026-12-10' });
    expect(await (await fetch(`${inject('weatherUrl')}/__fake/turn`)).json()).toEqual({ mode: 'storm', from: '2026-12-10' });
    expect(await (await api('/api/dev/weather', { method: 'POST', session: camper, json: { mode: 'normal' } })).json()).toEqual({
      mode: 'normal',
      from: null,
    });
  });
});

describe('dev "make every watched trip due"', () => {
  it('forgets when each watched trip last ran, so the next tick re-runs it at once', async () => {
    const now = new Date().toISOString();
    const first = (await (await api('/api/dev/watch/tick', { method: 'POST', session: camper, json: { now } })).json()) as { ran: number };
    expect(first.ran).toBeGreaterThanOrEqual(1);
    expect(lastRunAt()).not.toBeNull();
    // Not due again on the same clock…
    const again = (await (await api('/api/dev/watch/tick', { method: 'POST', session: camper, json: { now } })).json()) as { ran: number };
    expect(again.ran).toBe(0);
    // …until it is made due.
    const due = (await (await api('/api/dev/watch/due', { method: 'POST', session: camper, json: {} })).json()) as { due: number };
    expect(due.due).toBeGreaterThanOrEqual(1);
    expect(lastRunAt()).toBeNull();
    const third = (await (await api('/api/dev/watch/tick', { method: 'POST', session: camper, json: { now } })).json()) as { ran: number };
    expect(third.ran).toBeGreaterThanOrEqual(1);
    const runs = Number(dbGet<{ n: number }>('select count(*) as n from watch_runs where trip_id = ?', tripId)!.n);
    expect(runs).toBe(2);
  });
});
