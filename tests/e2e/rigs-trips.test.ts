import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { baseUrl, uniqueEmail } from '../helpers/api';
import { hydrated, launch, shot, VIEWPORTS, type ViewportName } from '../helpers/browser';
import { at } from '../../src/lib/invariant';

// A new camper, tried as a new user would: describes a rig from a preset, lists its loads from
// the catalogue and a CSV file, and plans a two-stop trip with a drive day — at phone and desktop
// widths, in the real built server and Chromium. Bad entries must get their message by the field.

const CSV_HEADER = 'name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note';
const CSV_BAD = `${CSV_HEADER}\nReading lights,1.5,4,dc,18-23,100,all,none,18,false,\nFurnace blower,sixty,1,dc,18-8,100,all,heating,18,false,hall`;
const CSV_GOOD = `${CSV_HEADER}\nReading lights,1.5,4,dc,18-23,100,all,none,18,false,\nFurnace blower,60,1,dc,18-8,100,all,heating,18,false,hall`;

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('rigs, loads and trips in Chromium at %s width', (viewport) => {
  let page: Page;
  let close: () => Promise<void>;
  let rigId = '';
  let tripId = '';
  const origin = () => ({ origin: baseUrl() });

  beforeAll(async () => {
    ({ page, close } = await launch(viewport));
    await page.goto(baseUrl() + '/sign-up');
    await hydrated(page);
    await page.getByLabel('Your name').fill('Ines Camper');
    await page.getByLabel('E-mail').fill(uniqueEmail(`rigs-${viewport}`));
    await page.getByLabel('Password').fill('dry-camp-2027');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL('**/rigs');
  });
  afterAll(async () => close?.());

  it('shows an empty rig list that says how to start', async () => {
    await hydrated(page);
    await page.getByText('No rigs yet').waitFor();
    await shot(page, `rigs-empty-${viewport}`);
    await page.getByRole('link', { name: 'New rig' }).first().click();
    await page.waitForURL('**/rigs/new');
    await hydrated(page);
  });

  it('puts each bad entry of the rig form next to its field', async () => {
    await page.getByRole('button', { name: 'Create rig' }).click();
    await expect(page.locator('#name-error').textContent()).resolves.toBe('Give the rig a name.');
    await expect(page.locator('#bank-capacityAh-error').textContent()).resolves.toBe('Capacity: enter a number.');
    await page.getByLabel('Capacity').fill('-5');
    await page.getByLabel('Capacity').blur();
    await expect(page.locator('#bank-capacityAh-error').textContent()).resolves.toBe('Capacity must be greater than 0');
    expect(await page.getByLabel('Capacity').getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByLabel('Capacity').getAttribute('aria-describedby')).toBe('bank-capacityAh-error');
    await shot(page, `rig-new-errors-${viewport}`);
  });

  it('fills typical values from a chemistry preset, editable', async () => {
    await page.getByLabel('AGM', { exact: true }).check();
    expect(await page.getByLabel('Peukert exponent').inputValue()).toBe('1.12');
    expect(await page.getByLabel('Usable floor').inputValue()).toBe('50');
    expect(await page.getByLabel('Low-voltage cutoff').inputValue()).toBe('10.5');
    expect(await page.getByLabel('Nominal voltage').inputValue()).toBe('12');
    await page.getByLabel('LiFePO4', { exact: true }).check();
    expect(await page.getByLabel('Peukert exponent').inputValue()).toBe('1.02'); // LiFePO4 Peukert default of the engine's revision 2 (forecast-engine.md, "Revision 2")
    expect(await page.getByLabel('Usable floor').inputValue()).toBe('10');
    expect(await page.getByLabel('Low-voltage cutoff').inputValue()).toBe('10');
    expect(await page.getByLabel('Nominal voltage').inputValue()).toBe('12.8');
    await expect(page.getByText(/check your battery’s label/).first().isVisible()).resolves.toBe(true);

    await page.getByLabel('Rig name').fill('Van');
    await page.getByLabel('Capacity').fill('300');
    // Max charge current follows capacity at the chemistry's typical 0.5 C until the camper types their own.
    expect(await page.getByLabel('Max charge current').inputValue()).toBe('150');
    expect(await page.locator('#bank-capacityAh-error').count()).toBe(0);

    // The series/parallel helper: two 6 V 225 Ah batteries in series make 12 V 225 Ah.
    await page.getByText('Several batteries? Work out volts and Ah').click();
    await page.getByLabel('Each battery (V)').fill('6');
    await page.getByLabel('Each battery (Ah)').fill('225');
    await page.getByLabel('In series').fill('2');
    await page.getByLabel('Strings in parallel').fill('1');
    await page.getByText('2 batteries → 12 V, 225 Ah').waitFor();
    await page.getByText('Several batteries? Work out volts and Ah').click();
  });

  it('creates the rig with roof panels and a DC-DC charger', async () => {
    await page.getByRole('button', { name: '+ Add roof panels' }).click();
    await page.getByLabel('Rated power (all panels)').fill('400');
    expect(await page.getByLabel('Mounting').inputValue()).toBe('flat');
    await page.getByRole('button', { name: '+ DC-DC charger' }).click();
    await page.getByLabel('Charger output').fill('30');
    await page.getByLabel('This rig has an inverter').check();
    await page.getByRole('button', { name: 'Create rig' }).click();
    await page.waitForURL(/\/rigs\/(?!new\b)[^/?#]+(\?created=1)?#loads$/);
    rigId = at(new URL(page.url()).pathname.split('/'), 2, 'rig id in the URL');
    await hydrated(page);
    await page.getByRole('heading', { level: 1, name: 'Van' }).waitFor();
    await page.getByText('300 Ah LiFePO4 · 400 W solar').waitFor();

    const saved = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}`)).json();
    expect(saved.bank).toMatchObject({ chemistry: 'lifepo4', capacityAh: 300, nominalVolts: 12.8, floorSocPct: 10, cutoffVolts: 10, maxChargeAmps: 150, peukertExponent: 1.02 });
    expect(saved.arrays).toMatchObject([{ ratedWatts: 400, tiltDeg: 0, aim: 'fixed', controller: 'mppt' }]);
    expect(saved.chargers).toMatchObject([{ kind: 'alternator', amps: 30 }]);
    expect(saved.inverter).toMatchObject({ efficiencyPct: 90, idleWatts: 12 });
  });

  it('keeps the camper’s rig edit off another version: shows both, and takes theirs when asked', async () => {
    await page.getByRole('navigation', { name: 'Rig sections' }).getByRole('link', { name: 'Power system' }).click();
    await page.getByLabel('Rig name').fill('Van, my name');
    const current = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}`)).json();
    const other = await page.request.patch(`${baseUrl()}/api/rigs/${rigId}`, { headers: origin(), data: { version: current.version, name: 'Van, their name' } });
    expect(other.status()).toBe(200);
    await page.getByRole('button', { name: 'Save power system' }).click();
    const notice = page.locator('[data-conflict]');
    await notice.waitFor();
    await expect(notice.textContent()).resolves.toContain('Van, their name');
    await expect(notice.textContent()).resolves.toContain('Van, my name');
    await notice.getByRole('button', { name: 'Take theirs' }).click();
    await expect.poll(() => page.getByLabel('Rig name').inputValue()).toBe('Van, their name');
    const after = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}`)).json();
    expect(after).toMatchObject({ name: 'Van, their name', version: current.version + 1 });
    // Back to the name the rest of this walk-through expects, saved as the camper would.
    await page.getByLabel('Rig name').fill('Van');
    await page.getByRole('button', { name: 'Save power system' }).click();
    await page.getByText('Saved.', { exact: true }).first().waitFor();
    await page.getByRole('navigation', { name: 'Rig sections' }).getByRole('link', { name: 'Loads' }).click();
  });

  it('adds loads from the catalogue after the camper confirms the number', async () => {
    await page.getByText('No loads yet').waitFor();
    await page.getByRole('button', { name: '+ From the catalogue' }).click();
    await page.getByRole('button', { name: /12 V compressor fridge/ }).click();
    await page.getByText('Typical — check the label.').waitFor();
    const watts = page.locator('#catalogue-watts');
    expect(await watts.inputValue()).toBe('45');
    await watts.fill('48'); // the number on this fridge's label
    await page.getByRole('button', { name: 'Confirm and add' }).click();
    await page.getByText('Added 12 V compressor fridge.').waitFor();

    await page.getByRole('button', { name: '+ From the catalogue' }).click();
    await page.getByRole('button', { name: /Standby draw/ }).click();
    await page.getByRole('button', { name: 'Confirm and add' }).click();
    await page.getByText(/^Added Standby draw/).waitFor();

    const fridge = page.locator('tr[data-load-row="12 V compressor fridge"]');
    // 48 W × 24 h × 45 % duty (the catalogue's duty at 20 °C) = 518.4 Wh; at 12.8 V that is 40.5 Ah.
    await expect(fridge.locator('td[data-label="Wh/day"]').textContent()).resolves.toBe('518 Wh');
    await expect(fridge.locator('td[data-label="Ah/day"]').textContent()).resolves.toBe('40.5 Ah');
    await expect(page.locator('tr[data-load-row^="Standby draw"]').getByText('standby', { exact: true }).count()).resolves.toBe(1);
  });

  it('previews a CSV with its line errors, saves nothing, then imports the fixed file', async () => {
    await page.getByRole('button', { name: 'Import CSV' }).click();
    await page.getByLabel('Or paste the CSV').fill(CSV_BAD);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('table', { name: 'CSV preview' }).waitFor();
    const problems = page.getByRole('alert').filter({ hasText: 'Nothing was saved' });
    await expect(problems.textContent()).resolves.toMatch(/Line 3, watts: /);
    expect(await page.getByRole('button', { name: 'Import', exact: true }).isDisabled()).toBe(true);
    await shot(page, `loads-csv-errors-${viewport}`);
    const before = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}/loads`)).json();
    expect(before).toHaveLength(2);

    await page.getByLabel('Or paste the CSV').fill(CSV_GOOD);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('All 2 lines read cleanly. Check the preview, then add them to the list.').waitFor();
    await page.getByRole('button', { name: 'Add 2 loads to the list' }).click();
    await page.getByText('Imported 2 loads.').waitFor();
    await page.locator('tr[data-load-row="Furnace blower"]').waitFor();

    const after = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}/loads`)).json();
    expect(after.map((l: { name: string }) => l.name).sort()).toEqual(['12 V compressor fridge', 'Furnace blower', 'Reading lights', expect.stringMatching(/^Standby draw/)]);
    // Camp day: fridge 518.4 + standby 13 × 24 = 312 + lights 4 × 1.5 × 5 = 30 + furnace 60 × 14 = 840 → 1,700.4 ≈ 1,700 Wh (no AC load, so no inverter idle).
    await page.getByRole('region', { name: 'Loads' }).getByText('1,700 Wh').first().waitFor();
    expect(await page.locator('a', { hasText: 'Export CSV' }).getAttribute('href')).toBe(`/api/rigs/${rigId}/loads.csv`);
  });

  it('edits a load in place and names a bad schedule next to the field', async () => {
    const row = page.locator('tr[data-load-row="Reading lights"]');
    await row.getByRole('button', { name: 'Edit Reading lights' }).click();
    const editor = page.getByRole('form', { name: 'Edit Reading lights' });
    await editor.getByLabel('When it runs').fill('18-');
    await editor.getByLabel('Watts (each)').fill('abc');
    await editor.getByRole('button', { name: 'Save load' }).click();
    await expect(editor.locator('[id$="-windows-error"]').textContent()).resolves.toMatch(/^“18-” is not a window/);
    await expect(editor.locator('[id$="-watts-error"]').textContent()).resolves.toBe('Watts: enter a number.');
    await shot(page, `load-edit-errors-${viewport}`);
    await editor.getByLabel('When it runs').fill('18-23; 6-8');
    await editor.getByLabel('Watts (each)').fill('2');
    await editor.getByRole('button', { name: 'Save load' }).click();
    await page.getByText('Saved Reading lights.').waitFor();
    // 4 × 2 W × 7 h = 56 Wh
    await expect(page.locator('tr[data-load-row="Reading lights"] td[data-label="Wh/day"]').textContent()).resolves.toBe('56 Wh');
    await expect(page.locator('tr[data-load-row="Reading lights"] td[data-label="When"]').textContent()).resolves.toBe('18:00–23:00, 06:00–08:00');
  });

  it('shows both versions of a load someone else saved meanwhile, and takes theirs', async () => {
    const list = await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}/loads`)).json();
    const furnace = list.find((l: { name: string }) => l.name === 'Furnace blower');
    await page.getByRole('button', { name: 'Edit Furnace blower' }).click();
    const editor = page.getByRole('form', { name: 'Edit Furnace blower' });
    await editor.getByLabel('Watts (each)').fill('75');
    const other = await page.request.patch(`${baseUrl()}/api/loads/${furnace.id}`, { headers: origin(), data: { version: furnace.version, watts: 90, dutyPct: 80 } });
    expect(other.status()).toBe(200);
    await editor.getByRole('button', { name: 'Save load' }).click();
    const notice = editor.locator('[data-conflict]');
    await notice.waitFor();
    const rows = await notice.locator('tbody tr').evaluateAll((trs) => trs.map((tr) => [...tr.children].map((c) => c.textContent)));
    expect(rows).toEqual([
      ['Watts', '90', '75'],
      ['Duty %', '80', '100'],
    ]);
    await shot(page, `load-conflict-${viewport}`);
    await notice.getByRole('button', { name: 'Take theirs' }).click();
    await page.getByText('Showing the other version of Furnace blower.').waitFor();
    await expect(page.locator('tr[data-load-row="Furnace blower"] td[data-label="Draw"]').textContent()).resolves.toBe('90 W7.03 A at 12.8 V'); // 90 W ÷ 12.8 V = 7.03 A
    const saved = (await (await page.request.get(`${baseUrl()}/api/rigs/${rigId}/loads`)).json()).find((l: { id: string }) => l.id === furnace.id);
    expect(saved).toMatchObject({ watts: 90, dutyPct: 80, version: furnace.version + 1 });
  });

  it('sorts the loads by energy a day', async () => {
    const names = async () => page.locator('tr[data-load-row]').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-load-row')));
    if (viewport === 'phone') await page.getByLabel('Sort by').selectOption('wh:desc');
    else await page.getByRole('button', { name: /^Wh\/day/ }).click();
    expect((await names())[0]).toBe('Furnace blower');
    expect((await names()).at(-1)).toBe('Reading lights');
    await shot(page, `loads-${viewport}`);
  });

  it('plans a two-stop trip with a drive day', async () => {
    await page.goto(baseUrl() + '/trips');
    await hydrated(page);
    await page.getByText('No trips yet').waitFor();
    await page.getByRole('link', { name: 'New trip' }).first().click();
    await page.waitForURL('**/trips/new');
    await hydrated(page);

    await page.getByLabel('Trip name').fill('High desert, late October');
    await expect.poll(() => page.getByLabel('Rig', { exact: true }).inputValue()).toBe(rigId);

    // Stop 1 by place search.
    await page.locator('#stops-0-place').fill('Moab, UT');
    await page.getByRole('listbox').getByRole('option', { name: /^Moab, Utah, United States/ }).click();
    expect(Number(await page.locator('#stops-0-lat').inputValue())).toBeCloseTo(38.57, 1);
    expect(Number(await page.locator('#stops-0-lon').inputValue())).toBeCloseTo(-109.55, 1);
    expect(await page.locator('#stops-0-timeZone').inputValue()).toBe('America/Denver');
    await page.locator('#stops-0-name').fill('Mesa camp');
    await page.locator('#stops-0-arrive').fill('2027-10-21');
    await page.locator('#stops-0-nights').fill('3');
    await page.locator('#stops-0-shadePct').fill('10');
    await page.getByLabel('Sky on Thu 21 Oct 2027').selectOption({ label: 'Clear' });
    await page.locator('#stops-0-weather-0-highC').fill('18');
    await page.locator('#stops-0-weather-0-lowC').fill('-2');
    await page.getByLabel('Sky on Fri 22 Oct 2027').selectOption({ label: 'Mostly cloudy' });
    // A new day starts from the nearest day's temperatures.
    expect(await page.locator('#stops-0-weather-1-highC').inputValue()).toBe('18');
    await page.locator('#stops-0-weather-1-lowC').fill('1');

    // Stop 2 by typed coordinates; its time zone is found from them.
    await page.getByRole('button', { name: '+ Add the next stop' }).click();
    expect(await page.locator('#stops-1-arrive').inputValue()).toBe('2027-10-24');
    await page.locator('#stops-1-name').fill('Juniper flat');
    await page.locator('#stops-1-lat').fill('37.05');
    await page.locator('#stops-1-lon').fill('-112.5');
    await expect.poll(() => page.locator('#stops-1-timeZone').inputValue(), { timeout: 5000 }).toBe('America/Denver');
    await page.locator('#stops-1-nights').fill('2');

    // The drive between them, on the day the camper leaves stop 1.
    await page.getByRole('button', { name: '+ Add a drive day' }).click();
    expect(await page.locator('#drives-0-date').inputValue()).toBe('2027-10-24');
    await page.locator('#drives-0-startHour').selectOption('9');
    await page.locator('#drives-0-hours').fill('4');
    await page.getByLabel('Reserve to keep').fill('25');
    await shot(page, `trip-new-${viewport}`);

    await page.getByRole('button', { name: 'Create trip' }).click();
    await page.waitForURL(/\/trips\/(?!new\b)[^/?#]+(\?created=1)?$/);
    tripId = at(new URL(page.url()).pathname.split('/'), 2, 'trip id in the URL');
    await hydrated(page);
    await page.getByText('Thu 21 Oct – Tue 26 Oct 2027 · 5 nights').waitFor();
    // The saved trip opens as an itinerary to read; the editor is a button away.
    const summary = page.getByTestId('trip-summary');
    const text = (await summary.textContent()) ?? '';
    expect(text).toContain('1. Mesa camp');
    expect(text).toContain('2. Juniper flat');
    expect(text).toContain('Thu 21 Oct 2027 from 15:00 · 3 nights · leave Sun 24 Oct');
    expect(text).toMatch(/Thu 21 OctTypedClear, 18 °C \/ −2 °C/);
    expect(text).toMatch(/Fri 22 OctTypedMostly cloudy, 18 °C \/ 1 °C/);
    expect(text).toContain('Sun 24 Oct 2027 from 09:00, 4 hours');
    expect(text).toContain('Keep at least 25 % state of charge');
    // Mesa camp has weather typed for two of its four days; the others, and all of Juniper flat, come from the
    // weather service's past years (far trip), each day saying so.
    expect(text).toMatch(/Sat 23 OctPast years/);
    expect(text).toMatch(/Mon 25 OctPast years/);
    expect(text).not.toContain('Assumed');
    expect(text).not.toMatch(/NaN|undefined/);
    expect(await page.locator('#stops-0-name').count()).toBe(0);

    const trip = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    expect(trip).toMatchObject({ name: 'High desert, late October', rigId, reserveSocPct: 25 });
    expect(trip.stops).toHaveLength(2);
    expect(trip.stops[0]).toMatchObject({ name: 'Mesa camp', timeZone: 'America/Denver', arrive: '2027-10-21', nights: 3, shadePct: 10, hookup: 'none' });
    expect(trip.stops[0].weather).toEqual([
      { date: '2027-10-21', cloudOktas: 0, highC: 18, lowC: -2 },
      { date: '2027-10-22', cloudOktas: 6, highC: 18, lowC: 1 },
    ]);
    expect(trip.stops[1]).toMatchObject({ name: 'Juniper flat', lat: 37.05, lon: -112.5, timeZone: 'America/Denver', arrive: '2027-10-24', nights: 2 });
    expect(trip.drives).toEqual([{ date: '2027-10-24', startHour: 9, hours: 4 }]);
    await shot(page, `trip-saved-${viewport}`);
  });

  it('names an overlapping stop next to its arrival date, and a server-found problem next to its field', async () => {
    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    await page.locator('#stops-1-arrive').waitFor();
    expect(await page.locator('#stops-0-name').inputValue()).toBe('Mesa camp');
    await page.locator('#stops-1-arrive').fill('2027-10-22');
    await page.getByRole('button', { name: 'Save trip' }).click();
    await expect(page.locator('#stops-1-arrive-error').textContent()).resolves.toBe('Arrival date overlaps the stop before, which you leave on Sun 24 Oct 2027.');
    await shot(page, `trip-errors-${viewport}`);
    await page.locator('#stops-1-arrive').fill('2027-10-24');

    // A drive at noon on the last day is after the trip ends (11:00): the trip schema's drive rule says so by the field.
    await page.locator('#drives-0-date').fill('2027-10-26');
    await page.locator('#drives-0-startHour').selectOption('12');
    await page.getByRole('button', { name: 'Save trip' }).click();
    await expect(page.locator('#drives-0-date-error').textContent()).resolves.toMatch(/^Drive 1 starts at 12:00 on Tue 26 Oct, after the trip ends \(11:00 on Tue 26 Oct\): a drive must start inside the trip/);
    const unchanged = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    expect(unchanged.drives).toEqual([{ date: '2027-10-24', startHour: 9, hours: 4 }]);
  });

  it('keeps the camper’s edit or takes the other version when someone else saved the trip', async () => {
    await page.locator('#drives-0-date').fill('2027-10-24');
    await page.locator('#drives-0-startHour').selectOption('9');
    await page.getByLabel('Trip name').fill('High desert, mine');
    const current = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    const other = await page.request.patch(`${baseUrl()}/api/trips/${tripId}`, { headers: origin(), data: { version: current.version, name: 'High desert, theirs' } });
    expect(other.status()).toBe(200);
    await page.getByRole('button', { name: 'Save trip' }).click();
    const notice = page.locator('[data-conflict]');
    await notice.waitFor();
    await expect(notice.textContent()).resolves.toContain('High desert, theirs');
    await notice.getByRole('button', { name: 'Keep mine' }).click();
    await page.getByText('Saved.', { exact: true }).waitFor();
    const after = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    expect(after.name).toBe('High desert, mine');
    expect(after.version).toBe(current.version + 2);
    // Closing the editor shows the itinerary as saved.
    await page.getByRole('button', { name: 'Close the editor' }).click();
    await page.getByTestId('trip-summary').getByRole('heading', { level: 1, name: 'High desert, mine' }).waitFor();
  });

  it('shows temperatures in °F after switching to imperial, still stored in °C', async () => {
    await page.goto(baseUrl() + '/settings');
    await hydrated(page);
    await page.getByLabel('Imperial').check();
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Saved. Temperatures show in °F.').waitFor();
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    expect(await page.getByTestId('trip-summary').textContent()).toMatch(/Thu 21 OctTypedClear, 64 °F \/ 28 °F/);
    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    const high = page.locator('#stops-0-weather-0-highC');
    await high.waitFor();
    expect(await page.locator('label[for="stops-0-weather-0-highC"]').textContent()).toBe('High (°F)');
    expect(await high.inputValue()).toBe('64.4');
    await page.locator('#stops-0-weather-0-lowC').fill('23'); // −5 °C
    await page.getByRole('button', { name: 'Save trip' }).click();
    await page.getByText('Saved.', { exact: true }).waitFor();
    const trip = await (await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).json();
    expect(trip.stops[0].weather[0]).toEqual({ date: '2027-10-21', cloudOktas: 0, highC: 18, lowC: -5 });
    await page.goto(baseUrl() + '/trips');
    await hydrated(page);
    await page.getByRole('link', { name: /High desert, mine/ }).waitFor();
    await shot(page, `trips-${viewport}`);
  });

  it('deletes the trip only after a second yes', async () => {
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Edit the itinerary' }).click();
    await page.getByRole('button', { name: 'Delete trip…' }).click();
    // The question says what goes with the trip (counted by the server) and where to get it back.
    await page.getByText(/Delete High desert, mine\? With it go (nothing else|\d+ saved forecasts?)/).waitFor();
    await page.getByText(/restore it under “Recently deleted” on the Trips page for 30 days/).waitFor();
    await page.getByRole('button', { name: 'Keep' }).click();
    expect((await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).status()).toBe(200);
    await page.getByRole('button', { name: 'Delete trip…' }).click();
    await page.getByRole('button', { name: 'Delete', exact: true }).click();
    await page.waitForURL('**/trips');
    expect((await page.request.get(`${baseUrl()}/api/trips/${tripId}`)).status()).toBe(404);
  });
});
