import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { baseUrl, uniqueEmail } from '../helpers/api';
import { hydrated, launch, shot, signOut, VIEWPORTS, type ViewportName } from '../helpers/browser';

describe.each(Object.keys(VIEWPORTS) as ViewportName[])('accounts in Chromium at %s width', (viewport) => {
  let page: Page;
  let close: () => Promise<void>;
  const email = uniqueEmail(`e2e-${viewport}`);
  const password = 'trail-mix-2027';

  beforeAll(async () => {
    ({ page, close } = await launch(viewport));
  });
  afterAll(async () => close?.());

  it('shows what Sunreckon does on the landing page', async () => {
    await page.goto(baseUrl() + '/');
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toMatch(/house battery/i);
    await shot(page, `landing-${viewport}`);
  });

  it('explains bad sign-up input next to each field', async () => {
    await page.goto(baseUrl() + '/sign-up');
    await hydrated(page);
    await page.getByLabel('E-mail').fill('not-an-email');
    await page.getByLabel('Password').fill('short');
    await page.getByRole('button', { name: 'Create account' }).click();
    await expect(page.locator('#name-error').textContent()).resolves.toContain('Enter your name');
    await expect(page.locator('#email-error').textContent()).resolves.toContain('e-mail address');
    await expect(page.locator('#password-error').textContent()).resolves.toContain('at least 8');
    await shot(page, `sign-up-errors-${viewport}`);
  });

  it('signs a new camper up and shows the app shell', async () => {
    await page.getByLabel('Your name').fill('Rosa Tester');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL('**/rigs');
    const nav = page.getByRole('navigation', { name: 'Main' });
    for (const label of ['Rigs', 'Trips', 'Crew', 'Proposals']) {
      expect(await nav.getByRole('link', { name: label, exact: true }).count()).toBe(1);
    }
    await shot(page, `app-shell-${viewport}`);
  });

  it('signs out', async () => {
    await signOut(page);
    await page.waitForURL(baseUrl() + '/');
    await page.goto(baseUrl() + '/trips');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
  });

  it('refuses a wrong password with a clear message, then signs in', async () => {
    await hydrated(page);
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('wrong-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const alert = page.getByRole('alert').first();
    await alert.waitFor();
    expect(await alert.textContent()).toMatch(/do not match/);
    await shot(page, `sign-in-error-${viewport}`);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/trips');
    expect(await page.locator('#account-menu > summary').count()).toBe(1);
  });

  it('changes the password on the settings page, naming a wrong current password', async () => {
    await page.goto(baseUrl() + '/settings');
    await hydrated(page);
    const form = page.getByRole('form', { name: 'Change your password' });
    await form.getByLabel('Current password').fill('not-the-password');
    await form.getByLabel('New password', { exact: true }).fill('campfire-smoke-9');
    await form.getByLabel('New password again').fill('campfire-smoke-9');
    await form.getByRole('button', { name: 'Change password' }).click();
    await expect(page.locator('#current-password-error').textContent()).resolves.toContain('not your current password');
    await shot(page, `settings-password-error-${viewport}`);
    await form.getByLabel('Current password').fill(password);
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText(/^Password changed\./).waitFor();
    // Still signed in here; the new password is the one that works from now on.
    await signOut(page);
    await page.waitForURL(baseUrl() + '/');
    await page.goto(baseUrl() + '/sign-in');
    await hydrated(page);
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('campfire-smoke-9');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/trips');
  });
});
