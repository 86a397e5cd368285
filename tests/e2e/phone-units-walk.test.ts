import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, signIn } from '../helpers/browser';

// A camper on a phone (390 px) opens the account menu, reaches Settings, switches to imperial units and
// then reads the trip's saved forecast: the hourly table's air column, each row's temperature, the
// cold warning and the caution, the verdict and the CSV are all in °F — no °C left on the page.

const PASSWORD = 'long-desert-road-7';

/** An invented frosty weekend: LiFePO4 outside, a furnace blower, lows of −14 °C typed for each day. */
const COLD_RIG = {
  name: 'Frost van',
  bank: { chemistry: 'lifepo4', capacityAh: 150, nominalVolts: 12.8, location: 'outside' },
  arrays: [{ name: 'Roof', ratedWatts: 400 }],
};
const FURNACE = { name: 'Furnace blower', watts: 60, response: 'heating', setpointC: 18, windows: [[18, 8]], dutyPct: 40 };
const coldTrip = (rigId: string) => ({
  rigId,
  name: 'Frost weekend',
  stops: [
    {
      name: 'Frost camp',
      lat: 39,
      lon: -106,
      timeZone: 'America/Denver',
      arrive: '2027-11-20',
      nights: 2,
      weather: ['2027-11-20', '2027-11-21', '2027-11-22'].map((date) => ({ date, cloudOktas: 1, highC: -2, lowC: -14 })),
    },
  ],
});

async function created<T>(res: Response, what: string): Promise<T> {
  if (res.status !== 201) throw new Error(`${what}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

describe('a phone user switches to °F and reads the trip’s forecast in °F', () => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let tripId = '';
  let forecastId = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Ada Roadwell', password: PASSWORD });
    const rig = await created<{ id: string }>(await api('/api/rigs', { method: 'POST', session: camper, json: COLD_RIG }), 'rig');
    await created(await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: camper, json: FURNACE }), 'load');
    tripId = (await created<{ id: string }>(await api('/api/trips', { method: 'POST', session: camper, json: coldTrip(rig.id) }), 'trip'))
      .id;
    forecastId = (
      await created<{ id: string }>(await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: camper, json: {} }), 'forecast')
    ).id;
    ({ page, close } = await launch('phone', { locale: 'en-US' }));
    await signIn(page, camper.email, PASSWORD, `/trips/${tripId}`);
  });
  afterAll(async () => close?.());

  it('opens the account menu, reaches Settings and chooses imperial', async () => {
    await page.locator('#account-menu > summary').click();
    await page.getByRole('link', { name: 'Settings' }).click();
    await page.waitForURL('**/settings');
    await hydrated(page);
    await page.getByLabel('Imperial').check();
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Saved. Temperatures show in °F.').waitFor();
  });

  it('goes back to the trip, opens its saved forecast and reads °F in the table, the warnings and the CSV', async () => {
    await page.goBack();
    await page.waitForURL(`**/trips/${tripId}`);
    await hydrated(page);
    await page.locator(`a[href$="/forecasts/${forecastId}"]`).first().click();
    await page.waitForURL(`**/forecasts/${forecastId}`);
    await hydrated(page);

    // The hour-by-hour table: the column says °F and each row is the stored °C converted (°F = °C × 9/5 + 32).
    await page.getByTestId('hourly-details').locator('summary').click();
    const table = page.getByTestId('hourly-table');
    const headers = await table.locator('thead th').allTextContents();
    expect(headers).toContain('Air °F');
    expect(headers.join(' ')).not.toContain('°C');
    const saved = (await (await api(`/api/forecasts/${forecastId}`, { session: camper })).json()) as {
      forecast: { hourly: { ambientC: number }[] };
    };
    const air = headers.indexOf('Air °F');
    const firstRow = await table.locator('tbody tr').first().locator('th, td').allTextContents();
    expect(Number(firstRow[air])).toBeCloseTo((saved.forecast.hourly[0]!.ambientC * 9) / 5 + 32, 1);

    // The cold warning and its caution, worked out when the advice comes into view.
    const warnings = page.getByTestId('advice-warnings');
    await warnings.scrollIntoViewIfNeeded();
    await warnings.waitFor();
    const text = await warnings.innerText();
    expect(text).toContain('below 32 °F');
    expect(text).toContain('(32 °F)');
    expect(text).not.toContain('°C');
    await shot(page, 'units-walk-forecast-phone');

    // Nowhere on the page a °C any more.
    expect(await page.locator('main').innerText()).not.toContain('°C');

    // The CSV download follows the same setting.
    const csv = await (await api(`/api/forecasts/${forecastId}/hourly.csv`, { session: camper })).text();
    expect(csv.split('\r\n')[0]).toContain('ambientF');
    expect(csv.split('\r\n')[0]).not.toContain('ambientC');
  });
});
