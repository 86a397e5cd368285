import AxeBuilder from '@axe-core/playwright';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { api, baseUrl, openTestDb, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName, signIn } from '../helpers/browser';
import { createLoad, createRig } from '../helpers/fixtures';
import { at } from '../../src/lib/invariant';

// The trip kept on the phone: in Chromium, with the real service worker and playwright's offline
// mode, the camper opens a trip that was saved while there was signal, checks in twice without
// signal (worked out on the phone with the same engine), and when the signal comes back — even
// when the first answer is lost on the way — each check-in is stored exactly once.

const PASSWORD = 'correct-horse-1';
const TZ = 'America/Denver';
let camper: Session;
let tripId: string;
let forecastId: string;

beforeAll(async () => {
  camper = await signUp({ name: 'Offline Camper', password: PASSWORD });
  const rig = await createRig(camper, { name: 'Offline van', bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 200 }, arrays: [{ name: 'Roof', ratedWatts: 200 }], chargers: [] });
  await createLoad(camper, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 45, response: 'cooling' });
  await createLoad(camper, rig.id, { name: 'Furnace blower', watts: 40, dutyPct: 60, response: 'heating', windows: [[20, 8]] });
  await createLoad(camper, rig.id, { name: 'Standby draw', watts: 10, standby: true });
  const trip = await (
    await api('/api/trips', {
      method: 'POST',
      session: camper,
      json: {
        rigId: rig.id,
        name: 'Juniper weekend',
        stops: [{ name: 'Juniper Mesa', lat: 35.6, lon: -105.9, timeZone: TZ, arrive: '2027-10-21', nights: 3, weather: [{ date: '2027-10-22', cloudOktas: 6, highC: 12, lowC: -3 }] }],
      },
    })
  ).json();
  tripId = trip.id;
  const f = await (await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: camper, json: { name: 'Before leaving' } })).json();
  forecastId = f.id;
});

/** Chromium as a phone at camp: its clock in the camp's zone, a fresh profile (so a fresh service worker). */
function phone(viewport: ViewportName): ReturnType<typeof launch> {
  return launch(viewport, { timezoneId: TZ });
}


/** What waits in the phone's outbox (IndexedDB). */
function outbox(page: Page): Promise<{ id: string; state: string; local: { socPct: number; outcome: Record<string, unknown> } | null }[]> {
  return page.evaluate(
    () =>
      new Promise((resolve, reject) => {
        const req = indexedDB.open('sunreckon');
        req.onerror = () => reject(req.error);
        req.onsuccess = () => {
          const db = req.result;
          if (!db.objectStoreNames.contains('checkin-outbox')) return resolve([]);
          const all = db.transaction('checkin-outbox').objectStore('checkin-outbox').getAll();
          all.onsuccess = () => resolve(all.result);
          all.onerror = () => reject(all.error);
        };
      }),
  );
}

const storedFor = (trip: string) => {
  const db = openTestDb();
  try {
    return db.prepare('select id, soc_pct, resting_volts, result from check_ins where trip_id = ? order by at_ms').all(trip) as { id: string; soc_pct: number; resting_volts: number | null; result: string }[];
  } finally {
    db.close();
  }
};

describe('a trip kept on the phone, offline', () => {
  let page: Page;
  let context: BrowserContext;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, context, close } = await phone('phone'));
    await signIn(page, camper.email, PASSWORD);
  });
  afterAll(async () => close?.());

  it('saves the signed-in camper’s trip, its latest forecast and the app for use without signal', async () => {
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    await page.waitForFunction(() => document.documentElement.dataset.offlineReady === 'true', undefined, { timeout: 60_000 });
    await page.getByTestId('offline-status').filter({ hasText: 'its latest saved forecast, “Before leaving”' }).waitFor();
    const cached = await page.evaluate(async () => {
      const out: string[] = [];
      for (const name of await caches.keys()) for (const r of await (await caches.open(name)).keys()) out.push(new URL(r.url).pathname);
      return out;
    });
    expect(cached).toEqual(expect.arrayContaining(['/trips', `/trips/${tripId}`, '/api/trips', `/api/trips/${tripId}`, `/api/trips/${tripId}/forecasts`, `/api/forecasts/${forecastId}`, `/trips/${tripId}/forecasts/${forecastId}`, '/manifest.webmanifest']));
    expect(cached.some((p) => /^\/_astro\/CheckIns\.[\w-]+\.js$/.test(p))).toBe(true);
  });

  let first: string;
  let second: string;

  it('opens the trip with no connection, says it is a saved copy, and checks in on the phone', async () => {
    await context.setOffline(true);
    await page.reload();
    await hydrated(page);
    const banner = page.locator('#offline-banner');
    await expect.poll(() => banner.textContent()).toMatch(/^Offline — showing saved copy from /);
    expect(await page.getByRole('heading', { name: 'Juniper weekend' }).count()).toBeGreaterThan(0);
    await page.getByRole('link', { name: 'Before leaving' }).waitFor();

    await page.getByLabel('Time of the reading').fill('2027-10-22T07:30');
    await page.getByLabel('State of charge, %').fill('62');
    await page.getByRole('button', { name: 'Check in' }).click();
    const result = page.getByTestId('check-in-result');
    await result.getByTestId('new-cutoff').waitFor();
    expect(await result.getByTestId('old-cutoff').textContent()).not.toBe('None saved for this trip');
    await result.getByTestId('check-in-waiting').waitFor();

    // A resting voltage too: 12.3 V is 50 % on the AGM table (forecast-engine.md, common practice).
    await page.getByLabel('Time of the reading').fill('2027-10-23T06:00');
    await page.getByText('Resting voltage (V)').click();
    await page.getByLabel('Resting voltage, V').fill('12.3');
    await page.getByRole('button', { name: 'Check in' }).click();
    await expect.poll(async () => (await outbox(page)).length).toBe(2);
    const q = await outbox(page);
    expect(q.every((x) => x.state === 'waiting' && x.local !== null)).toBe(true);
    expect(q.map((x) => x.local!.socPct).sort()).toEqual([50, 62]);
    first = at(q, 0, 'queued check-in').id;
    second = at(q, 1, 'queued check-in').id;
    await expect.poll(() => page.locator('[data-testid="check-in-row"][data-status="waiting"]').count()).toBe(2);
    await expect.poll(() => banner.textContent()).toMatch(/2 check-ins waiting to send/);
    // Nothing reached the server.
    expect(storedFor(tripId)).toEqual([]);
    await shot(page, 'offline-check-in-phone');
  });

  it('keeps the queued check-ins across a reload without signal', async () => {
    await page.reload();
    await hydrated(page);
    await expect.poll(() => page.locator('[data-testid="check-in-row"][data-status="waiting"]').count()).toBe(2);
    expect((await outbox(page)).map((x) => x.id).sort()).toEqual([first, second].sort());
  });

  it('back online, sends each exactly once — even when the first answer is lost — and the server agrees with the phone', async () => {
    const local = new Map((await outbox(page)).map((x) => [x.id, x.local!]));
    // The first send reaches the server, but its answer never reaches the phone.
    let lost = 0;
    await page.route('**/api/trips/*/check-ins', async (route) => {
      if (route.request().method() === 'POST' && lost === 0) {
        lost++;
        await route.fetch();
        return route.abort('connectionreset');
      }
      return route.continue();
    });
    await context.setOffline(false);
    await expect.poll(() => lost, { timeout: 15_000 }).toBe(1);
    // The lost answer left the check-in on the phone; the next attempt (the page tries again when it regains focus or signal) finds it stored.
    await expect.poll(() => storedFor(tripId).length).toBeGreaterThanOrEqual(1);
    expect((await outbox(page)).length).toBeGreaterThanOrEqual(1);
    await page.evaluate(() => window.dispatchEvent(new Event('online')));
    await expect.poll(async () => (await outbox(page)).length, { timeout: 30_000 }).toBe(0);
    await page.unroute('**/api/trips/*/check-ins');

    const rows = storedFor(tripId);
    expect(rows.map((r) => r.id).sort()).toEqual([first, second].sort());
    const viaApi = (await (await api(`/api/trips/${tripId}/check-ins`, { session: camper })).json()) as { id: string; outcome: Record<string, unknown>; socPct: number; forecastId: string }[];
    expect(viaApi.map((c) => c.id).sort()).toEqual([first, second].sort());
    for (const c of viaApi) {
      // Worked out on the phone with the same engine: the server's re-forecast is the phone's.
      expect(c.outcome).toEqual(local.get(c.id)!.outcome);
      expect(c.socPct).toBe(local.get(c.id)!.socPct);
      expect(c.forecastId).toBe(forecastId);
    }
    await expect.poll(() => page.locator('[data-testid="check-in-row"][data-status="saved"]').count()).toBe(2);
    expect(await page.locator('[data-testid="check-in-row"][data-status="waiting"]').count()).toBe(0);
    await shot(page, 'offline-synced-phone');
  });

  it('a page never opened while online says so offline, and lists the trips that were saved', async () => {
    await context.setOffline(true);
    await page.goto(`${baseUrl()}/crew`).catch(() => undefined);
    await page.getByText('was not saved on this phone').first().waitFor();
    expect(await page.getByRole('link', { name: /Juniper weekend/ }).count()).toBe(1);
    await context.setOffline(false);
  });
});

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('check-ins on the trip page at %s width', (viewport) => {
  it('shows the new cutoff beside the saved forecast’s', async () => {
    const { page, close } = await phone(viewport);
    try {
      await signIn(page, camper.email, PASSWORD);
      await page.goto(`${baseUrl()}/trips/${tripId}#check-ins`);
      await hydrated(page);
      await page.getByTestId('check-in-result').waitFor();
      await page.locator('#check-ins').scrollIntoViewIfNeeded();
      await page.locator('#check-ins').screenshot({ path: await shot(page, `check-ins-${viewport}`).then((p) => p.replace(/\.png$/, '-section.png')) });
      expect(await page.getByTestId('check-in-result').getByTestId('new-cutoff').textContent()).toMatch(/^(Runs out|Makes it|At or below)/);
      const axe = await new AxeBuilder({ page }).include('#check-ins').analyze();
      expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(' | ')}`)).toEqual([]);
    } finally {
      await close();
    }
  });
});
