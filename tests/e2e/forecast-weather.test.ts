import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName } from '../helpers/browser';
import { createLoad, createRig } from '../helpers/fixtures';

// A camper plans a trip three months out without typing any weather, runs the forecast, and sees
// where each day's weather came from (the past years, from the local fake weather service) and
// "How sure is this?" — the band of the last ten years with its sentence; offline, the saved
// forecast still shows both.

const PASSWORD = 'dry-camp-weather-1';
const TZ = 'America/Denver';
const DAY = 86_400_000;
const isoDay = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('weather sources and the band in Chromium at %s width', (viewport) => {
  let camper: Session;
  let page: Page;
  let context: BrowserContext;
  let close: () => Promise<void>;

  beforeAll(async () => {
    camper = await signUp({ name: 'Weather Camper', password: PASSWORD });
    const rig = await createRig(camper, { name: 'Weather van', bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 100 }, arrays: [{ name: 'Roof', ratedWatts: 100 }], chargers: [] });
    await createLoad(camper, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 45, response: 'cooling' });
    await createLoad(camper, rig.id, { name: 'Furnace blower', watts: 40, dutyPct: 60, response: 'heating', windows: [[20, 8]] });
    ({ page, context, close } = await launch(viewport, { timezoneId: TZ }));
    await page.goto(baseUrl() + '/sign-in');
    await hydrated(page);
    await page.getByLabel('E-mail').fill(camper.email);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/trips');
  });
  afterAll(async () => close?.());

  it('creates a trip without weather, runs the forecast and sees each day’s source and the ten-year band', async () => {
    await page.goto(baseUrl() + '/trips/new');
    await hydrated(page);
    await page.getByLabel('Trip name').fill('Aspen bench, no weather typed');
    await page.locator('#stops-0-name').fill('Aspen bench');
    await page.locator('#stops-0-lat').fill('39.1');
    await page.locator('#stops-0-lon').fill('-107.2');
    await expect.poll(() => page.locator('#stops-0-timeZone').inputValue(), { timeout: 5000 }).toBe(TZ);
    await page.locator('#stops-0-arrive').fill(isoDay(90));
    await page.locator('#stops-0-nights').fill('3');
    await page.getByRole('button', { name: 'Create trip' }).click();
    await page.waitForURL(/\/trips\/(?!new\b)[^/?#]+(\?created=1)?$/);
    await hydrated(page);

    await page.getByRole('button', { name: 'Run a forecast' }).click();
    await page.waitForURL(/\/forecasts\/[^/]+$/);
    await page.getByTestId('weather-panel').waitFor();
    await hydrated(page);

    // Every day came from the past years (nothing typed, the service answered).
    const badges = page.getByTestId('day-sources').locator('[data-source]');
    expect(await badges.count()).toBe(4);
    expect(new Set(await badges.evaluateAll((els) => els.map((e) => e.getAttribute('data-source'))))).toEqual(new Set(['past-year']));
    expect(await badges.first().textContent()).toBe('Past years');
    // The band's sentence counts the ten years and names the worst.
    const sentence = await page.getByTestId('band-sentence').textContent();
    expect(sentence).toMatch(/^In (all 10|none|\d) of the last 10 years' weather the bank stays above its floor( and its cutoff voltage)?; in the worst \(\d{4}\) (it reaches the floor|its voltage sags to the low-voltage cutoff|it gets down to \d+ %) on (night|day) \d+ at \d\d:00\.$/);
    expect(await page.getByTestId('band-chart').locator('polygon').count()).toBe(1);
    // The verdict counts the years, and is never a plain "Makes it" here.
    expect(await page.getByTestId('verdict-headline').textContent()).toMatch(/of the last 10 years' weather|^Runs out/);
    await page.getByTestId('weather-panel').scrollIntoViewIfNeeded();
    await shot(page, `forecast-weather-${viewport}`);
  });

  it('compares two saved forecasts with both bands', async () => {
    const forecastUrl = page.url();
    const tripUrl = forecastUrl.replace(/\/forecasts\/[^/]+$/, '');
    const tripId = tripUrl.split('/').pop()!;
    const first = forecastUrl.split('/').pop()!;
    const second = await page.request.post(`${baseUrl()}/api/trips/${tripId}/forecasts`, { headers: { origin: baseUrl() }, data: { name: 'Second look' } });
    expect(second.status()).toBe(201);
    const secondId = (await second.json()).id as string;
    await page.goto(`${tripUrl}/compare?a=${first}&b=${secondId}`);
    await hydrated(page);
    const bands = page.getByTestId('compare-bands');
    await bands.waitFor();
    expect(await bands.getByTestId('band-chart').count()).toBe(2);
    expect(await bands.textContent()).toMatch(/of the last 10 years' weather.*of the last 10 years' weather/);
    await shot(page, `compare-bands-${viewport}`);
    // The newest forecast is the one kept on the phone for use without signal (next test).
    await page.goto(`${tripUrl}/forecasts/${secondId}`);
    await hydrated(page);
  });

  it('still shows the day sources and the band offline, from the copy saved on the phone', async () => {
    const url = page.url();
    await page.goto(url.replace(/\/forecasts\/[^/]+$/, ''));
    await hydrated(page);
    await page.waitForFunction(() => document.documentElement.dataset.offlineReady === 'true', undefined, { timeout: 60_000 });
    await page.goto(url);
    await page.getByTestId('weather-panel').waitFor();
    await context.setOffline(true);
    try {
      await page.reload();
      await page.getByTestId('band-sentence').waitFor({ timeout: 15_000 });
      expect(await page.getByTestId('day-sources').locator('[data-source="past-year"]').count()).toBe(4);
    } finally {
      await context.setOffline(false);
    }
  });

  it('shows each day’s source on the itinerary and copies the past years into the typed weather once the camper confirms', async () => {
    const tripUrl = page.url().replace(/\/forecasts\/[^/]+$/, '');
    const tripId = tripUrl.split('/').pop()!;
    await page.goto(tripUrl);
    await hydrated(page);
    const stop = page.getByTestId('stop-weather-0');
    await stop.locator('[data-source="past-year"]').first().waitFor();
    expect(await stop.locator('[data-source="past-year"]').count()).toBe(4);
    await page.getByRole('button', { name: 'Use past years' }).click();
    const confirm = page.getByRole('group', { name: 'Confirm copying the weather' });
    expect(await confirm.textContent()).toMatch(/^Copy 4 days from the past years \(\d{4}\) into this stop’s typed weather\?/);
    await shot(page, `trip-weather-${viewport}`);
    // Cancel changes nothing.
    await confirm.getByRole('button', { name: 'Cancel' }).click();
    expect((await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json()).stops[0].weather).toEqual([]);
    await page.getByRole('button', { name: 'Use past years' }).click();
    await page.getByRole('button', { name: 'Copy 4 days' }).click();
    await expect.poll(() => stop.locator('[data-source="typed"]').count(), { timeout: 10_000 }).toBe(4);
    const trip = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    expect(trip.stops[0].weather).toHaveLength(4);
    for (const w of trip.stops[0].weather) expect(Object.keys(w).sort()).toEqual(['cloudOktas', 'date', 'highC', 'lowC']);
    expect(await page.getByRole('button', { name: 'Use past years' }).count()).toBe(0);
  });
});
