import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_ACCOUNTS } from '../../scripts/seed';
import { baseUrl } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName, seriousViolations, signIn } from '../helpers/browser';
import { ROOT } from '../helpers/server';

/** Serious and critical axe violations of the page as it is now, as readable lines. */


beforeAll(() => {
  // The invented demo crew, seeded into the test server's database (the seed is idempotent).
  execFileSync('npx', ['tsx', 'scripts/seed.ts'], { cwd: ROOT, env: { ...process.env, DATABASE_PATH: inject('dbPath') }, stdio: 'pipe' });
});

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('forecasts in Chromium at %s width', (viewport) => {
  let page: Page;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, close } = await launch(viewport));
    await signIn(page, DEMO_ACCOUNTS.camper.email, DEMO_ACCOUNTS.camper.password);
  });
  afterAll(async () => close?.());

  it('runs a forecast of the seeded trailer trip and shows when the bank runs out', async () => {
    await page.getByRole('link', { name: /High desert loop with the trailer/ }).first().click();
    await page.waitForURL(/\/trips\/[^/]+$/);
    await hydrated(page);
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, `trip-${viewport}`);
    await page.getByLabel('Name this forecast (optional)').fill(`Run at ${viewport} width`);
    await page.getByRole('button', { name: 'Run a forecast' }).click();
    await page.waitForURL(/\/forecasts\/[^/]+$/);
    await page.getByTestId('verdict-headline').waitFor();
    const headline = await page.getByTestId('verdict-headline').textContent();
    // The verdict names the day and local time of the cutoff, e.g. "Runs out Fri 22 Oct at 21:00 at …".
    expect(headline).toMatch(/^Runs out \w{3} \d{1,2} \w{3} at \d{2}:\d{2}/);
    await hydrated(page);
    // The chart comes drawn from the server (no script needed): line, reserve band, cutoff marker.
    const sketch = page.locator('[data-testid="soc-chart"][data-sketch]');
    expect(await sketch.locator('.soc-line path').getAttribute('d')).toMatch(/^M0\.00,[\d.]+( L[\d.]+,[\d.]+){20,}$/);
    expect(await sketch.getByTestId('reserve-band').count()).toBe(1);
    expect(await sketch.getByTestId('cutoff-marker').count()).toBe(1);
    expect(await sketch.getByTestId('cutoff-label').textContent()).toMatch(/^Cutoff \d{2}:\d{2}$/);
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, `forecast-${viewport}`);

    // Pointing at it brings the interactive chart in the same place, with each hour's figures.
    const holder = page.getByTestId('soc-chart-on-demand');
    await holder.scrollIntoViewIfNeeded(); // a phone shows the chart's middle only after a scroll
    const before = await holder.boundingBox();
    if (!before) throw new Error('the chart has no box');
    await page.mouse.move(before.x + before.width * 0.4, before.y + before.height * 0.5);
    const chart = page.locator('[data-testid="soc-chart"]:not([data-sketch])');
    await chart.locator('.soc-line path.recharts-curve').first().waitFor();
    expect(await chart.getByTestId('reserve-band').count()).toBe(1);
    expect(await chart.getByTestId('cutoff-marker').count()).toBe(1);
    expect(await chart.getByTestId('cutoff-label').textContent()).toMatch(/\d{2}:\d{2}/);
    const after = await holder.boundingBox();
    expect(Math.abs((after?.height ?? 0) - before.height)).toBeLessThan(8);
    const surface = chart.locator('svg.recharts-surface').first();
    const box = await surface.boundingBox();
    if (!box) throw new Error('the interactive chart has no box');
    await page.mouse.move(box.x + box.width * 0.55, box.y + box.height * 0.5);
    await page.getByTestId('soc-tooltip').waitFor();
    expect(await page.getByTestId('soc-tooltip').textContent()).toMatch(/State of charge[\d.]+ %/);
    await page.mouse.move(0, 0);

    // Further down, the day charts load and the advice is worked out as they come into view.
    await page.locator('#days-heading').scrollIntoViewIfNeeded();
    await page.locator('[data-testid="daily-chart"] .recharts-surface').first().waitFor();
    await page.getByTestId('advice').scrollIntoViewIfNeeded();
    await page.getByTestId('advice-changes').or(page.getByText('No single change stands out')).first().waitFor({ timeout: 20_000 });
    // The hour-by-hour table is built when opened.
    await page.getByTestId('hourly-details').locator('summary').click();
    await page.getByTestId('hourly-table').locator('tbody tr').nth(100).waitFor();
    expect(await page.getByTestId('hourly-table').locator('tbody tr').count()).toBe(await page.getByTestId('hourly-details').locator('summary').textContent().then((t) => Number(/\((\d+) hours\)/.exec(t ?? '')?.[1])));
  });

  it('downloads the hourly CSV', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('csv-download').first().click()]);
    const file = await download.path();
    const lines = readFileSync(file, 'utf8').trim().split(/\r?\n/);
    expect(lines[0]).toMatch(/^stop,time,socPct/);
    expect(lines.length).toBeGreaterThan(100);
  });

  it('compares two saved forecasts', async () => {
    await page.getByRole('link', { name: 'High desert loop with the trailer' }).click();
    await page.waitForURL(/\/trips\/[^/]+(#forecasts)?$/);
    await hydrated(page);
    const boxes = page.getByRole('checkbox', { name: /^Pick .* to compare$/ });
    await boxes.first().waitFor();
    expect(await boxes.count()).toBeGreaterThanOrEqual(2);
    await boxes.nth(0).check();
    await boxes.nth(1).check();
    await page.getByRole('link', { name: 'Compare the two picked' }).click();
    await page.waitForURL(/\/compare\?a=.+&b=.+/);
    await page.getByTestId('compare-view').waitFor();
    await page.locator('.soc-line-compare path.recharts-curve').first().waitFor();
    expect(await page.locator('.soc-line path.recharts-curve').count()).toBeGreaterThan(0);
    expect(await page.locator('.soc-line-compare path.recharts-curve').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('compare-table').locator('tr').count()).toBeGreaterThan(4);
    await shot(page, `compare-${viewport}`);
  });
});

describe('landing page accessibility', () => {
  it('has no serious or critical axe violations', async () => {
    const { page, close } = await launch('phone');
    try {
      await page.goto(baseUrl() + '/');
      // The quick plan hydrates when it scrolls into view.
      await page.locator('#quick-plan').scrollIntoViewIfNeeded();
      await hydrated(page);
      expect(await seriousViolations(page)).toEqual([]);
    } finally {
      await close();
    }
  });
});
