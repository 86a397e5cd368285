import { describe, expect, it } from 'vitest';
import { buildQuickPlan, type QuickPlanForm } from '../../src/domain/quick-plan/quick-plan';
import { api, signUp } from '../helpers/api';

// Issue 16, item 16: "Keep this plan" keeps the forecast the camper just saw as the new trip's first
// saved forecast, and names the trip from the place and the month.

const ENTRY: QuickPlanForm = {
  chemistry: 'lifepo4',
  capacityAh: 100,
  panelWatts: 200,
  mounting: 'flat',
  shadePct: 0,
  loads: ['fridge', 'lights', 'parasitic'],
  placeName: 'Lake Verna, Ontario',
  lat: 45.6,
  lon: -79.1,
  timeZone: 'America/Toronto',
  arrive: '2026-12-11',
  nights: 3,
  cloudOktas: 4,
  tempUnit: 'C',
  high: 2,
  low: -6,
};

describe('keeping a quick plan', () => {
  it('saves the forecast with the trip, the same as the preview the camper saw', async () => {
    const s = await signUp();
    const plan = buildQuickPlan(ENTRY);
    const res = await api('/api/quick-plan/keep', { method: 'POST', session: s, json: plan });
    expect(res.status).toBe(201);
    const { tripId, forecastId } = (await res.json()) as { tripId: string; forecastId: string };

    const trip = (await (await api(`/api/trips/${tripId}`, { session: s })).json()) as { name: string };
    expect(trip.name).toBe('Lake Verna, December 2026');

    const list = (await (await api(`/api/trips/${tripId}/forecasts`, { session: s })).json()) as { id: string; name: string }[];
    expect(list.map((f) => [f.id, f.name])).toEqual([[forecastId, 'From the quick plan']]);

    const saved = (await (await api(`/api/forecasts/${forecastId}`, { session: s })).json()) as { forecast: { summary: unknown } };
    const preview = (await (await api('/api/forecasts/preview', { method: 'POST', json: plan })).json()) as { summary: unknown };
    expect(saved.forecast.summary).toEqual(preview.summary);
  });

  it('names a trip at the form’s placeholder place plainly', async () => {
    const s = await signUp();
    const res = await api('/api/quick-plan/keep', {
      method: 'POST',
      session: s,
      json: buildQuickPlan({ ...ENTRY, placeName: 'Your camp', arrive: '2027-07-02' }),
    });
    expect(res.status).toBe(201);
    const { tripId } = (await res.json()) as { tripId: string };
    expect(((await (await api(`/api/trips/${tripId}`, { session: s })).json()) as { name: string }).name).toBe('My trip, July 2027');
  });
});
