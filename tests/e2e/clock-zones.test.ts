import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl } from '../helpers/api';
import { hydrated, launch, shot, signIn } from '../helpers/browser';
import { dbGet } from '../helpers/fixtures';
import { makeCast, makeWorld } from '../helpers/world';
import type { Cast, World } from '../helpers/routes';
import { formatInstant, zoneClock } from '../../src/lib/clock';

// A camper whose phone is not on UTC (the test server runs on the machine's clock, UTC): every page
// that shows a time must hydrate without React's text-mismatch error (#418). App-event times show in
// the user's zone (the browser's own, sent once and stored), formatted by the server's zone rules on
// both sides; Chromium's own zone data differs from Node's for some zones (Vancouver from Nov 2026).

const PASSWORD = 'correct-horse-1';
const HYDRATION = /hydrat|#418|#423|#425|did not match|server rendered/i;

/** Console errors and uncaught page errors, gathered from here on. */
function errorsOf(page: Page): string[] {
  const seen: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') seen.push(m.text());
  });
  page.on('pageerror', (e) => seen.push(String(e.message)));
  return seen;
}

/** Opens a page, lets its islands hydrate and fetch, and returns the hydration errors it logged. */
async function visit(page: Page, seen: string[], path: string): Promise<string[]> {
  seen.length = 0;
  await page.goto(baseUrl() + path);
  await hydrated(page);
  await page.waitForLoadState('networkidle');
  return seen.filter((e) => HYDRATION.test(e));
}

const zoneOf = (userId: string) => dbGet<{ timeZone: string | null }>('select "timeZone" from "user" where id = ?', userId)?.timeZone;

describe.each(['America/Vancouver', 'Pacific/Auckland'])('pages with times in a browser on %s', (timezoneId) => {
  let cast: Cast;
  let world: World;
  let second: { id: string; createdAt: string };
  const closers: (() => Promise<void>)[] = [];
  let page: Page;
  let seen: string[];

  beforeAll(async () => {
    cast = await makeCast();
    world = await makeWorld(cast);
    const res = await api(`/api/trips/${world.trip.id}/forecasts`, { method: 'POST', session: cast.owner, json: { name: 'Second look' } });
    expect(res.status).toBe(201);
    second = (await res.json()) as { id: string; createdAt: string };
    const b = await launch('desktop', { timezoneId });
    closers.push(b.close);
    page = b.page;
    seen = errorsOf(page);
    await signIn(page, cast.owner.email, PASSWORD);
  });
  afterAll(async () => {
    for (const c of closers) await c();
  });

  it.each([
    ['trips list', () => '/trips'],
    ['rigs list', () => '/rigs'],
    ['trip (saved forecasts, check-ins)', () => `/trips/${world.trip.id}`],
    ['saved forecast', () => `/trips/${world.trip.id}/forecasts/${world.forecast.id}`],
    ['compare', () => `/trips/${world.trip.id}/compare?a=${world.forecast.id}&b=${second.id}`],
    ['rig (activity, installers)', () => `/rigs/${world.rig.id}#activity`],
    ['crew', () => '/crew'],
    ['proposals', () => '/proposals'],
    ['proposal', () => `/proposals/${world.proposal.id}`],
    ['settings', () => '/settings'],
  ])('the %s page hydrates without a mismatch', async (_what, path) => {
    expect(await visit(page, seen, path())).toEqual([]);
  });

  it('stored the browser’s zone once, and the trip page shows when each forecast was saved in it', async () => {
    expect(zoneOf(cast.owner.userId)).toBe(timezoneId);
    expect(await visit(page, seen, `/trips/${world.trip.id}`)).toEqual([]);
    // The server's rules for the zone (this test runs on the same Node as the server).
    const want = formatInstant(second.createdAt, zoneClock(timezoneId));
    await expect.poll(() => page.locator(`time[datetime="${second.createdAt}"]`).textContent()).toBe(want);
  });

  it('the installer’s pages hydrate too', async () => {
    const b = await launch('desktop', { timezoneId });
    closers.push(b.close);
    const errors = errorsOf(b.page);
    await signIn(b.page, cast.installer.email, PASSWORD, '/installer');
    expect(errors.filter((e) => HYDRATION.test(e))).toEqual([]);
    expect(await visit(b.page, errors, `/proposals/${world.proposal.id}`)).toEqual([]);
  });
});

describe('choosing a time zone in Settings', () => {
  it('saves the zone chosen and shows app times in it from then on', async () => {
    const cast = await makeCast();
    const world = await makeWorld(cast);
    const b = await launch('phone', { timezoneId: 'America/Vancouver' });
    try {
      const seen = errorsOf(b.page);
      await signIn(b.page, cast.owner.email, PASSWORD, '/settings');
      const select = b.page.getByLabel('Your time zone');
      // Nothing stored before this first page: the form offers this device's zone.
      await expect.poll(() => select.inputValue()).toBe('America/Vancouver');
      await shot(b.page, 'settings-time-zone-phone');
      await select.selectOption('Europe/Berlin');
      await b.page.getByRole('button', { name: 'Save time zone' }).click();
      await b.page.getByText(/Saved\. Times now show in Berlin time/).waitFor();
      expect(zoneOf(cast.owner.userId)).toBe('Europe/Berlin');

      // A browser elsewhere does not move the choice; its pages show Berlin time.
      const forecast = (await (await api(`/api/forecasts/${world.forecast.id}`, { session: cast.owner })).json()) as { createdAt: string };
      expect(await visit(b.page, seen, `/trips/${world.trip.id}/forecasts/${world.forecast.id}`)).toEqual([]);
      await expect
        .poll(() => b.page.locator(`time[datetime="${forecast.createdAt}"]`).textContent())
        .toBe(formatInstant(forecast.createdAt, zoneClock('Europe/Berlin')));
      expect(zoneOf(cast.owner.userId)).toBe('Europe/Berlin');

      const desk = await launch('desktop', { timezoneId: 'America/Vancouver' });
      try {
        await signIn(desk.page, cast.owner.email, PASSWORD, '/settings');
        await desk.page.getByRole('button', { name: 'Save time zone' }).waitFor();
        expect(await desk.page.getByLabel('Your time zone').inputValue()).toBe('Europe/Berlin');
        await shot(desk.page, 'settings-time-zone-desktop');
      } finally {
        await desk.close();
      }
    } finally {
      await b.close();
    }
  });
});
