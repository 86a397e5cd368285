import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { browserPool, shot, signIn, seriousViolations } from '../helpers/browser';
import { activeCrew } from '../helpers/crew';
import { TEST_PRICES } from '../helpers/routes';

// The upgrade planner in Chromium at 390 and 1280 px: the demo van (already makes it) and an AGM
// trailer that runs out, with the weight check and an after-plan edited by hand.

const PASSWORD = 'dusk-and-ember-27';



async function savedForecast(
  owner: Session,
  installer: Session,
  rig: Record<string, unknown>,
  loads: unknown[],
  reserveSocPct: number,
): Promise<string> {
  const crewId = (await activeCrew(owner)).id;
  const r = (await (await api('/api/rigs', { method: 'POST', session: owner, json: { ...rig, crewId } })).json()) as { id: string };
  for (const l of loads) expect((await api(`/api/rigs/${r.id}/loads`, { method: 'POST', session: owner, json: l })).status).toBe(201);
  const plan = demoPlan();
  const trip = (await (
    await api('/api/trips', {
      method: 'POST',
      session: owner,
      json: { rigId: r.id, name: 'High desert loop', stops: plan.stops, drives: plan.drives, reserveSocPct },
    })
  ).json()) as { id: string };
  const f = (await (
    await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: { name: 'First look' } })
  ).json()) as { id: string };
  expect((await api(`/api/rigs/${r.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } })).status).toBe(202);
  return f.id;
}

describe('the upgrade planner in Chromium', () => {
  let installer: Session;
  let van: string;
  let trailer: string;
  let trailerRig: string;
  let owner: Session;
  const browsers = browserPool();
  const open = browsers.open;
  beforeAll(async () => {
    installer = await signUp({ kind: 'installer', name: 'Kestrel Power', password: PASSWORD });
    expect((await api('/api/price-list', { method: 'PUT', session: installer, json: { ...TEST_PRICES, version: 0 } })).status).toBe(200);
    owner = await signUp({ name: 'Ana', password: PASSWORD });
    const d = demoPlan();
    van = await savedForecast(
      owner,
      installer,
      { name: 'Camper van (6.1 m)', bank: d.bank, arrays: d.arrays, chargers: d.chargers, inverter: d.inverter },
      d.loads ?? [],
      20,
    );
    trailer = await savedForecast(
      owner,
      installer,
      {
        name: 'AGM teardrop',
        bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 200 },
        arrays: [{ name: 'Portable panel (100 W)', ratedWatts: 100, tiltDeg: 45, aim: 'follow', controller: 'pwm', controllerMaxAmps: 10 }],
        chargers: [],
      },
      [
        { name: 'Furnace blower', watts: 60, windows: [[0, 24]], response: 'heating', setpointC: 17 },
        {
          name: 'LED lights',
          watts: 1.2,
          quantity: 8,
          windows: [
            [6, 8],
            [18, 23],
          ],
        },
        { name: 'Parasitic draw', watts: 14, standby: true },
      ],
      50,
    );
    trailerRig = ((await (await api('/api/rigs', { session: owner })).json()) as { id: string; name: string }[]).find(
      (r) => r.name === 'AGM teardrop',
    )!.id;
  });
  afterAll(async () => {
    await browsers.closeAll();
  });

  for (const viewport of ['desktop', 'phone'] as const) {
    it(`the demo van: "already makes the trip" first, the 30 A DC-DC charger not offered (${viewport})`, async () => {
      const page = await open(viewport);
      await signIn(page, installer.email, PASSWORD, `/proposals/new?forecast=${van}`);
      await page.getByTestId('verdict-headline').waitFor();
      // The preset DC-DC sizes are the next ones above the van's 30 A.
      expect(await page.getByLabel('DC-DC charger sizes (A)').inputValue()).toBe('40, 60');
      await page.getByLabel('Generator hours a day').fill('2');
      await page.getByRole('button', { name: 'Run the sweep' }).click();
      const already = page.getByTestId('already-makes-it');
      await already.waitFor();
      expect(await already.textContent()).toMatch(/a margin of \d+(\.\d)? points/);
      expect(await page.getByTestId('cheapest-passing').count()).toBe(0);
      expect(await page.getByTestId('generator-rule').textContent()).toMatch(/start below [\d.]+ % \(the 20 % line \+ 10 points/);
      // The generator alone changes nothing on this trip, and says so.
      const gen = page.locator('[data-option="b0.p0.d0.g1"]');
      await page.getByRole('button', { name: /^Show all/ }).click();
      expect(await gen.textContent()).toContain('Changes nothing');
      expect(await gen.textContent()).not.toContain('Makes it');
      expect(await seriousViolations(page)).toEqual([]);
      await shot(page, `sweep-van-already-${viewport}`);
    });
  }

  it('the AGM trailer: 800 Ah of AGM is flagged against the payload, and a hand-edited plan runs (1280 px)', async () => {
    const page = await open('desktop');
    await signIn(page, installer.email, PASSWORD, `/proposals/new?forecast=${trailer}`);
    await page.getByTestId('verdict-headline').waitFor();
    await page.getByRole('button', { name: '+ Add a bank' }).click();
    await page.locator('#cand-banks-6-chemistry').selectOption('agm');
    await page.locator('#cand-banks-6-capacityAh').fill('800');
    await page.getByLabel('Payload it may still carry').first().fill('160');
    await page.getByLabel('Generator hours a day').fill('2');
    await page.getByRole('button', { name: 'Run the sweep' }).click();
    await page.getByTestId('sweep-results').waitFor();
    await page.getByRole('button', { name: /^Show all/ }).click();
    const heavy = page.locator('[data-option="b7.p0.d0.g0"]');
    expect(await heavy.getByTestId('bank-weight').textContent()).toMatch(
      /Bank about 240 kg.*Too heavy: it adds 180 kg, more than the rig’s stated 160 kg payload\./,
    );
    await shot(page, 'sweep-agm-trailer-desktop');

    // Load a LiFePO4 option into the hand editor, change it, run it.
    const lfp = page.locator('[data-option="b4.p1.d0.g0"]');
    await lfp.getByRole('button', { name: /Edit .* by hand/ }).click();
    const editor = page.getByTestId('after-plan-editor');
    expect(await editor.locator('#hand-chemistry').inputValue()).toBe('lifepo4');
    await editor.locator('#hand-capacityAh').fill('abc');
    await editor.getByRole('button', { name: 'Run this plan' }).click();
    await editor.locator('#hand-capacityAh-error').waitFor();
    expect(await editor.locator('#hand-capacityAh-error').textContent()).toBe('The bank’s capacity must be a number from 1 to 20000 Ah.');
    await editor.locator('#hand-capacityAh').fill('300');
    await editor.getByRole('button', { name: 'Run this plan' }).click();
    const result = page.getByTestId('after-plan-result');
    await result.waitFor();
    expect(await result.textContent()).toMatch(/This plan makes the trip|This plan still runs out|dips below the line/);
    expect(await result.textContent()).toContain('against the 10 % line');
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'sweep-after-plan-desktop');

    // Only the plan just run can be proposed: a field changed since asks for a run first.
    await editor.locator('#hand-capacityAh').fill('320');
    await result.getByText('You changed the plan since this run: run it again to propose it.').waitFor();
    expect(await result.getByRole('button', { name: 'Propose this plan' }).count()).toBe(0);
    await editor.locator('#hand-capacityAh').fill('300');
    await result.getByRole('button', { name: 'Propose this plan' }).click();
    await page.waitForURL(/\/proposals\/[^/]+$/);
    await page.getByRole('heading', { name: 'What changes' }).waitFor();
    const what = page.getByRole('region', { name: 'What changes' });
    expect(await what.textContent()).toContain('300 Ah LiFePO4');
    // The new bank is in the quote, priced from the installer's list.
    expect(await page.getByRole('region', { name: 'The quote as last saved' }).textContent()).toContain('300 Ah LiFePO4 bank');
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'hand-plan-proposal-desktop');
  });

  for (const viewport of ['desktop', 'phone'] as const) {
    it(`the crew states the rig’s payload and battery room; the planner starts from them (${viewport})`, async () => {
      const page = await open(viewport);
      await signIn(page, owner.email, PASSWORD, `/rigs/${trailerRig}`);
      await page.getByLabel('Payload it may still carry').fill(viewport === 'desktop' ? '160' : '170');
      await page.getByLabel('Room for batteries').fill('60');
      await page.getByRole('button', { name: 'Save power system' }).click();
      await page.getByText('Saved.', { exact: true }).first().waitFor();
      const section = page.getByRole('region', { name: 'Weight and room (optional)' });
      await section.scrollIntoViewIfNeeded();
      expect(await seriousViolations(page)).toEqual([]);
      await shot(page, `rig-weight-room-${viewport}`);
      const rig = (await (await page.request.get(`${baseUrl()}/api/rigs/${trailerRig}`)).json()) as {
        payloadKg: number;
        batterySpaceL: number;
      };
      expect(rig).toMatchObject({ payloadKg: viewport === 'desktop' ? 160 : 170, batterySpaceL: 60 });

      const planner = await open(viewport);
      await signIn(planner, installer.email, PASSWORD, `/proposals/new?forecast=${trailer}`);
      await planner.getByTestId('verdict-headline').waitFor();
      expect(await planner.locator('#cand-payloadKg').inputValue()).toBe(viewport === 'desktop' ? '160' : '170');
      expect(await planner.locator('#cand-batterySpaceL').inputValue()).toBe('60');
    });
  }

  it('the AGM trailer at 390 px', async () => {
    const page = await open('phone');
    await signIn(page, installer.email, PASSWORD, `/proposals/new?forecast=${trailer}`);
    await page.getByTestId('verdict-headline').waitFor();
    await page.getByRole('button', { name: 'Run the sweep' }).click();
    await page.getByTestId('sweep-results').waitFor();
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'sweep-agm-trailer-phone');
  });
});
