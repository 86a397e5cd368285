import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { makeRig, makeTrip } from '../helpers/crew';
import path from 'node:path';
import { hydrated, launch, SCREENSHOTS, signIn } from '../helpers/browser';

// A phone's decimal keypad (inputMode="decimal" on an iPhone) has digits and the decimal sign but no
// minus. A camper west of Greenwich or expecting a frost types the digits and taps the ± button beside
// the box; the number is read by the browser's locale as any typed number is, and saved below zero.

const PASSWORD = 'long-desert-road-7';

describe('signed fields at 390 px: a ± button where the keypad has no minus', () => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let tripId = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Ada Roadwell', password: PASSWORD });
    const rigId = (await makeRig(camper)).id;
    tripId = (await makeTrip(camper, rigId)).id;
    ({ page, close } = await launch('phone', { locale: 'en-US' }));
    await signIn(page, camper.email, PASSWORD, `/trips/${tripId}`);
  });
  afterAll(async () => close?.());

  it('types a western longitude and a frosty low with digits only, then ±, and saves them below zero', async () => {
    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    const lon = page.locator('#stops-0-lon');
    await lon.waitFor();
    // The keypad stays the decimal one: digits are quick, and the ± supplies the minus.
    expect(await lon.getAttribute('inputmode')).toBe('decimal');
    await lon.fill('109.55');
    await page.getByRole('button', { name: 'Switch Longitude between plus and minus' }).click();
    expect(await lon.inputValue()).toBe('-109.55');
    // The button leaves the caret in the box (a phone's keypad stays up).
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('stops-0-lon');
    // Pressed twice, the sign comes back off.
    await page.getByRole('button', { name: 'Switch Latitude between plus and minus' }).click();
    await page.getByRole('button', { name: 'Switch Latitude between plus and minus' }).click();
    expect(await page.locator('#stops-0-lat').inputValue()).toBe('36.1');

    // The first night's weather: a sky, a high, and a low typed as 4 then made −4.
    const sky = page.locator('select[id^="stops-0-weather-"]').first();
    await sky.selectOption({ index: 2 });
    const low = page.locator('#stops-0-weather-0-lowC');
    await low.waitFor();
    // A new day's empty boxes wait for the camper: no red message before a key is pressed.
    expect(await page.locator('#stops-0-weather-0-lowC-error').count()).toBe(0);
    expect(await page.locator('#stops-0-weather-0-highC-error').count()).toBe(0);
    await page.locator('#stops-0-weather-0-highC').fill('9');
    expect(await low.getAttribute('inputmode')).toBe('decimal');
    await low.fill('4');
    await page.getByRole('button', { name: 'Switch Low between plus and minus' }).click();
    expect(await low.inputValue()).toBe('-4');
    expect(await page.locator('#stops-0-weather-0-lowC-error').count()).toBe(0);
    await low.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'signed-fields-trip-editor-phone.png') });

    await page.getByRole('button', { name: 'Save trip' }).click();
    await page
      .getByRole('status')
      .filter({ hasText: /^Saved\.$/ })
      .waitFor();
    const res = await api(`/api/trips/${tripId}`, { session: camper });
    const trip = (await res.json()) as { stops: { lat: number; lon: number; weather: { highC: number; lowC: number }[] }[] };
    expect(trip.stops[0]?.lon).toBe(-109.55);
    expect(trip.stops[0]?.lat).toBe(36.1);
    expect(trip.stops[0]?.weather[0]).toMatchObject({ highC: 9, lowC: -4 });
  });

  it('on the quick plan too: a western longitude and a low below zero from digits and ±, sent as negative numbers', async () => {
    const anon = await launch('phone', { locale: 'en-US' });
    try {
      const p = anon.page;
      await p.goto(baseUrl() + '/');
      await hydrated(p);
      const lon = p.locator('#qp-lon');
      expect(await lon.getAttribute('inputmode')).toBe('decimal');
      await lon.fill('109.55');
      await p.getByRole('button', { name: 'Switch Longitude between plus and minus' }).click();
      expect(await lon.inputValue()).toBe('-109.55');
      await p.locator('#qp-high').fill('9');
      await p.locator('#qp-low').fill('4');
      await p.getByRole('button', { name: 'Switch Low between plus and minus' }).click();
      expect(await p.locator('#qp-low').inputValue()).toBe('-4');
      await p.locator('#qp-low').scrollIntoViewIfNeeded();
      await p.screenshot({ path: path.join(SCREENSHOTS, 'signed-fields-quick-plan-phone.png') });
      const sent = p.waitForRequest((r) => new URL(r.url()).pathname === '/api/forecasts/preview' && r.method() === 'POST');
      await p.getByRole('button', { name: 'Forecast my trip' }).click();
      const plan = (await sent).postDataJSON() as { stops: { lon: number; weather: { lowC: number; highC: number }[] }[] };
      expect(plan.stops[0]?.lon).toBe(-109.55);
      expect(plan.stops[0]?.weather[0]).toMatchObject({ highC: 9, lowC: -4 });
    } finally {
      await anon.close();
    }
  });
});
