// Reading a forecast (#16 items 9–11): the daily bars show demand with the loads a cut-off bank could not
// serve; the hourly chart shades drive hours and cut-off hours; the solar card says why solar went unused;
// compare lists what changed between two saved forecasts and names them in the first stop's local time.
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_ACCOUNTS } from '../../scripts/seed';
import { baseUrl } from '../helpers/api';
import { hydrated, launch, SCREENSHOTS, seriousViolations, shot, signIn } from '../helpers/browser';
import { ROOT } from '../helpers/server';

const TRIP = 'High desert loop with the trailer';

beforeAll(() => {
  execFileSync('npx', ['tsx', 'scripts/seed.ts'], { cwd: ROOT, env: { ...process.env, DATABASE_PATH: inject('dbPath') }, stdio: 'pipe' });
});

/** Runs a forecast of the trailer trip from its page, named `name`; leaves the page on the new forecast. */
async function runForecast(page: Page, name: string): Promise<string> {
  await page.goto(baseUrl() + '/trips');
  await page.getByRole('link', { name: TRIP }).first().click();
  await page.waitForURL(/\/trips\/[^/]+$/);
  await hydrated(page);
  await page.getByLabel('Name this forecast (optional)').fill(name);
  await page.getByRole('button', { name: 'Run a forecast' }).click();
  await page.waitForURL(/\/forecasts\/[^/]+$/);
  await page.getByTestId('verdict-headline').waitFor();
  return page.url();
}

/** A screenshot of one part of the page (to look at a chart at phone size). */
async function part(page: Page, testId: string, name: string): Promise<void> {
  await page.getByTestId(testId).screenshot({ path: path.join(SCREENSHOTS, `${name}.png`) });
}

/** The page is no wider than the window (nothing cut off sideways). */
async function noSidewaysScroll(page: Page): Promise<void> {
  const [scroll, inner] = await page.evaluate(() => [document.documentElement.scrollWidth, window.innerWidth]);
  expect(scroll).toBeLessThanOrEqual(inner);
}

describe('reading the forecast of a trip that runs out', () => {
  let page: Page;
  let close: () => Promise<void>;
  let forecastUrl = '';
  let compareUrl = '';

  beforeAll(async () => {
    ({ page, close } = await launch('desktop'));
    await signIn(page, DEMO_ACCOUNTS.camper.email, DEMO_ACCOUNTS.camper.password);
  });
  afterAll(async () => close?.());

  it('draws the cut-off days as tall as the loads asked, with the unserved part striped and named', async () => {
    forecastUrl = await runForecast(page, 'Before the bigger pump');
    await hydrated(page);
    // The trip's SOC chart (drawn on the server) marks the drive and the hours the bank is cut off as strips.
    const sketch = page.locator('[data-testid="soc-chart"][data-sketch]');
    expect(await sketch.locator('.drive-strip').count()).toBe(1);
    expect(await sketch.locator('.cutoff-strip').count()).toBeGreaterThan(0);
    expect(await sketch.getByRole('list', { name: 'Chart key' }).textContent()).toContain(
      'Strips at the bottom: green driving, orange bank cut off',
    );
    await page.locator('#days-heading').scrollIntoViewIfNeeded();
    const daily = page.getByTestId('daily-chart');
    await daily.locator('.recharts-surface').first().waitFor();
    // The trailer's bank cuts off: some days have loads not served, drawn as their own bars.
    await daily.locator('.bar-unmet path').first().waitFor();
    const heights = await daily.locator('.bar-unmet path').evaluateAll((ps) => ps.map((p) => (p as SVGGraphicsElement).getBBox().height));
    expect(Math.max(...heights)).toBeGreaterThan(10);
    expect(await daily.getByRole('list', { name: 'Chart key' }).textContent()).toContain('Loads not served (bank cut off)');
    expect(await page.getByTestId('daily-chart-summary').textContent()).toMatch(
      /Loads not served because the bank was cut off: \w{3} \d{1,2} \w{3} [\d,]+ Wh of [\d,]+ Wh asked/,
    );
  });

  it('shades the cut-off hours and the drive hours on the hourly chart, with a key', async () => {
    const hourly = page.getByTestId('hourly-flow-chart');
    await hourly.locator('.recharts-surface').first().waitFor();
    // It opens on the day of the first cutoff.
    expect(await hourly.locator('.cutoff-band').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('hourly-key').textContent()).toContain('Shaded orange: bank cut off');
    expect(await page.getByTestId('hourly-summary').textContent()).toMatch(/The bank is cut off \d{2}:\d{2}–\d{2}:\d{2}/);
    // The drive from Juniper Mesa on Sun 24 Oct, 09:00 for 5 hours.
    await hourly.getByLabel('Day').selectOption('2027-10-24');
    await hourly.locator('.drive-band').first().waitFor();
    expect(await hourly.locator('.drive-band').count()).toBe(1);
    expect(await hourly.locator('.drive-strip').count()).toBe(1);
    expect(await page.getByTestId('hourly-key').textContent()).toContain('Green strip and dashed edges: driving (alternator charging)');
    expect(await page.getByTestId('hourly-summary').textContent()).toContain('Driving (the alternator charges): 09:00–14:00.');
    // The solar card no longer lumps the causes together.
    expect(await page.getByTestId('summary-cards').textContent()).not.toContain('bank full or too cold');
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'forecast-reading-desktop');
  });

  it('lists what changed between two saved forecasts above the overlay, named in camp time', async () => {
    // Change one load between the two runs, as a crew member would on the rig page (through the same API).
    const { rigId, loads } = await page.evaluate(async (trip) => {
      const trips = (await (await fetch('/api/trips')).json()) as { name: string; rigId: string }[];
      const rigId = trips.find((t) => t.name === trip)?.rigId ?? '';
      return {
        rigId,
        loads: (await (await fetch(`/api/rigs/${rigId}/loads`)).json()) as { id: string; name: string; watts: number; version: number }[],
      };
    }, TRIP);
    const pump = loads.find((l) => l.name === 'Water pump');
    if (!pump) throw new Error('the seeded trailer has no water pump');
    const status = await page.evaluate(
      async (p) =>
        (
          await fetch(`/api/loads/${p.id}`, {
            method: 'PATCH',
            headers: { 'content-type': 'application/json' },
            body: JSON.stringify({ watts: 80, version: p.version }),
          })
        ).status,
      pump,
    );
    expect(status).toBe(200);
    try {
      await runForecast(page, 'After the bigger pump');
      await page.goto(baseUrl() + '/trips');
      await page.getByRole('link', { name: TRIP }).first().click();
      await page.waitForURL(/\/trips\/[^/]+$/);
      await hydrated(page);
      await page.getByRole('checkbox', { name: 'Pick Before the bigger pump to compare' }).first().check();
      await page.getByRole('checkbox', { name: 'Pick After the bigger pump to compare' }).first().check();
      await page.getByRole('link', { name: 'Compare the two picked' }).click();
      await page.waitForURL(/\/compare\?a=.+&b=.+/);
      compareUrl = page.url();
      const changes = page.getByTestId('compare-changes');
      await changes.waitFor();
      // Above the overlay.
      const [listTop, chartTop] = await Promise.all([changes.boundingBox(), page.locator('#compare-soc').boundingBox()]);
      expect(listTop!.y).toBeLessThan(chartTop!.y);
      expect(await page.getByTestId('changes-loads').textContent()).toBe('ChangedWater pump: watts 55\u00a0W → 80\u00a0W');
      // Both named by when they were made, in the local time at the first stop (Juniper Mesa, America/Denver).
      expect(await page.getByTestId('compare-changes-from').textContent()).toMatch(
        /^From Before the bigger pump, made \w{3} \d{1,2} \w{3}, \d{2}:\d{2}, to After the bigger pump, made \w{3} \d{1,2} \w{3}, \d{2}:\d{2} \(local time at Juniper Mesa\)\.$/,
      );
      expect(await seriousViolations(page)).toEqual([]);
      await shot(page, 'compare-changes-desktop');
    } finally {
      // Put the pump back for the other tests of this server.
      await page.evaluate(
        async (a) => {
          const now = ((await (await fetch(`/api/rigs/${a.rigId}/loads`)).json()) as { id: string; version: number }[]).find(
            (l) => l.id === a.id,
          );
          if (now)
            await fetch(`/api/loads/${a.id}`, {
              method: 'PATCH',
              headers: { 'content-type': 'application/json' },
              body: JSON.stringify({ watts: 55, version: now.version }),
            });
        },
        { rigId, id: pump.id },
      );
    }
  });

  it('fits a phone: both pages at 390 px without sideways scrolling', async () => {
    const phone = await launch('phone');
    try {
      await signIn(phone.page, DEMO_ACCOUNTS.camper.email, DEMO_ACCOUNTS.camper.password);
      await phone.page.goto(forecastUrl);
      await hydrated(phone.page);
      await phone.page.locator('#days-heading').scrollIntoViewIfNeeded();
      await phone.page.locator('[data-testid="daily-chart"] .bar-unmet path').first().waitFor();
      await phone.page.locator('[data-testid="hourly-flow-chart"] .cutoff-band').first().waitFor();
      await noSidewaysScroll(phone.page);
      await shot(phone.page, 'forecast-reading-phone');
      await part(phone.page, 'daily-chart', 'forecast-reading-phone-days');
      await part(phone.page, 'hourly-flow-chart', 'forecast-reading-phone-hourly');
      await phone.page.goto(compareUrl);
      await phone.page.getByTestId('compare-changes').waitFor();
      await phone.page.locator('.soc-line-compare path.recharts-curve').first().waitFor();
      await noSidewaysScroll(phone.page);
      expect(await seriousViolations(phone.page)).toEqual([]);
      await shot(phone.page, 'compare-changes-phone');
      await part(phone.page, 'compare-changes', 'compare-changes-phone-list');
    } finally {
      await phone.close();
    }
  });
});
