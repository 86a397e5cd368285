import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, signUp, type Session } from '../helpers/api';
import { createLoad, createRig } from '../helpers/fixtures';
import { launch, seriousViolations, shot, signIn, VIEWPORTS, type ViewportName } from '../helpers/browser';

// A camper imports the rig's own export back: the panel warns that the names are already listed,
// offers to replace the list instead, shows what replacing removes and asks once more in the page —
// and the list ends up once, not twice. At phone and desktop widths, in the built server and Chromium.

const PASSWORD = 'import-twice-2027';

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('importing the load list’s own export in Chromium at %s width', (viewport) => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let rigId = '';
  let csv = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Import Camper', password: PASSWORD });
    const rig = await createRig(camper);
    rigId = rig.id;
    // Typical figures from trade-notes.md: compressor fridge 35–60 W [meas], LED ~0.1 A a fixture [meas].
    await createLoad(camper, rigId, { name: 'Compressor fridge', watts: 45, dutyPct: 45, response: 'cooling' });
    await createLoad(camper, rigId, { name: 'LED lights', watts: 1.5, quantity: 6, windows: [[18, 23]] });
    csv = await (await api(`/api/rigs/${rigId}/loads.csv`, { session: camper })).text();
    ({ page, close } = await launch(viewport));
    await signIn(page, camper.email, PASSWORD, `/rigs/${rigId}#loads`);
  });
  afterAll(async () => close?.());

  const names = async () => ((await (await api(`/api/rigs/${rigId}/loads`, { session: camper })).json()) as { name: string }[]).map((l) => l.name);

  it('warns that every name is already listed when adding', async () => {
    await page.getByRole('button', { name: 'Import CSV' }).click();
    await page.getByLabel('Or paste the CSV').fill(csv);
    expect(await page.getByLabel('Add to the list').isChecked()).toBe(true);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('Every load in this file is already in the list by name: Compressor fridge, LED lights.').waitFor();
    await page.getByRole('button', { name: 'Add 2 loads to the list' }).waitFor();
    await shot(page, `loads-import-already-listed-${viewport}`);
  });

  it('replacing lists what will be removed, and Keep the list changes nothing', async () => {
    await page.getByLabel('Replace the list').check();
    await page.getByRole('button', { name: 'Replace 2 loads with 2 loads' }).click();
    const confirm = page.getByRole('alertdialog', { name: 'Replace the whole load list?' });
    await confirm.waitFor();
    await expect(confirm.getByRole('list', { name: 'Loads that will be removed' }).textContent()).resolves.toBe('Compressor fridgeLED lights');
    await shot(page, `loads-import-replace-confirm-${viewport}`);
    expect(await seriousViolations(page)).toEqual([]);
    await confirm.getByRole('button', { name: 'Keep the list' }).click();
    expect(await confirm.count()).toBe(0);
    expect(await names()).toEqual(['Compressor fridge', 'LED lights']);
  });

  it('after another editor adds a load, replacing shows the new list of what goes instead of removing it unseen', async () => {
    await createLoad(camper, rigId, { name: 'Roof vent fan', watts: 18 });
    await page.getByRole('button', { name: 'Replace 2 loads with 2 loads' }).click();
    await page.getByRole('alertdialog', { name: 'Replace the whole load list?' }).getByRole('button', { name: 'Replace the list' }).click();
    await page.getByText(/Someone changed the load list since you checked the file/).waitFor();
    await page.getByRole('button', { name: 'Replace 3 loads with 2 loads' }).waitFor();
    expect(await names()).toEqual(['Compressor fridge', 'LED lights', 'Roof vent fan']);
  });

  it('replacing leaves the list once, not twice', async () => {
    await page.getByRole('button', { name: 'Replace 3 loads with 2 loads' }).click();
    const confirm = page.getByRole('alertdialog', { name: 'Replace the whole load list?' });
    await expect(confirm.getByRole('list', { name: 'Loads that will be removed' }).textContent()).resolves.toContain('Roof vent fan');
    await confirm.getByRole('button', { name: 'Replace the list' }).click();
    await page.getByText('Replaced 3 loads with the 2 imported.').waitFor();
    expect(await names()).toEqual(['Compressor fridge', 'LED lights']);
    await shot(page, `loads-import-replaced-${viewport}`);
  });

  it('offers at least 40 typical appliances, each saying where its figure comes from; a slide-out runs on drive days', async () => {
    await page.getByRole('button', { name: '+ From the catalogue' }).click();
    const picker = page.getByRole('region', { name: 'Typical appliances' });
    await picker.waitFor();
    expect(await picker.getByRole('listitem').count()).toBeGreaterThanOrEqual(40);
    await shot(page, `loads-catalogue-${viewport}`);
    await picker.getByRole('button', { name: /Slide-out motor/ }).click();
    await page.getByText(/on drive days\)/).waitFor();
    await page.getByText('From memory — the roughest kind of typical figure.').waitFor();
    await shot(page, `loads-catalogue-slide-out-${viewport}`);
    expect(await seriousViolations(page)).toEqual([]);
    await page.getByRole('button', { name: 'Cancel' }).click();
  });
});
