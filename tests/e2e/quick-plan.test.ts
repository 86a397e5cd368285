// The landing page and its quick plan, as an anonymous visitor uses them in Chromium, against the
// built server. Expected verdicts come from the same engine the server runs.
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoPlan, forecast, validatePlan } from '../../src/engine';
import { verdict } from '../../src/domain/forecasts/verdict';
import { buildQuickPlan, QUICK_PLAN_STORAGE_KEY, type QuickPlanForm } from '../../src/domain/quick-plan/quick-plan';
import { uniqueEmail, baseUrl } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName } from '../helpers/browser';

/** What the test types into the form (the same values build the expected plan). */
const ENTRY: QuickPlanForm = {
  chemistry: 'lifepo4',
  capacityAh: 100,
  panelWatts: 200,
  mounting: 'tilted',
  shadePct: 10,
  loads: ['fridge', 'lights', 'pump', 'furnace', 'parasitic'],
  placeName: 'Test camp',
  lat: 38.6,
  lon: -109.6,
  timeZone: 'America/Denver',
  arrive: '2027-10-21',
  nights: 3,
  cloudOktas: 6,
  tempUnit: 'C',
  high: 12,
  low: -2,
};

function expectedHeadline(values: QuickPlanForm): string {
  const v = validatePlan(buildQuickPlan(values));
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return verdict(forecast(v.plan), v.plan).headline;
}

async function openQuickPlan(page: Page): Promise<void> {
  await page.goto(baseUrl() + '/');
  await page.locator('#quick-plan').scrollIntoViewIfNeeded();
  await page.locator('#landing-chart').scrollIntoViewIfNeeded();
  await hydrated(page);
}

/** Attributes of the SOC chart's SVG inside `scope`: the line's path and the reserve band. */
async function chartParts(page: Page, scope: string) {
  const line = page.locator(`${scope} .soc-line path`).first();
  await line.waitFor();
  const d = (await line.getAttribute('d')) ?? '';
  const band = page.locator(`${scope} [data-testid="reserve-band"]`);
  const bandHeight = Number((await band.getAttribute('height')) ?? 0);
  const edge = await page.locator(`${scope} [data-testid="reserve-edge"]`).count();
  return { d, bandCount: await band.count(), bandHeight, edge };
}

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('landing and quick plan in Chromium at %s width', (viewport) => {
  let page: Page;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, close } = await launch(viewport));
  });
  afterAll(async () => close?.());

  it('shows one example chart saying what Sunreckon answers', async () => {
    await openQuickPlan(page);
    const checked = validatePlan(demoPlan());
    if (!checked.ok) throw new Error('demo plan');
    const expected = verdict(forecast(checked.plan), checked.plan).headline;
    expect(await page.getByTestId('landing-verdict').textContent()).toBe(expected);
    const parts = await chartParts(page, '#landing-chart');
    expect(parts.d.length).toBeGreaterThan(200);
    expect(parts.d).not.toContain('NaN');
    expect(parts.bandCount).toBe(1);
    expect(parts.bandHeight).toBeGreaterThan(0);
    expect(parts.edge).toBe(1);
    expect(await page.locator('#landing-chart [data-testid="stop-name"]').allTextContents()).toEqual(['Juniper Mesa', 'Cinder Flat']);
    expect(await page.locator('#landing-chart .night-band').count()).toBe(5);
    await page.evaluate('window.scrollTo(0, 0)');
    await shot(page, `landing-${viewport}-chart`);
  });

  it('explains a bad entry next to its field, and sends nothing', async () => {
    await page.locator('#qp-capacityAh').fill('0');
    await page.locator('#qp-nights').fill('');
    await page.getByRole('button', { name: 'Forecast my trip' }).click();
    const capacityError = page.locator('#qp-capacityAh + #qp-capacityAh-error');
    await capacityError.waitFor();
    expect(await capacityError.textContent()).toBe('Enter a size above 0 Ah.');
    expect(await page.locator('#qp-capacityAh').getAttribute('aria-invalid')).toBe('true');
    expect(await page.locator('#qp-capacityAh').getAttribute('aria-describedby')).toBe('qp-capacityAh-error');
    expect(await page.locator('#qp-nights + #qp-nights-error').textContent()).toBe('Enter how many nights, 1 to 60.');
    expect(await page.getByTestId('verdict').count()).toBe(0);
    await page.locator('#qp-capacityAh').scrollIntoViewIfNeeded();
    await shot(page, `quick-plan-error-${viewport}`);
  });

  it('finds a camp’s town by name and fills its coordinates and time zone', async () => {
    await page.locator('#qp-placeName').fill('Moab');
    const hit = page.getByRole('button', { name: /^Moab, Utah/ });
    await hit.waitFor();
    await hit.click();
    expect(await page.locator('#qp-placeName').inputValue()).toBe('Moab, Utah, United States');
    expect(Number(await page.locator('#qp-lat').inputValue())).toBeCloseTo(38.573, 2);
    expect(Number(await page.locator('#qp-lon').inputValue())).toBeCloseTo(-109.55, 2);
    expect(await page.locator('#qp-timeZone').inputValue()).toBe('America/Denver');
  });

  it('forecasts a filled-in quick plan: verdict, SOC chart with the line and the reserve band, summary', async () => {
    await page.locator('#qp-capacityAh').fill(String(ENTRY.capacityAh));
    await page.locator('#qp-panelWatts').fill(String(ENTRY.panelWatts));
    await page.locator('#qp-shadePct').fill(String(ENTRY.shadePct));
    await page.locator('#qp-mounting').selectOption(ENTRY.mounting);
    await page.getByLabel(/Furnace blower/).check();
    await page.getByLabel(/Phones charging/).uncheck();
    await page.locator('#qp-placeName').fill(ENTRY.placeName);
    await page.locator('#qp-lat').fill(String(ENTRY.lat));
    await page.locator('#qp-lon').fill(String(ENTRY.lon));
    await page.locator('#qp-arrive').fill(ENTRY.arrive);
    await page.locator('#qp-nights').fill(String(ENTRY.nights));
    await page.locator('#qp-cloudOktas').selectOption(String(ENTRY.cloudOktas));
    await page.locator('#qp-high').fill(String(ENTRY.high));
    await page.locator('#qp-low').fill(String(ENTRY.low));
    // The zone found from the coordinates (server lookup or the browser's own) is Denver's.
    await page.waitForFunction(`document.querySelector('#qp-timeZone').value === 'America/Denver'`);
    await page.getByRole('button', { name: 'Forecast my trip' }).click();

    const headline = page.getByTestId('verdict-headline');
    await headline.waitFor({ timeout: 20_000 });
    expect(await headline.textContent()).toBe(expectedHeadline(ENTRY));
    expect(await page.locator('#qp-capacityAh-error').count()).toBe(0);

    const scope = '[data-testid="quick-plan-result"]';
    const parts = await chartParts(page, scope);
    expect(parts.d.length).toBeGreaterThan(100);
    expect(parts.d).not.toContain('NaN');
    expect(parts.bandCount).toBe(1);
    expect(parts.bandHeight).toBeGreaterThan(0);
    expect(await page.locator(`${scope} [data-testid="stop-name"]`).allTextContents()).toEqual(['Test camp']);
    const cards = await page.getByTestId('summary-cards').textContent();
    expect(cards).toContain('Lowest state of charge');
    expect(cards).not.toMatch(/NaN|undefined/);

    // Hovering the chart shows the hour in the camp's zone with its figures.
    const surface = page.locator(`${scope} [data-testid="soc-chart"] svg.recharts-surface`).first();
    await surface.scrollIntoViewIfNeeded();
    const box = await surface.boundingBox();
    if (!box) throw new Error('chart has no box');
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    const tip = page.getByTestId('soc-tooltip');
    await tip.waitFor();
    const tipText = (await tip.textContent()) ?? '';
    expect(tipText).toMatch(/M[DS]T \(UTC−0[67]:00\)/);
    expect(tipText).toMatch(/State of charge[\d.]+ %/);
    expect(tipText).toMatch(/Volts[\d.]+ V/);

    // Advice is worked out in the browser with the same engine, once the panel is in view.
    await page.getByTestId('advice').scrollIntoViewIfNeeded();
    await page.getByTestId('advice-changes').waitFor({ timeout: 20_000 });
    expect(await page.getByTestId('advice').textContent()).toContain('estimates');

    await page.mouse.move(0, 0);
    await page.getByTestId('verdict').scrollIntoViewIfNeeded();
    await shot(page, `quick-plan-result-${viewport}`);
  });

  it('downloads the hourly numbers as CSV', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('csv-download').click()]);
    const file = await download.path();
    const text = readFileSync(file, 'utf8');
    const lines = text.trim().split(/\r?\n/);
    expect(lines[0]).toBe('stop,time,socPct,usablePct,volts,minVolts,solarWatts,chargeWatts,loadWatts,unmetWatts,curtailedWatts,ambientC,batteryC,sunAltitudeDeg,poaWm2,driving,generatorOn,disconnected');
    // 15:00 on the arrival day to 11:00 after the third night.
    expect(lines.length).toBe(1 + 3 * 24 - 4);
    expect(lines[1]?.startsWith('Test camp,2027-10-21T15:00-06:00,')).toBe(true);
  });

  it('keeps the plan for after sign-up', async () => {
    await page.getByTestId('keep-plan').click();
    await page.waitForURL('**/sign-up?next=*');
    expect(new URL(page.url()).searchParams.get('next')).toBe('/keep-plan');
    const stored = JSON.parse((await page.evaluate(`sessionStorage.getItem(${JSON.stringify(QUICK_PLAN_STORAGE_KEY)})`)) as string);
    expect(stored).toEqual(JSON.parse(JSON.stringify(buildQuickPlan(ENTRY))));
  });

  it('saves the kept plan as the new camper\'s first rig and trip', async () => {
    await hydrated(page);
    await page.getByLabel('Your name').fill('Quick Planner');
    await page.getByLabel('E-mail').fill(uniqueEmail('quick'));
    await page.getByLabel('Password').fill('kept-plan-2027');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL(/\/trips\/[^/?#]+/);
    await hydrated(page);
    await page.getByRole('button', { name: 'Run a forecast' }).waitFor();
    expect(await page.evaluate(`sessionStorage.getItem(${JSON.stringify(QUICK_PLAN_STORAGE_KEY)})`)).toBeNull();
    const rigs = await page.evaluate(async () => (await fetch('/api/rigs')).json());
    expect(rigs).toHaveLength(1);
    const loads = await page.evaluate(async (id: string) => (await fetch(`/api/rigs/${id}/loads`)).json(), rigs[0].id);
    expect(loads.length).toBe(buildQuickPlan(ENTRY).loads?.length);
  });
});
