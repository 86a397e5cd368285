import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, type ViewportName } from '../helpers/browser';
import { activeCrew, makeLoad, makeRig, makeTrip } from '../helpers/crew';

// One <h1> per page and landmarks with names of their own, on the pages around saved forecasts,
// the rig and the installer's work, for the crew and for an installer, at 390 and 1280 px.

const PASSWORD = 'landmarks-and-headings-9';
const RULES = ['page-has-heading-one', 'landmark-unique', 'heading-order'];

async function violations(page: Page): Promise<string[]> {
  const r = await new AxeBuilder({ page }).withRules(RULES).analyze();
  return r.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(' | ')}`);
}

describe.each(['phone', 'desktop'] as ViewportName[])('headings and landmarks at %s width', (viewport) => {
  let owner: Session;
  let installer: Session;
  let rigId: string;
  let tripId: string;
  let forecastIds: string[] = [];
  let page: Page;
  let close: () => Promise<void>;

  beforeAll(async () => {
    owner = await signUp({ name: 'Marit', password: PASSWORD });
    rigId = (await makeRig(owner, (await activeCrew(owner)).id)).id;
    await makeLoad(owner, rigId);
    tripId = (await makeTrip(owner, rigId)).id;
    forecastIds = [];
    for (const name of ['First look', 'Second look']) {
      const f = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name } });
      forecastIds.push(((await f.json()) as { id: string }).id);
    }
    installer = await signUp({ kind: 'installer', name: 'Joss Ampere', password: PASSWORD });
    await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email: installer.email } });
    await api('/api/installer/rigs', { session: installer });
    ({ page, close } = await launch(viewport));
  });
  afterAll(async () => close());

  async function signIn(s: Session) {
    await page.context().clearCookies();
    await page.goto(`${baseUrl()}/sign-in`);
    await hydrated(page);
    await page.getByLabel('E-mail').fill(s.email);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname !== '/sign-in');
  }

  it('the crew: trip with saved forecasts, a saved forecast, compare, rig', async () => {
    await signIn(owner);
    const pages = [`/trips/${tripId}`, `/trips/${tripId}/forecasts/${forecastIds[0]}`, `/trips/${tripId}/compare?a=${forecastIds[0]}&b=${forecastIds[1]}`, `/rigs/${rigId}`, '/proposals'];
    const found: string[] = [];
    for (const url of pages) {
      await page.goto(`${baseUrl()}${url}`);
      await hydrated(page);
      found.push(...(await violations(page)).map((v) => `${url} ${v}`));
    }
    expect(found).toEqual([]);
  });

  it('the installer: their page, the shared rig, a saved forecast, proposals', async () => {
    await signIn(installer);
    const pages = ['/installer', `/rigs/${rigId}`, `/trips/${tripId}/forecasts/${forecastIds[0]}`, '/proposals', `/proposals/new?forecast=${forecastIds[0]}`];
    const found: string[] = [];
    for (const url of pages) {
      await page.goto(`${baseUrl()}${url}`);
      await hydrated(page);
      found.push(...(await violations(page)).map((v) => `${url} ${v}`));
    }
    await page.goto(`${baseUrl()}/installer`);
    await hydrated(page);
    await shot(page, `installer-landing-${viewport}`);
    expect(found).toEqual([]);
  });
});
