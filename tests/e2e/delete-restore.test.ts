import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, makeTrip, member } from '../helpers/crew';
import { CHECK_IN_INPUT } from '../helpers/routes';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { browserPool, SCREENSHOTS, seriousViolations, shot, signIn, VIEWPORTS, type ViewportName } from '../helpers/browser';

// Issue 16, items 2 and 17 in Chromium at phone and desktop widths: deleting a rig is for owners and
// asks in the page with what goes with it; a deleted rig waits under "Recently deleted" to be restored;
// every confirmation is asked in the page; a stale load edit names who changed it and when, and a load
// deleted meanwhile can be added again with its own button.

const PASSWORD = 'correct-horse-1';

/** What the camper sees right now (the screen, not the whole page), for looking at a question in place. */
async function view(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`) });
}

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('delete, restore and confirm in the page at %s width', (viewport) => {
  const pool = browserPool();
  let owner: Session;
  let tobi: Session;
  let rig: { id: string };
  let trip: { id: string };

  beforeAll(async () => {
    owner = await signUp({ name: 'Ines Owner', password: PASSWORD });
    const crewId = (await activeCrew(owner)).id;
    tobi = await member(owner, crewId, 'editor', 'Tobi');
    rig = await makeRig(owner, crewId);
    await makeLoad(owner, rig.id);
    await makeLoad(owner, rig.id, { name: 'Water pump', watts: 60, dutyPct: 5 });
    trip = await makeTrip(owner, rig.id);
    for (const name of ['First run', 'Second run']) {
      expect((await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: { name } })).status).toBe(201);
    }
    expect((await api(`/api/trips/${trip.id}/check-ins`, { method: 'POST', session: owner, json: CHECK_IN_INPUT() })).status).toBe(201);
  });
  afterAll(async () => pool.closeAll());

  it('shows an editor who may delete the rig instead of a Delete button', async () => {
    const page = await pool.open(viewport);
    await signIn(page, tobi.email, PASSWORD, `/rigs/${rig.id}`);
    await page.getByText('Only the crew’s owners can delete this rig').waitFor();
    expect(await page.getByRole('button', { name: 'Delete rig…' }).count()).toBe(0);
  });

  it('asks the owner in the page with what goes with the rig, keeps it on Keep, and restores it from Recently deleted', async () => {
    const page = await pool.open(viewport);
    let dialogs = 0;
    page.on('dialog', (d) => {
      dialogs += 1;
      void d.dismiss();
    });
    await signIn(page, owner.email, PASSWORD, `/rigs/${rig.id}`);
    await page.getByRole('button', { name: 'Delete rig…' }).click();
    await page.getByText('Delete Test van? With it go 2 loads, 1 trip, 2 saved forecasts, 1 check-in.').waitFor();
    await page.getByText(/restore it under “Recently deleted” on the Rigs page for 30 days/).waitFor();
    await page.getByRole('group', { name: 'Confirm' }).scrollIntoViewIfNeeded();
    await view(page, `rig-delete-question-${viewport}`);
    await page.getByRole('group', { name: 'Confirm' }).getByRole('button', { name: 'Keep' }).click();
    expect((await api(`/api/rigs/${rig.id}`, { session: owner })).status).toBe(200);

    await page.getByRole('button', { name: 'Delete rig…' }).click();
    await page.getByRole('group', { name: 'Confirm' }).getByRole('button', { name: 'Delete', exact: true }).click();
    await page.waitForURL((u) => u.pathname === '/rigs');
    const deleted = page.locator('[data-recently-deleted="rig"]');
    await deleted.getByText('Test van').waitFor();
    await deleted.getByText('deleted by Ines Owner · 30 days left').waitFor();
    expect(await page.getByRole('list', { name: 'Rigs', exact: true }).getByText('Test van').count()).toBe(0);
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, `rigs-recently-deleted-${viewport}`);
    expect((await api(`/api/trips/${trip.id}`, { session: owner })).status).toBe(404);

    await deleted.getByRole('button', { name: 'Restore Test van' }).click();
    await page.getByText('Restored Test van.').waitFor();
    await page.getByRole('list', { name: 'Rigs', exact: true }).getByText('Test van').waitFor();
    expect((await api(`/api/trips/${trip.id}/forecasts`, { session: owner }).then((r) => r.json())).length).toBe(2);
    expect(dialogs).toBe(0);
  });

  it('asks in the page before deleting a saved forecast', async () => {
    const page = await pool.open(viewport);
    let dialogs = 0;
    page.on('dialog', (d) => {
      dialogs += 1;
      void d.dismiss();
    });
    await signIn(page, owner.email, PASSWORD, `/trips/${trip.id}`);
    await page.getByRole('button', { name: 'Delete the saved forecast First run' }).click();
    const ask = page.getByRole('group', { name: 'Confirm' });
    await ask.getByText('Delete the saved forecast “First run”?').waitFor();
    await view(page, `forecast-delete-question-${viewport}`);
    await ask.getByRole('button', { name: 'Keep' }).click();
    expect((await api(`/api/trips/${trip.id}/forecasts`, { session: owner }).then((r) => r.json())).length).toBe(2);
    expect(dialogs).toBe(0);
  });

  it('asks in the page before closing the trip editor with unsaved changes, and restores a deleted trip from Recently deleted', async () => {
    const page = await pool.open(viewport);
    await signIn(page, owner.email, PASSWORD, `/trips/${trip.id}`);
    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    await page.getByLabel('Trip name').fill('Renamed but not saved');
    await page.getByRole('button', { name: 'Close the editor' }).click();
    const ask = page.getByRole('group', { name: 'Confirm' });
    await ask.getByText('Close the editor and drop the unsaved changes?').waitFor();
    await ask.getByRole('button', { name: 'Keep editing' }).click();
    expect(await page.getByLabel('Trip name').inputValue()).toBe('Renamed but not saved');
    await page.getByRole('button', { name: 'Close the editor' }).click();
    await ask.getByRole('button', { name: 'Drop changes' }).click();
    await page.getByRole('button', { name: 'Edit the itinerary' }).waitFor();

    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    await page.getByRole('button', { name: 'Delete trip…' }).click();
    await page.getByText('Delete Test trip? With it go 2 saved forecasts, 1 check-in.').waitFor();
    await view(page, `trip-delete-question-${viewport}`);
    await page.getByRole('group', { name: 'Confirm' }).getByRole('button', { name: 'Delete', exact: true }).click();
    await page.waitForURL((u) => u.pathname === '/trips');
    const deleted = page.locator('[data-recently-deleted="trip"]');
    await deleted.getByText('on Test van · deleted by Ines Owner · 30 days left').waitFor();
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, `trips-recently-deleted-${viewport}`);
    await deleted.getByRole('button', { name: 'Restore Test trip' }).click();
    await page.getByText('Restored Test trip.').waitFor();
    expect((await api(`/api/trips/${trip.id}`, { session: owner })).status).toBe(200);
  });

  it('names who changed a load and when on a stale edit, and offers to add a load deleted meanwhile again', async () => {
    const page = await pool.open(viewport);
    await signIn(page, owner.email, PASSWORD, `/rigs/${rig.id}`);
    await page.goto(`${page.url().split('#')[0]}#loads`);
    const loads = (await api(`/api/rigs/${rig.id}/loads`, { session: owner }).then((r) => r.json())) as {
      id: string;
      name: string;
      version: number;
    }[];
    const fridge = loads.find((l) => l.name === 'Compressor fridge')!;
    const pump = loads.find((l) => l.name === 'Water pump')!;

    await page.getByRole('button', { name: 'Edit Compressor fridge' }).click();
    // Tobi saves the same load meanwhile.
    const theirs = await api(`/api/loads/${fridge.id}`, { method: 'PATCH', session: tobi, json: { version: fridge.version, watts: 60 } });
    expect(theirs.status).toBe(200);
    await page.getByLabel('Watts (each)').fill('50');
    await page.getByRole('button', { name: 'Save load' }).click();
    const notice = page.locator('[data-conflict]');
    await notice.getByText(/^Tobi changed this load at \d{2}:\d{2} \(version 2\)\.$/).waitFor();
    await notice.scrollIntoViewIfNeeded();
    await view(page, `load-conflict-named-${viewport}`);
    await notice.getByRole('button', { name: 'Take theirs' }).click();

    await page.getByRole('button', { name: 'Edit Water pump' }).click();
    expect((await api(`/api/loads/${pump.id}?version=${pump.version}`, { method: 'DELETE', session: tobi })).status).toBe(204);
    await page.getByLabel('Watts (each)').fill('65');
    await page.getByRole('button', { name: 'Save load' }).click();
    const gone = page.locator('[data-load-gone]');
    await gone.getByText('Someone deleted this load while you were editing it.').waitFor();
    await view(page, `load-gone-add-again-${viewport}`);
    await gone.getByRole('button', { name: 'Add it again as a new load' }).click();
    await page.getByText('Added Water pump.').waitFor();
    const after = (await api(`/api/rigs/${rig.id}/loads`, { session: owner }).then((r) => r.json())) as { name: string; watts: number }[];
    expect(after.find((l) => l.name === 'Water pump')?.watts).toBe(65);
  });
});
