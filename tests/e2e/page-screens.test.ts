import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, uniqueEmail, type Session } from '../helpers/api';
import { activeCrew, inviteToken } from '../helpers/crew';
import { hydrated, launch, seriousViolations, signIn, VIEWPORTS, type ViewportName } from '../helpers/browser';

// The rig, trip, saved forecast and compare pages as a crew member sees them with a demo-like rig (a
// 300 Ah LiFePO4 bank, two arrays, a DC-DC charger, an inverter, nine loads) and a two-stop trip with
// two saved forecasts, at 390 px and 1280 px: nothing may stick out sideways (the page never scrolls
// sideways; a table wider than its card sits in a box that scrolls, never one that clips it), and axe
// finds nothing serious. Full-page screenshots go to a temporary folder, to be looked at.

const PASSWORD = 'long-desert-road-7';
export const SCREENS = path.join(tmpdir(), 'sunreckon-page-screens');

const RIG = {
  name: 'Desert van with a long name for the header',
  bank: { chemistry: 'lifepo4', capacityAh: 300, nominalVolts: 12.8 },
  arrays: [
    { name: 'Roof', ratedWatts: 400 },
    { name: 'Portable panel on the long lead', ratedWatts: 200, tiltDeg: 30, aim: 'follow' },
  ],
  chargers: [{ kind: 'alternator', amps: 30 }],
  inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false },
};
const LOADS = [
  { name: 'Compressor fridge', watts: 45, dutyPct: 45, response: 'cooling' },
  { name: 'Furnace blower', watts: 60, response: 'heating', setpointC: 18, windows: [[18, 8]], dutyPct: 40 },
  {
    name: 'Water pump',
    watts: 60,
    windows: [
      [7, 8],
      [19, 20],
    ],
    dutyPct: 20,
  },
  { name: 'Reading lights', watts: 12, windows: [[19, 23]] },
  { name: 'Laptop charging', watts: 65, supply: 'ac', windows: [[9, 12]] },
  {
    name: 'CPAP with humidifier',
    watts: 40,
    supply: 'ac',
    windows: [
      [22, 24],
      [0, 6],
    ],
  },
  { name: 'Roof vent fan, medium speed', watts: 18, windows: [[12, 18]], dutyPct: 50 },
  { name: 'Router and phone chargers', watts: 10 },
  { name: 'Standby draw (detectors, control boards)', watts: 4, standby: true },
];
const trip = (rigId: string) => ({
  rigId,
  name: 'High desert loop, late October',
  stops: [
    {
      name: 'Mesa camp above the wash',
      lat: 36.1,
      lon: -111.5,
      timeZone: 'America/Phoenix',
      arrive: '2027-10-20',
      nights: 2,
      weather: [{ date: '2027-10-20', cloudOktas: 2, highC: 18, lowC: -2 }],
    },
    {
      name: 'Juniper flat',
      lat: 37.2,
      lon: -112.9,
      timeZone: 'America/Denver',
      arrive: '2027-10-22',
      nights: 2,
      weather: [{ date: '2027-10-22', cloudOktas: 5, highC: 12, lowC: -5 }],
    },
  ],
  drives: [{ date: '2027-10-22', startHour: 9, hours: 4 }],
});

async function ok<T>(res: Response, status: number, what: string): Promise<T> {
  if (res.status !== status) throw new Error(`${what}: expected ${status}, got ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/**
 * What sticks out sideways: the page itself scrolling sideways, and any table or other element wider than
 * the box that clips it (a box that scrolls is fine: its content can be reached).
 */
async function clipped(page: Page, wide: boolean): Promise<string[]> {
  return page.evaluate((wideScreen) => {
    const out: string[] = [];
    const doc = document.documentElement;
    if (doc.scrollWidth > window.innerWidth) out.push(`page scrolls sideways: ${doc.scrollWidth} > ${window.innerWidth}`);
    const describe = (el: Element) =>
      `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${el.getAttribute('data-testid') ? `[${el.getAttribute('data-testid')}]` : ''} “${(el.textContent ?? '').trim().slice(0, 40)}”`;
    for (const el of document.querySelectorAll(
      'main table, main input, main select, main button, main a, main h1, main h2, main h3, main p, main dl, main svg',
    )) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      if (el.closest('details:not([open])')) continue;
      let scrolls = false;
      for (let box = el.parentElement; box && box !== document.body; box = box.parentElement) {
        const cs = getComputedStyle(box);
        if (cs.overflowX === 'auto' || cs.overflowX === 'scroll') {
          scrolls = true; // reachable by scrolling the box
          break;
        }
        if (cs.overflowX === 'hidden' || cs.overflowX === 'clip') {
          const b = box.getBoundingClientRect();
          if (r.right > b.right + 1 || r.left < b.left - 1)
            out.push(
              `${describe(el)} clipped by ${describe(box).slice(0, 30)}: ${Math.round(r.left)}–${Math.round(r.right)} outside ${Math.round(b.left)}–${Math.round(b.right)}`,
            );
          break;
        }
      }
      if (!scrolls && r.right > doc.clientWidth + 1)
        out.push(`${describe(el)} ends at ${Math.round(r.right)} past the screen (${doc.clientWidth})`);
    }
    // On a wide screen a table fits its card: no column hidden behind a sideways scroll.
    if (wideScreen) {
      for (const t of document.querySelectorAll('main table')) {
        const box = t.parentElement;
        if (box && t.getBoundingClientRect().width > 0 && box.scrollWidth > box.clientWidth + 1)
          out.push(`${describe(t)} needs a sideways scroll: ${box.scrollWidth} > ${box.clientWidth}`);
      }
    }
    return [...new Set(out)];
  }, wide);
}

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('rig, trip, forecast and compare pages at %s width', (viewport) => {
  let owner: Session;
  let page: Page;
  let close: () => Promise<void>;
  const urls: Record<string, string> = {};

  beforeAll(async () => {
    owner = await signUp({ name: 'Rosa Mesquite' });
    const crewId = (await activeCrew(owner)).id;
    const rig = await ok<{ id: string }>(await api('/api/rigs', { method: 'POST', session: owner, json: RIG }), 201, 'rig');
    for (const l of LOADS)
      await ok(await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: l }), 201, `load ${l.name}`);
    const t = await ok<{ id: string }>(await api('/api/trips', { method: 'POST', session: owner, json: trip(rig.id) }), 201, 'trip');
    const a = await ok<{ id: string }>(
      await api(`/api/trips/${t.id}/forecasts`, { method: 'POST', session: owner, json: {} }),
      201,
      'forecast a',
    );
    // A second snapshot after a change, so compare has something to show.
    await ok(
      await api(`/api/rigs/${rig.id}/loads`, {
        method: 'POST',
        session: owner,
        json: { name: 'Coffee maker', watts: 900, supply: 'ac', windows: [[7, 8]], dutyPct: 25 },
      }),
      201,
      'coffee',
    );
    const b = await ok<{ id: string }>(
      await api(`/api/trips/${t.id}/forecasts`, { method: 'POST', session: owner, json: {} }),
      201,
      'forecast b',
    );
    // The crew member who looks: an editor who joined by the invitation e-mail.
    const email = uniqueEmail('editor');
    const token = await inviteToken(owner, crewId, email, 'editor');
    const editor = await signUp({ email, name: 'Tobi Arroyo', password: PASSWORD });
    await ok(await api('/api/invitations/accept', { method: 'POST', session: editor, json: { token } }), 200, 'accept');
    urls.rig = `/rigs/${rig.id}`;
    urls.trip = `/trips/${t.id}`;
    urls.forecast = `/trips/${t.id}/forecasts/${b.id}`;
    urls.compare = `/trips/${t.id}/compare?a=${a.id}&b=${b.id}`;
    mkdirSync(SCREENS, { recursive: true });
    ({ page, close } = await launch(viewport, { locale: 'en-US' }));
    await signIn(page, email, PASSWORD, '/trips');
  });
  afterAll(async () => close?.());

  it.each(['rig', 'trip', 'forecast', 'compare'])('the %s page: nothing clipped, nothing serious for axe', async (name) => {
    await page.goto(baseUrl() + urls[name]);
    await hydrated(page);
    if (name === 'forecast') {
      // The advice and the charts load on view; the table opens as a camper would open it.
      await page.getByTestId('advice').scrollIntoViewIfNeeded();
      await page.getByTestId('advice').and(page.locator(':not([data-pending])')).waitFor();
      await page.getByTestId('hourly-details').locator('summary').click();
      // Walk down the page a screen at a time, as a camper scrolls, so the screenshot holds the
      // day charts too (a jump to the advice passes them by at phone height).
      const height = await page.evaluate(() => document.documentElement.scrollHeight);
      for (let y = 0; y < height; y += 600) await page.evaluate((top) => window.scrollTo(0, top), y);
      await page.waitForFunction(() => !document.querySelector('[data-pending]'));
    }
    if (name === 'rig') await page.locator('#arrays-0-ratedWatts').waitFor();
    // Compare reads both snapshots in the browser: judge the page once they are drawn.
    if (name === 'compare') await page.locator('[data-testid="compare-view"] table').first().waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(SCREENS, `${name}-${viewport}.png`), fullPage: true });
    expect(await clipped(page, viewport === 'desktop')).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
  });
});
