import { beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { savedForecastFromJson } from '../../src/features/forecast/forecast.api';
import { api, signUp, type Session } from '../helpers/api';

/**
 * The saved forecast page keeps the island's text per process once made (forecastPageText). A saved
 * forecast never changes, but what the page shows with it can, and who may see it can: each of
 * these must show on the next page read, never an answer kept from before.
 */

/** The saved forecast the page hands its island, decoded. */
async function pageForecast(path: string, session: Session) {
  const res = await api(path, { session });
  expect(res.status).toBe(200);
  const html = await res.text();
  // The page writes the island's text into a template (page-text.ts), escaped as HTML text.
  const m = /<template id="forecast-data-[^"]*">([^<]*)<\/template>/.exec(html);
  if (!m) throw new Error('no forecast text on the page');
  return savedForecastFromJson(m[1]!.replaceAll('&lt;', '<').replaceAll('&amp;', '&'));
}

async function tripWithForecast(owner: Session, name: string): Promise<{ tripId: string; forecastId: string; rigId: string }> {
  const plan = demoPlan() as Record<string, any>;
  const rig = await (
    await api('/api/rigs', {
      method: 'POST',
      session: owner,
      json: { name: `${name} van`, bank: plan.bank, arrays: plan.arrays, chargers: plan.chargers, inverter: plan.inverter ?? null },
    })
  ).json();
  for (const load of plan.loads.slice(0, 3))
    expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: load })).status).toBe(201);
  const trip = await (
    await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name, stops: plan.stops, drives: plan.drives } })
  ).json();
  const saved = await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: { name: `${name} forecast` } });
  expect(saved.status).toBe(201);
  return { tripId: trip.id, forecastId: (await saved.json()).id, rigId: rig.id };
}

describe('the saved forecast page’s kept text', () => {
  let owner: Session;
  let stranger: Session;
  let a: { tripId: string; forecastId: string; rigId: string };
  let b: { tripId: string; forecastId: string; rigId: string };

  beforeAll(async () => {
    owner = await signUp({ name: 'Kept Owner' });
    stranger = await signUp({ name: 'Other Crew' });
    a = await tripWithForecast(owner, 'Kept loop');
    b = await tripWithForecast(owner, 'Second loop');
  });

  it('shows the creator’s new name after a rename, and the same figures', async () => {
    const path = `/trips/${a.tripId}/forecasts/${a.forecastId}`;
    const before = await pageForecast(path, owner);
    expect(before.createdBy?.name).toBe('Kept Owner');
    expect((await pageForecast(path, owner)).forecast.summary).toEqual(before.forecast.summary);
    const renamed = await api('/api/auth/update-user', { method: 'POST', session: owner, json: { name: 'Kept Owner Renamed' } });
    expect(renamed.status).toBe(200);
    const after = await pageForecast(path, owner);
    expect(after.createdBy?.name).toBe('Kept Owner Renamed');
    expect(after.forecast.summary).toEqual(before.forecast.summary);
  });

  it('is never shown to someone outside the crew, nor under another trip’s address', async () => {
    const path = `/trips/${a.tripId}/forecasts/${a.forecastId}`;
    await pageForecast(path, owner);
    const outside = await api(path, { session: stranger });
    expect(outside.status).toBe(404);
    expect(await outside.text()).not.toContain('forecast-data-');
    const elsewhere = await api(`/trips/${b.tripId}/forecasts/${a.forecastId}`, { session: owner });
    expect(elsewhere.status).toBe(404);
    expect(await elsewhere.text()).not.toContain('forecast-data-');
  });

  it('shows a forecast run again after a change with its own figures, not the earlier one’s', async () => {
    const first = await pageForecast(`/trips/${a.tripId}/forecasts/${a.forecastId}`, owner);
    // A 60 W load on all day, every day: the trip's loads grow, so its figures must too.
    const added = await api(`/api/rigs/${a.rigId}/loads`, {
      method: 'POST',
      session: owner,
      json: { name: 'Extra fan', watts: 60, supply: 'dc' },
    });
    expect(added.status).toBe(201);
    const rerun = await api(`/api/trips/${a.tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Run again' } });
    expect(rerun.status).toBe(201);
    const second = await pageForecast(`/trips/${a.tripId}/forecasts/${(await rerun.json()).id}`, owner);
    expect(second.name).toBe('Run again');
    expect(second.forecast.summary.loadWh).toBeGreaterThan(first.forecast.summary.loadWh);
    // The first forecast keeps its own snapshot.
    expect((await pageForecast(`/trips/${a.tripId}/forecasts/${a.forecastId}`, owner)).forecast.summary).toEqual(first.forecast.summary);
  });

  it('is gone as soon as the forecast is deleted', async () => {
    const path = `/trips/${b.tripId}/forecasts/${b.forecastId}`;
    await pageForecast(path, owner);
    expect((await api(`/api/forecasts/${b.forecastId}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(path, { session: owner })).status).toBe(404);
  });
});
