import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { hydrated, launch, shot } from '../helpers/browser';
import { activeCrew, makeRig } from '../helpers/crew';
import { linkIn, waitForMail } from '../helpers/mail';

// A camper shares a rig with an installer who has no account yet: the e-mail's link opens the
// sign-up with "Installer" chosen, and after signing up the installer lands on their own page with
// the rig shared (390 px).

describe('inviting an installer without an account', () => {
  let owner: Session;
  let close: () => Promise<void>;
  beforeAll(async () => {
    owner = await signUp({ name: 'Brisa' });
  });
  afterAll(async () => close?.());

  it('follows the e-mailed link, signs up as an installer and finds the rig shared', async () => {
    const rig = await makeRig(owner, (await activeCrew(owner)).id);
    const email = `fresh-installer-${crypto.randomUUID().slice(0, 8)}@example.test`;
    expect((await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email } })).status).toBe(202);
    const [mail] = await waitForMail(email);
    const link = linkIn(mail!, `${baseUrl()}/sign-up`);

    const b = await launch('phone');
    close = b.close;
    const page = b.page;
    await page.goto(link);
    await hydrated(page);
    expect(await page.getByLabel('Installer').isChecked()).toBe(true);
    await shot(page, 'sign-up-invited-installer-phone');
    await page.getByLabel('Your name').fill('Ned Ferrule');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('fresh-installer-42');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL((u) => u.pathname === '/installer');
    await hydrated(page);
    await page.locator('[data-shared-rig="Test van"]').waitFor();
    expect(await page.getByRole('link', { name: 'New trip' }).count()).toBe(0);
    await shot(page, 'installer-invited-landing-phone');
  });
});
