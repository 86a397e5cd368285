import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, signUp, uniqueEmail, type Session } from '../helpers/api';
import { browserPool, hydrated, launch, shot, signOut, type ViewportName, signIn } from '../helpers/browser';
import { activeCrew, makeRig, member } from '../helpers/crew';

const PASSWORD = 'dusk-and-ember-27';


describe('a household shares one rig (Chromium)', () => {
  let owner: Session;
  let crewId: string;
  let rigId: string;
  const inviteeEmail = uniqueEmail('tobi');
  const browsers = browserPool();
  const open = browsers.open;
  beforeAll(async () => {
    owner = await signUp({ name: 'Inés', password: PASSWORD });
    crewId = (await activeCrew(owner)).id;
    await api(`/api/crews/${crewId}`, { method: 'PATCH', session: owner, json: { name: 'Reyes-Okafor', version: 1 } });
    rigId = (await makeRig(owner, crewId)).id;
  });
  afterAll(async () => {
    await browsers.closeAll();
  });

  it('the owner invites a household member by e-mail from the Crew page', async () => {
    const page = await open();
    await signIn(page, owner.email, PASSWORD, '/crew');
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Reyes-Okafor');
    await page.getByLabel('E-mail').fill('not-an-address');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await expect(page.locator('#invite-email-error').textContent()).resolves.toMatch(/e-mail address/);

    await page.getByLabel('E-mail').fill(inviteeEmail);
    await page.getByLabel('Role', { exact: true }).selectOption('editor');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText(`Invitation sent to ${inviteeEmail}`).waitFor();
    await page.locator(`[data-invitation="${inviteeEmail}"]`).waitFor();
    await shot(page, 'crew-owner-desktop');
  });

  it('the member follows the e-mailed link, signs up with that address and joins as editor', async () => {
    const page = await open('phone');
    await page.goto(`${baseUrl()}/dev/mail?to=${encodeURIComponent(inviteeEmail)}`);
    await expect(page.locator('[data-mail-to]').first().textContent()).resolves.toBe(inviteeEmail);
    await shot(page, 'dev-mail-phone');
    await page.locator('a[data-mail-link][href*="/invite/"]').first().click();
    await page.waitForURL('**/invite/**');
    await hydrated(page);
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Join “Reyes-Okafor”');
    await expect(page.locator('[data-invited-email]').textContent()).resolves.toBe(inviteeEmail);
    await shot(page, 'invite-signup-phone');

    await page.getByLabel('Your name').fill('Tobi');
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Create account and join' }).click();
    await page.waitForURL('**/crew?joined=1');
    await hydrated(page);
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Reyes-Okafor');
    await page.getByText('Welcome to Reyes-Okafor. You joined as an editor').waitFor();
    await page.locator(`[data-member="${inviteeEmail}"]`).waitFor();
    await shot(page, 'crew-member-phone');
  });

  it('the member adds a load to the shared rig, and the owner sees it', async () => {
    const page = await open();
    await signIn(page, inviteeEmail, PASSWORD, `/rigs/${rigId}#loads`);
    await page.getByRole('button', { name: '+ Add a load' }).click();
    const form = page.getByRole('form', { name: 'New load' });
    await form.getByLabel('Name').fill('Tobi’s laptop');
    await form.getByLabel('Watts (each)').fill('60');
    await form.getByRole('button', { name: 'Add load' }).click();
    await page.getByRole('table', { name: 'Loads' }).getByText('Tobi’s laptop').waitFor();

    const ownerPage = await open();
    await signIn(ownerPage, owner.email, PASSWORD, `/rigs/${rigId}#loads`);
    await ownerPage.getByRole('table', { name: 'Loads' }).getByText('Tobi’s laptop').waitFor();
    // The rig's Activity section says who added it.
    await ownerPage.getByRole('link', { name: 'Activity', exact: true }).click();
    const entry = ownerPage.locator('[data-activity="added"]').first();
    await entry.waitFor();
    await expect(entry.textContent()).resolves.toMatch(/^Tobi added Tobi’s laptop/);
    await shot(ownerPage, 'rig-activity-desktop');
  });

  it('a viewer reads the loads but cannot change them', async () => {
    const viewer = await member(owner, crewId, 'viewer', 'Vera');
    const page = await open('phone');
    // The helper signs members up with its default password.
    await signIn(page, viewer.email, 'correct-horse-1', `/rigs/${rigId}#loads`);
    await page.getByRole('table', { name: 'Loads' }).getByText('Tobi’s laptop').waitFor();
    expect(await page.getByRole('button', { name: '+ Add a load' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^Edit / }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^Delete / }).count()).toBe(0);
    await shot(page, 'rig-loads-viewer-phone');

    // The server refuses the write too, whatever the page shows.
    const res = await page.request.post(`${baseUrl()}/api/rigs/${rigId}/loads`, { data: { name: 'Kettle', watts: 1200 }, headers: { origin: baseUrl() } });
    expect(res.status()).toBe(403);

    await page.goto(`${baseUrl()}/crew`);
    await hydrated(page);
    await page.getByText('Only the crew’s owners can invite people or change roles.').waitFor();
    expect(await page.getByRole('button', { name: 'Send invitation' }).count()).toBe(0);
  });
});

describe('installer and crew pages at both widths (Chromium)', () => {
  it.each(['phone', 'desktop'] as ViewportName[])('%s: the granted installer lists the rig; the owner sees members and open invitations', async (viewport) => {
    const owner = await signUp({ name: 'Marisol', password: PASSWORD });
    const crewId = (await activeCrew(owner)).id;
    const rig = await makeRig(owner, crewId);
    await member(owner, crewId, 'editor', 'Tobi');
    await api(`/api/crews/${crewId}/invitations`, { method: 'POST', session: owner, json: { email: uniqueEmail('pending'), role: 'viewer' } });
    const installer = await signUp({ kind: 'installer', name: 'Wren', password: PASSWORD });

    const b = await launch(viewport);
    try {
      const { page } = b;
      await signIn(page, owner.email, PASSWORD, '/crew');
      await page.locator('[data-member]').nth(1).waitFor();
      await shot(page, `crew-${viewport}`);

      // The owner shares the rig from its Installers section: a camper's e-mail and an installer's answer
      // alike (the page never tells who has an installer account); both are listed as invited.
      await page.goto(`${baseUrl()}/rigs/${rig.id}#installers`);
      await hydrated(page);
      await page.getByLabel('Installer’s e-mail').fill(owner.email);
      await page.getByRole('button', { name: 'Share this rig' }).click();
      await page.locator(`[data-invited="${owner.email}"]`).waitFor();
      const asCamper = await page.locator('section[aria-labelledby="installers-h"] [role="status"]').textContent();
      expect(asCamper).toMatch(/^If this address belongs to an installer account/);
      await page.getByLabel('Installer’s e-mail').fill(installer.email);
      await page.getByRole('button', { name: 'Share this rig' }).click();
      await page.locator(`[data-invited="${installer.email}"]`).waitFor();
      expect(await page.locator('section[aria-labelledby="installers-h"] [role="status"]').textContent()).toBe(asCamper);
      expect(await page.locator('#grant-email-error').count()).toBe(0);
      await shot(page, `rig-installers-${viewport}`);
      await signOut(page);
      await page.waitForURL(baseUrl() + '/');

      await signIn(page, installer.email, PASSWORD, '/installer');
      await page.locator('[data-shared-rig="Test van"]').waitFor();
      await shot(page, `installer-${viewport}`);
      await page.getByRole('link', { name: 'Open rig' }).click();
      await page.waitForURL(`**/rigs/${rig.id}`);
      await hydrated(page);
      await page.getByRole('heading', { name: 'Test van' }).first().waitFor();
      // The crew's own sections are not offered to an installer.
      expect(await page.getByRole('link', { name: 'Installers', exact: true }).count()).toBe(0);
      expect(await page.getByRole('link', { name: 'Activity', exact: true }).count()).toBe(0);
      await shot(page, `rig-installer-${viewport}`);
      await signOut(page);
      await page.waitForURL(baseUrl() + '/');

      // The owner revokes; the installer's list is empty again.
      await signIn(page, owner.email, PASSWORD, `/rigs/${rig.id}#installers`);
      // Asked in the page (no browser box): the question names what the installer loses.
      await page.getByRole('button', { name: 'Revoke access' }).click();
      const ask = page.getByRole('group', { name: 'Confirm' });
      await ask.getByText('Take Wren’s access to this rig away?').waitFor();
      await ask.getByRole('button', { name: 'Revoke access' }).click();
      await page.getByText('Wren no longer has access to this rig.').waitFor();
      expect(await (await api('/api/installer/rigs', { session: installer })).json()).toEqual([]);
    } finally {
      await b.close();
    }
  });
});
