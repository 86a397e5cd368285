import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { makeRig, makeTrip } from '../helpers/crew';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName } from '../helpers/browser';

// What a camper trips over on a phone and a wide screen: the account menu (Settings, Sign out) at 390 px,
// the rig's section tabs all in view, "1,200" typed in an en-US browser saving as 1200 W, the forecast
// page's one <h1>, unique landmarks, and a wide loads table (and its edit form) inside its box at 1280
// and 1440 px — in the built server and Chromium.

const PASSWORD = 'long-desert-road-7';

/** Axe violations of the page as it is now, as readable lines: serious/critical ones plus the named rules. */
async function violations(page: Page, alsoRules: string[] = []): Promise<string[]> {
  const results = await new AxeBuilder({ page }).analyze();
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical' || alsoRules.includes(v.id))
    .map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(' | ')}`);
}

/** How far (px) each matched element sticks out to the right of `box`; [] when all sit inside. */
async function overhang(page: Page, boxSelector: string, innerSelector: string): Promise<string[]> {
  return page.evaluate(
    ([b, i]) => {
      const box = document.querySelector(b);
      if (!box) return [`no ${b}`];
      const right = box.getBoundingClientRect().right;
      const out: string[] = [];
      if (box.scrollWidth > box.clientWidth + 1) out.push(`${b} scrolls: ${box.scrollWidth} > ${box.clientWidth}`);
      for (const el of box.querySelectorAll(i)) {
        const r = el.getBoundingClientRect();
        if (r.width > 0 && r.right > right + 1) out.push(`${el.textContent?.trim().slice(0, 30)} ends at ${Math.round(r.right)} > ${Math.round(right)}`);
      }
      return out;
    },
    [boxSelector, innerSelector] as const,
  );
}

const WIDE_LOAD = {
  name: 'Diesel heater with glow plug and the long fan run-on',
  note: 'Runs through the cold hours, then a few minutes of fan after it stops',
  watts: 1200,
  surgeWatts: 2400,
  supply: 'ac',
  windows: [[0, 2], [5, 8], [11, 13], [17, 19], [21, 24]],
  dutyPct: 35,
  days: 'camp',
  response: 'heating',
  setpointC: 7,
  location: 'cabin',
};

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('phone menu, tabs, numbers and the loads table in Chromium at %s width', (viewport) => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let rigId = '';
  let tripId = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Ada Roadwell', password: PASSWORD });
    rigId = (await makeRig(camper)).id;
    const load = await api(`/api/rigs/${rigId}/loads`, { method: 'POST', session: camper, json: WIDE_LOAD });
    if (load.status !== 201) throw new Error(`load failed: ${load.status} ${await load.text()}`);
    tripId = (await makeTrip(camper, rigId)).id;
    ({ page, close } = await launch(viewport, { locale: 'en-US' }));
    await page.goto(baseUrl() + '/sign-in');
    await hydrated(page);
    await page.getByLabel('E-mail').fill(camper.email);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/(rigs|trips)$/);
  });
  afterAll(async () => close?.());

  it('opens the account menu, reaches Settings and switches to imperial units', async () => {
    await page.goto(baseUrl() + '/rigs');
    await hydrated(page);
    const menu = page.locator('#account-menu');
    // Closed, its items are out of the way (and out of the accessibility tree).
    expect(await page.getByRole('link', { name: 'Settings' }).count()).toBe(0);
    await menu.locator('summary').click();
    const settings = page.getByRole('link', { name: 'Settings' });
    await settings.waitFor();
    expect(await page.getByRole('button', { name: 'Sign out' }).isVisible()).toBe(true);
    await shot(page, `account-menu-open-${viewport}`);
    // Escape closes it and leaves focus on its button.
    await page.keyboard.press('Escape');
    expect(await menu.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(false);
    expect(await page.evaluate(() => document.activeElement?.tagName)).toBe('SUMMARY');
    // The keyboard opens it again; then the camper follows Settings.
    await page.keyboard.press('Enter');
    await settings.click();
    await page.waitForURL('**/settings');
    await hydrated(page);
    await page.getByLabel('Imperial').check();
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Saved. Temperatures show in °F.').waitFor();
    await page.reload();
    await hydrated(page);
    expect(await page.getByLabel('Imperial').isChecked()).toBe(true);
  });

  it('shows every rig section tab inside the screen, with unique landmarks', async () => {
    await page.goto(`${baseUrl()}/rigs/${rigId}`);
    await hydrated(page);
    const width = page.viewportSize()?.width ?? 0;
    for (const label of ['Power system', 'Loads', 'Logs', 'Activity', 'Installers']) {
      const tab = page.getByRole('navigation', { name: 'Rig sections' }).getByRole('link', { name: label, exact: true });
      const box = await tab.boundingBox();
      expect(box, label).not.toBeNull();
      expect(box!.x, label).toBeGreaterThanOrEqual(0);
      expect(box!.x + box!.width, label).toBeLessThanOrEqual(width);
    }
    await shot(page, `rig-page-tabs-${viewport}`);
    expect(await violations(page, ['landmark-unique', 'page-has-heading-one', 'region'])).toEqual([]);
  });

  it('reads "1,200" typed in an en-US browser as 1200 W, shows it, and saves 1200', async () => {
    await page.goto(`${baseUrl()}/rigs/${rigId}#loads`);
    await hydrated(page);
    await page.getByRole('button', { name: '+ Add a load' }).click();
    const editor = page.getByRole('form', { name: 'New load' });
    await editor.getByLabel('Name').fill('Induction hob');
    await editor.getByLabel('Watts (each)').fill('1,200');
    await editor.getByText('Reads as 1200 W').waitFor();
    await shot(page, `load-watts-reads-as-${viewport}`);
    await editor.getByRole('button', { name: 'Add load' }).click();
    await page.locator('[data-load-row="Induction hob"]').waitFor();
    const loads = (await (await api(`/api/rigs/${rigId}/loads`, { session: camper })).json()) as { name: string; watts: number }[];
    expect(loads.find((l) => l.name === 'Induction hob')?.watts).toBe(1200);
  });

  it('puts the forecast page under one <h1>', async () => {
    const res = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: camper, json: { name: 'Heading check' } });
    expect(res.status).toBe(201);
    const { id } = (await res.json()) as { id: string };
    await page.goto(`${baseUrl()}/trips/${tripId}/forecasts/${id}`);
    await page.getByTestId('verdict-headline').waitFor();
    await hydrated(page);
    expect(await page.locator('h1').count()).toBe(1);
    expect(await page.locator('h1').textContent()).toBe('Forecast for Test trip');
    expect(await violations(page, ['page-has-heading-one', 'landmark-unique'])).toEqual([]);
  });

  it.each(viewport === 'desktop' ? [1280, 1440] : [])('keeps the wide loads table and its edit form inside the box at %i px', async (w) => {
    await page.setViewportSize({ width: w, height: 900 });
    await page.goto(`${baseUrl()}/rigs/${rigId}#loads`);
    await hydrated(page);
    await page.locator(`[data-load-row="${WIDE_LOAD.name}"]`).waitFor();
    expect(await overhang(page, '#loads-table-box', 'button, td')).toEqual([]);
    await shot(page, `loads-wide-${w}`);
    await page.getByRole('button', { name: `Edit ${WIDE_LOAD.name}` }).click();
    await page.getByRole('form', { name: `Edit ${WIDE_LOAD.name}` }).waitFor();
    expect(await overhang(page, '#loads-table-box', 'form, form input, form button')).toEqual([]);
    await shot(page, `loads-wide-edit-${w}`);
    await page.getByRole('button', { name: 'Cancel' }).first().click();
  });
});
