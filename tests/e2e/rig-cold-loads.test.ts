import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName, seriousViolations } from '../helpers/browser';

// Revision 2 in the forms: a camper puts the bank inside the heated cabin, gives the inverter's
// ratings, types a load in amps and sees it in watts, saves, and finds it all again after a reload
// — at phone and desktop widths, in the built server and Chromium, axe clean.

const PASSWORD = 'cold-nights-2027';

/** Serious and critical axe violations of the page as it is now, as readable lines. */

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('a cabin bank and a load in amps in Chromium at %s width', (viewport) => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let rigUrl = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Cold Camper', password: PASSWORD });
    ({ page, close } = await launch(viewport));
    await page.goto(baseUrl() + '/sign-in');
    await hydrated(page);
    await page.getByLabel('E-mail').fill(camper.email);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/(rigs|trips)$/);
  });
  afterAll(async () => close?.());

  it('creates a rig with its bank inside the heated cabin and the inverter’s ratings', async () => {
    await page.goto(baseUrl() + '/rigs/new');
    await hydrated(page);
    await page.getByLabel('Rig name').fill('Winter van');
    await page.getByLabel('Capacity').fill('200');
    // Outside is the default; the camper picks the cabin. An outside LiFePO4 bank carries the cold-charging caution.
    expect(await page.getByLabel(/Outside box or bay/).isChecked()).toBe(true);
    await page.getByText(/LiFePO4 must not be charged below freezing/).waitFor();
    await page.getByLabel(/Inside the heated cabin/).check();
    expect(await page.getByText(/LiFePO4 must not be charged below freezing/).count()).toBe(0);
    await page.getByText('More battery settings').click();
    expect(await page.getByLabel('Battery’s thermal lag').inputValue()).toBe('6');
    await page.getByLabel('Battery’s thermal lag').fill('4');
    await page.getByLabel(/This rig has an inverter/).check();
    await page.getByLabel('Continuous rating').fill('1000');
    await page.getByLabel('Surge rating').fill('-5');
    await page.getByLabel('Surge rating').blur();
    await expect(page.locator('#inverter-surgeWatts-error').textContent()).resolves.toMatch(/greater than 0/);
    await page.getByLabel('Surge rating').fill('2000');
    await shot(page, `rig-cold-new-${viewport}`);
    expect(await seriousViolations(page)).toEqual([]);
    await page.getByRole('button', { name: 'Create rig' }).click();
    await page.waitForURL(/\/rigs\/(?!new\b)[^/?#]+/);
    rigUrl = page.url().replace(/[?#].*$/, '');
    await hydrated(page);
  });

  it('types a load in amps, sees its watts, and saves it as watts', async () => {
    await page.getByRole('button', { name: '+ Add a load' }).click();
    const editor = page.getByRole('form', { name: 'New load' });
    await editor.getByLabel('Name').fill('Water pump');
    await editor.getByLabel('Amps', { exact: true }).check();
    await editor.getByLabel('Amps (each)').fill('4');
    // 4 A × 12.8 V (the LiFePO4 bank's nominal volts) = 51.2 W.
    await expect.poll(() => editor.getByTestId('draw-both').textContent()).toContain('= 51.2 W');
    await editor.getByLabel('Surge (each, optional)').fill('100');
    await editor.getByLabel('When it runs').fill('7-8; 19-20');
    await shot(page, `load-editor-amps-${viewport}`);
    expect(await seriousViolations(page)).toEqual([]);
    // Back to watts: the number comes along.
    await editor.getByLabel('Watts', { exact: true }).check();
    expect(await editor.getByLabel('Watts (each)').inputValue()).toBe('51.2');
    await editor.getByLabel('Amps', { exact: true }).check();
    expect(await editor.getByLabel('Amps (each)').inputValue()).toBe('4');
    await editor.getByRole('button', { name: 'Add load' }).click();
    const row = page.locator('[data-load-row="Water pump"]');
    await row.waitFor();
    expect(await row.textContent()).toContain('51.2 W');
    expect(await row.textContent()).toContain('4 A at 12.8 V');
    expect(await row.textContent()).toContain('surge 100 W');

    const loads = (await (await api(`/api/rigs/${rigUrl.split('/').pop()}/loads`, { session: camper })).json()) as { name: string; watts: number; surgeWatts: number | null; location: string }[];
    expect(loads).toEqual([expect.objectContaining({ name: 'Water pump', watts: 51.2, surgeWatts: 100, location: 'cabin' })]);
  });

  it('finds the cabin bank, the ratings and the load again after a reload', async () => {
    await page.goto(rigUrl);
    await hydrated(page);
    expect(await page.getByLabel(/Inside the heated cabin/).isChecked()).toBe(true);
    expect(await page.getByLabel('Continuous rating').inputValue()).toBe('1000');
    expect(await page.getByLabel('Surge rating').inputValue()).toBe('2000');
    await page.getByText('More battery settings').click();
    expect(await page.getByLabel('Battery’s thermal lag').inputValue()).toBe('4');
    const row = page.locator('[data-load-row="Water pump"]');
    expect(await row.textContent()).toContain('51.2 W');
    await shot(page, `rig-cold-page-${viewport}`);
    expect(await seriousViolations(page)).toEqual([]);
    const rig = (await (await api(`/api/rigs/${rigUrl.split('/').pop()}`, { session: camper })).json()) as { bank: Record<string, unknown>; inverter: Record<string, unknown> };
    expect(rig.bank).toMatchObject({ location: 'cabin', insideHeatedSpace: true, thermalHours: 4, selfHeating: false });
    expect(rig.inverter).toMatchObject({ continuousWatts: 1000, surgeWatts: 2000 });
  });
});
