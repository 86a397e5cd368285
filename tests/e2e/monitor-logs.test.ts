import AxeBuilder from '@axe-core/playwright';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName, signIn } from '../helpers/browser';
import { createLoad, createRig } from '../helpers/fixtures';
import { toCsv, truth } from '../fixtures/monitor/synthetic';

// The rig's Logs section in Chromium: upload a monitor log (our generated layout: semicolons,
// decimal commas, day-first times, a device preamble), confirm the columns, then read the
// night-time draw, use it as the rig's parasitic draw, and lay the measured SOC over a forecast.

const PASSWORD = 'correct-horse-1';
const TZ = 'America/Denver';


describe.each(Object.keys(VIEWPORTS) as ViewportName[])('monitor logs at %s width', (viewport) => {
  let page: Page;
  let close: () => Promise<void>;
  let camper: Session;
  let rig: { id: string };

  beforeAll(async () => {
    camper = await signUp({ name: 'Log Camper', password: PASSWORD });
    rig = await createRig(camper, { name: 'Trailer with a shunt', bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 300 } });
    await createLoad(camper, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 40 });
    const trip = await (
      await api('/api/trips', { method: 'POST', session: camper, json: { rigId: rig.id, name: 'Juniper weekend', stops: [{ name: 'Juniper Mesa', lat: 35.6, lon: -105.9, timeZone: TZ, arrive: '2027-10-21', nights: 2 }] } })
    ).json();
    await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: camper, json: { name: 'Before leaving' } });
    ({ page, close } = await launch(viewport));
    await signIn(page, camper.email, PASSWORD);
  });
  afterAll(async () => close?.());

  it('reads the file, shows what it found, and saves it once the columns are confirmed', async () => {
    await page.goto(`${baseUrl()}/rigs/${rig.id}#logs`);
    await hydrated(page);
    await page.getByRole('heading', { name: 'Upload a monitor log' }).waitFor();
    await page.getByLabel('Time zone of the log’s clock').fill(TZ);
    const csv = toCsv(truth({ days: 3, nightDrawA: 2.2 }), { delimiter: ';', decimal: ',', time: 'dmy', preamble: ['Battery monitor export', 'Serial;0042'] });
    await page.getByLabel('CSV file').setInputFiles({ name: 'juniper-weekend.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.getByTestId('preview-summary').filter({ hasText: '864 readings' }).waitFor();
    expect(await page.getByLabel('Separator').inputValue()).toBe(';');
    expect(await page.getByLabel('Decimal mark').inputValue()).toBe(',');
    expect(await page.getByLabel('Time format').inputValue()).toBe('dmy');
    expect(await page.getByRole('radio', { name: /^Charging/ }).isChecked()).toBe(true);
    const axe = await new AxeBuilder({ page }).include('#logs').analyze();
    expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(' | ')}`)).toEqual([]);
    await shot(page, `logs-preview-${viewport}`);

    // A wrong choice shows its problems by line; putting it back clears them.
    await page.getByLabel('Time format').selectOption('mdy');
    await page.getByTestId('preview-errors').waitFor();
    expect(await page.getByTestId('preview-errors').textContent()).toMatch(/Line 4, Timestamp: .*month/);
    expect(await page.getByRole('button', { name: /^Save this log/ }).isDisabled()).toBe(true);
    await page.getByLabel('Time format').selectOption('dmy');
    await page.getByTestId('preview-errors').waitFor({ state: 'detached' });

    await page.getByRole('button', { name: 'Save this log (864 readings)' }).click();
    await page.getByTestId('log-view').waitFor();
    const logs = await (await api(`/api/rigs/${rig.id}/monitor-logs`, { session: camper })).json();
    expect(logs).toHaveLength(1);
    expect(logs[0]).toMatchObject({ name: 'juniper-weekend.csv', sampleCount: 864 });
  });

  it('reads the night-time draw and makes it the rig’s parasitic draw', async () => {
    await page.getByTestId('baseline-text').filter({ hasText: '2.20 A' }).waitFor();
    // 2.2 A × 12.8 V = 28.2 W at night, less the fridge's planned 18 W (45 W × 40 %).
    const field = page.getByLabel('Parasitic draw, W');
    expect(Number(await field.inputValue())).toBeCloseTo(28.16 - 18, 0);
    await page.getByRole('button', { name: 'Use this as the rig’s parasitic draw' }).click();
    await page.getByText(/now draws .* W all day, every day/).waitFor();
    const loads = (await (await api(`/api/rigs/${rig.id}/loads`, { session: camper })).json()) as { name: string; watts: number; standby: boolean }[];
    const standby = loads.filter((l) => l.standby);
    expect(standby).toHaveLength(1);
    expect(standby[0]).toMatchObject({ name: 'Parasitic standby draw' });
    expect(standby[0]?.watts).toBeCloseTo(10.2, 0);
  });

  it('lays the measured state of charge over the saved forecast of those dates', async () => {
    const chart = page.getByTestId('measured-chart');
    await chart.waitFor();
    expect(await chart.locator('.measured-line path.recharts-curve').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('measured-summary').textContent()).toMatch(/^Over \d+ hours the measured state of charge ran/);
    expect(await page.getByTestId('day-ledger').locator(':scope > li').count()).toBe(3);
    const axe = await new AxeBuilder({ page }).include('#logs').analyze();
    expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(' | ')}`)).toEqual([]);
    await shot(page, `logs-${viewport}`);
  });
});
