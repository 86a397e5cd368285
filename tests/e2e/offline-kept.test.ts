import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, signIn } from '../helpers/browser';
import { createLoad, createRig } from '../helpers/fixtures';

// Issue 16, item 19, with the real service worker in Chromium: the trip page says what the phone
// really keeps of the trip — never a forecast a trip does not have, and the latest one by name.

const PASSWORD = 'correct-horse-1';
const TZ = 'America/Denver';
let camper: Session;
let bare: string;
let planned: string;

const STOP = { name: 'Juniper Mesa', lat: 35.6, lon: -105.9, timeZone: TZ, arrive: '2027-10-21', nights: 2 };

beforeAll(async () => {
  camper = await signUp({ name: 'Kept Camper', password: PASSWORD });
  const rig = await createRig(camper, {
    name: 'Kept van',
    bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 200 },
    arrays: [{ name: 'Roof', ratedWatts: 200 }],
    chargers: [],
  });
  await createLoad(camper, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 45 });
  const make = async (name: string) =>
    (
      (await (await api('/api/trips', { method: 'POST', session: camper, json: { rigId: rig.id, name, stops: [STOP] } })).json()) as {
        id: string;
      }
    ).id;
  bare = await make('No forecast yet');
  planned = await make('With a forecast');
  expect((await api(`/api/trips/${planned}/forecasts`, { method: 'POST', session: camper, json: { name: 'Before leaving' } })).status).toBe(
    201,
  );
});

describe('what the trip page says is kept on the phone', () => {
  let page: Page;
  let close: () => Promise<void>;
  beforeAll(async () => {
    ({ page, close } = await launch('phone', { timezoneId: TZ }));
    await signIn(page, camper.email, PASSWORD);
  });
  afterAll(async () => close?.());

  const status = () => page.getByTestId('offline-status').textContent();
  const open = async (id: string) => {
    await page.goto(`${baseUrl()}/trips/${id}`);
    await hydrated(page);
    await page.waitForFunction(() => document.documentElement.dataset.offlinePages !== undefined, undefined, { timeout: 60_000 });
  };

  it('says a trip without a saved forecast is kept without one', async () => {
    await open(bare);
    await expect
      .poll(status, { timeout: 20_000 })
      .toBe(
        'Kept on this phone for use without signal: this trip and its check-ins. It has no saved forecast yet — save one while you have signal to check in against it without signal.',
      );
    await page.getByText('This trip has no saved forecast yet, so a check-in is re-forecast when it reaches the server.').waitFor();
    expect(await page.getByText(/latest forecast are saved/).count()).toBe(0);
    await page.getByTestId('offline-status').scrollIntoViewIfNeeded();
    await shot(page, 'trip-kept-no-forecast-phone');
  });

  it('names the latest saved forecast that is kept, and says when a newer one is not on the phone yet', async () => {
    await open(planned);
    await expect
      .poll(status, { timeout: 20_000 })
      .toBe('Kept on this phone for use without signal: this trip, its check-ins and its latest saved forecast, “Before leaving”.');
    // A newer forecast saved elsewhere: the phone does not have it until it keeps the trip again.
    expect((await api(`/api/trips/${planned}/forecasts`, { method: 'POST', session: camper, json: { name: 'After lunch' } })).status).toBe(
      201,
    );
    await open(planned);
    await expect
      .poll(status, { timeout: 20_000 })
      .toBe(
        'Kept on this phone for use without signal: this trip and its check-ins. Its latest saved forecast, “After lunch”, is not on this phone yet. Older saved forecasts open only with signal.',
      );
    await page.getByTestId('offline-status').scrollIntoViewIfNeeded();
    await shot(page, 'trip-kept-newer-forecast-phone');
  });
});
