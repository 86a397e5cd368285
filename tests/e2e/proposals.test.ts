import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { browserPool, hydrated, shot, type ViewportName, signIn, seriousViolations } from '../helpers/browser';
import { activeCrew, makeLoad, makeRig, makeTrip } from '../helpers/crew';
import { linkIn, waitForMail } from '../helpers/mail';

// An installer turns a crew's saved forecast into a proposal; the crew's owner accepts it.

const PASSWORD = 'dusk-and-ember-27';



describe('installer proposals in Chromium', () => {
  let owner: Session;
  let installer: Session;
  let tripId: string;
  let forecastId: string;
  let proposalUrl: string;
  const browsers = browserPool();
  const open = browsers.open;
  beforeAll(async () => {
    owner = await signUp({ name: 'Inés', password: PASSWORD });
    const crewId = (await activeCrew(owner)).id;
    await api(`/api/crews/${crewId}`, { method: 'PATCH', session: owner, json: { name: 'Reyes-Okafor', version: 1 } });
    const rig = await makeRig(owner, crewId);
    await makeLoad(owner, rig.id);
    await makeLoad(owner, rig.id, { name: 'Electric blanket', watts: 100 });
    tripId = (await makeTrip(owner, rig.id)).id;
    const f = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Before the upgrade' } });
    forecastId = ((await f.json()) as { id: string }).id;
    installer = await signUp({ kind: 'installer', name: 'Wren Solar', password: PASSWORD });
    expect((await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } })).status).toBe(202);
  });
  afterAll(async () => {
    await browsers.closeAll();
  });

  it('the installer saves a price list, sweeps the granted rig’s saved forecast and sends a proposal (1280 px)', async () => {
    const page = await open('desktop');
    await signIn(page, installer.email, PASSWORD, '/proposals');
    await page.getByText('No proposals yet').waitFor();
    const prices = page.getByRole('form', { name: 'Price list' });
    await prices.getByLabel('Currency').fill('CAD');
    await prices.getByLabel('LiFePO4 bank, per Ah').fill('4.5');
    await prices.getByLabel('AGM bank, per Ah').fill('2');
    await prices.getByLabel('Bank installation').fill('150');
    await prices.getByLabel('Panels, per rated watt').fill('abc');
    await prices.getByRole('button', { name: 'Save my price list' }).click();
    // Bad input is named next to its field, and nothing is saved.
    await page.locator('#price-panelPerWatt-error').waitFor();
    expect(await page.locator('#price-panelPerWatt-error').textContent()).toMatch(/Panels, per rated watt/);
    await prices.getByLabel('Panels, per rated watt').fill('1.1');
    await prices.getByLabel('Added array, flat on the roof').fill('220');
    await prices.getByLabel('Added array, portable').fill('120');
    await prices.getByRole('button', { name: 'Save my price list' }).click();
    await page.getByText('Saved (version 1).').waitFor();
    await shot(page, 'proposals-installer-empty-desktop');

    // From the granted rig's saved forecast to the planner.
    await page.goto(`${baseUrl()}/trips/${tripId}/forecasts/${forecastId}`);
    await hydrated(page);
    await page.getByRole('link', { name: 'Plan an upgrade from this forecast' }).click();
    await page.waitForURL('**/proposals/new?forecast=*');
    await hydrated(page);
    await page.getByRole('heading', { name: 'Plan an upgrade for Test van' }).waitFor();
    await page.getByTestId('verdict-headline').waitFor();
    expect(await page.getByTestId('verdict-headline').textContent()).toMatch(/^Runs out/);
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'upgrade-planner-desktop');

    await page.getByRole('button', { name: 'Run the sweep' }).click();
    await page.getByTestId('sweep-results').waitFor();
    const best = page.getByTestId('cheapest-passing');
    await best.waitFor();
    expect(await best.textContent()).toMatch(/CA\$/);
    await shot(page, 'upgrade-sweep-results-desktop');
    await best.getByRole('button', { name: 'Propose this' }).click();
    await page.waitForURL(/\/proposals\/[0-9a-f-]{36}$/);
    await hydrated(page);
    proposalUrl = page.url();

    const editor = page.getByTestId('draft-editor');
    await editor.waitFor();
    expect(await page.getByTestId('proposal-status').textContent()).toBe('Draft');
    await editor.getByLabel('Notes for the crew').fill('The new bank goes in the bed box; the Class T fuse sits at its positive post.');
    await editor.getByRole('button', { name: '+ Add a part' }).click();
    await editor.locator('[id^="edit-parts-"][id$="-name"]').last().fill('Class T fuse and holder');
    await editor.locator('[id^="edit-parts-"][id$="-unitPrice"]').last().fill('89.50');
    await editor.getByRole('button', { name: 'Save draft' }).click();
    await page.getByText('Draft saved; the cable checks are updated.').waitFor();
    expect(await page.getByTestId('run-size').first().textContent()).toMatch(/^\d+(\/0)? AWG$/);
    expect(await page.getByTestId('run-method').first().textContent()).toBe('ABYC-style, 20 °C');
    expect(await page.getByTestId('cautions').textContent()).toMatch(/18 cm \(7 in\) of the battery positive/);
    await shot(page, 'proposal-draft-desktop');
    await editor.getByRole('button', { name: 'Send to the crew' }).click();
    await page.locator('[data-testid="proposal"][data-status="sent"]').waitFor();
    expect(await page.getByTestId('proposal-status').textContent()).toBe('Waiting for the crew');
  });

  it('the owner opens the e-mailed link, reads before and after, and accepts with a comment (390 px)', async () => {
    const mails = await waitForMail(owner.email);
    const mail = mails.find((m) => m.subject.includes('proposal'))!;
    expect(mail.subject).toBe('An installer sent your crew an upgrade proposal on Sunreckon');
    expect(mail.text_body).toContain('“Wren Solar”');
    const link = linkIn(mail, `${baseUrl()}/proposals/`);
    expect(link).toBe(proposalUrl);

    const page = await open('phone');
    await signIn(page, owner.email, PASSWORD, new URL(link).pathname);
    await page.getByTestId('proposal').waitFor();
    expect(await page.getByTestId('installer-name').textContent()).toBe('Wren Solar');
    // Before and after overlaid, with their summaries side by side.
    await page.getByTestId('compare-view').waitFor();
    expect(await page.getByTestId('compare-table').textContent()).toMatch(/Before.*After/s);
    expect(await page.getByTestId('parts-table').textContent()).toContain('Class T fuse and holder');
    expect(await page.getByTestId('parts-total').textContent()).toMatch(/^CA\$/);
    expect(await page.getByTestId('notes').textContent()).toContain('bed box');
    expect(await page.getByTestId('cable-table').count()).toBe(1);
    expect(await page.getByTestId('cautions').textContent()).toMatch(/Disconnect shore power/);
    expect(await seriousViolations(page)).toEqual([]);
    await shot(page, 'proposal-owner-phone');

    await page.getByLabel('Comment for Wren Solar (optional)').fill('Yes — before the October trip, please.');
    await page.getByRole('button', { name: 'Accept the proposal' }).click();
    // Accepting records a typed name, like a signature.
    await page.getByText('Type your name to accept: it is recorded with the time, as a signature.').waitFor();
    await page.getByLabel('Your name, to accept').fill('Inés Reyes');
    await page.getByRole('button', { name: 'Accept the proposal' }).click();
    await page.getByTestId('decision').waitFor();
    expect(await page.getByTestId('decision').textContent()).toMatch(/Accepted by Inés Reyes on \w{3} \d{1,2} \w{3} \d{4}, \d{2}:\d{2}.*Yes — before the October trip/s);
    await shot(page, 'proposal-accepted-phone');

    await page.goto(`${baseUrl()}/proposals`);
    await hydrated(page);
    await page.locator('[data-status="accepted"]').first().waitFor();
    await shot(page, 'proposals-owner-phone');
  });

  it.each(['phone', 'desktop'] as ViewportName[])('both sides see the accepted proposal at %s width', async (viewport) => {
    const page = await open(viewport);
    await signIn(page, installer.email, PASSWORD, '/proposals');
    await page.locator('[data-status="accepted"]').first().waitFor();
    await shot(page, `proposals-installer-${viewport}`);
    await page.goto(proposalUrl);
    await hydrated(page);
    await page.getByTestId('decision').waitFor();
    expect(await page.getByTestId('draft-editor').count()).toBe(0);
    await shot(page, `proposal-installer-${viewport}`);
    if (viewport === 'desktop') {
      // The printout: the proposal with the installer's name, without the app's header and buttons.
      await page.emulateMedia({ media: 'print' });
      expect(await page.locator('body > header').isVisible()).toBe(false);
      expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
      expect(await page.getByText('Prepared with Sunreckon by Wren Solar').isVisible()).toBe(true);
      await shot(page, 'proposal-print-desktop');
      await page.emulateMedia({ media: 'screen' });
    }
    await page.goto(`${baseUrl()}/proposals/new?forecast=${forecastId}`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Run the sweep' }).waitFor();
    await shot(page, `upgrade-planner-${viewport}`);
  });
});
