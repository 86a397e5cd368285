import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName } from '../helpers/browser';
import { createLoad, createRig } from '../helpers/fixtures';

// The weather service is down and the camper typed one day of a three-day stop: the forecast page
// says so, badges the typed day "Typed" and the other days "Copied from" it — what the engine
// really used — never "Assumed", and shows no weather-service credit (none of its data is used).
// With the service up, the page credits the service's data (CC BY 4.0).

const PASSWORD = 'dry-camp-down-1';
const TZ = 'America/Denver';
const DAY = 86_400_000;
const isoDay = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);
const fakeMode = async (mode: 'normal' | 'fail') => {
  const r = await fetch(`${inject('weatherUrl')}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode }) });
  expect(r.status).toBe(200);
};

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('weather badges with the service down, in Chromium at %s width', (viewport) => {
  let camper: Session;
  let rigId: string;
  let page: Page;
  let close: () => Promise<void>;
  let place = 0;

  async function tripWith(weather: unknown[]): Promise<string> {
    place += 1;
    const arrive = isoDay(100 + place);
    const res = await api('/api/trips', {
      method: 'POST',
      session: camper,
      json: {
        rigId,
        name: `Down trip ${place}`,
        stops: [
          {
            name: 'Lone mesa',
            lat: 37.3 + place * 0.3 + (viewport === 'phone' ? 0.1 : 0),
            lon: -108.6,
            timeZone: TZ,
            arrive,
            nights: 2,
            weather: weather.map((w) => ({ date: arrive, ...(w as object) })),
          },
        ],
      },
    });
    expect(res.status).toBe(201);
    return ((await res.json()) as { id: string }).id;
  }

  async function runForecast(tripId: string): Promise<void> {
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Run a forecast' }).click();
    await page.waitForURL(/\/forecasts\/[^/]+$/);
    await page.getByTestId('weather-panel').waitFor();
    await hydrated(page);
  }

  beforeAll(async () => {
    camper = await signUp({ name: 'Down Camper', password: PASSWORD });
    const rig = await createRig(camper, {
      name: 'Down van',
      bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 200 },
      arrays: [{ name: 'Roof', ratedWatts: 200 }],
      chargers: [],
    });
    rigId = rig.id;
    await createLoad(camper, rigId, { name: 'Compressor fridge', watts: 45, dutyPct: 40 });
    ({ page, close } = await launch(viewport, { timezoneId: TZ }));
    await page.goto(baseUrl() + '/sign-in');
    await hydrated(page);
    await page.getByLabel('E-mail').fill(camper.email);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/trips');
  });
  afterEach(async () => fakeMode('normal'));
  afterAll(async () => close?.());

  it('badges the untyped days as copied from the typed one, with the message, and no service credit', async () => {
    const tripId = await tripWith([{ cloudOktas: 6, highC: 9, lowC: -1 }]);
    await fakeMode('fail');
    await runForecast(tripId);
    expect(await page.getByTestId('weather-message').textContent()).toMatch(
      /^Weather service unreachable — using your typed skies and each stop's nearest day with weather/,
    );
    const badges = page.getByTestId('day-sources').locator('[data-source]');
    expect(await badges.evaluateAll((els) => els.map((e) => e.getAttribute('data-source')))).toEqual(['typed', 'copied', 'copied']);
    expect(await badges.nth(1).textContent()).toMatch(/^Copied from \w{3} \d{1,2} \w{3}, typed$/);
    expect(await page.getByTestId('day-sources').textContent()).not.toContain('Assumed');
    expect(await page.getByTestId('weather-credit').count()).toBe(0);
    await page.getByTestId('weather-panel').scrollIntoViewIfNeeded();
    await shot(page, `weather-copied-${viewport}`);
  });

  it('credits the weather service where its data is shown', async () => {
    const tripId = await tripWith([]);
    await runForecast(tripId);
    expect(await page.getByTestId('day-sources').locator('[data-source="past-year"]').count()).toBe(3);
    const credit = page.getByTestId('weather-credit');
    expect(await credit.textContent()).toMatch(/Weather data by Open-Meteo\.com \(CC BY 4\.0\)/);
    expect(await credit.getByRole('link', { name: 'CC BY 4.0' }).getAttribute('href')).toBe('https://creativecommons.org/licenses/by/4.0/');
    await page.getByTestId('weather-credit').scrollIntoViewIfNeeded();
    await shot(page, `weather-credit-${viewport}`);
  });
});
