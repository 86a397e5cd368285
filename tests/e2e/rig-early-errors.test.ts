import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { signUp, type Session } from '../helpers/api';
import { makeRig } from '../helpers/crew';
import { launch, signIn } from '../helpers/browser';

// A new panel or charger starts with an empty watts/amps box. The camper has not typed yet, so no red
// "enter a number" may show; it shows once the box is left empty, or when the rig is saved.

const PASSWORD = 'long-desert-road-7';

/** The form's visible error lines, as text. */
async function errorLines(page: Page): Promise<string[]> {
  return page.locator('form .field-error').allTextContents();
}

describe('rig editor: errors wait for the camper', () => {
  let camper: Session;
  let page: Page;
  let close: () => Promise<void>;
  let rigId = '';

  beforeAll(async () => {
    camper = await signUp({ name: 'Ada Roadwell', password: PASSWORD });
    rigId = (await makeRig(camper)).id;
    ({ page, close } = await launch('phone', { locale: 'en-US' }));
    await signIn(page, camper.email, PASSWORD, `/rigs/${rigId}`);
  });
  afterAll(async () => close?.());

  it('adds a panel and a charger without a red error, then says what is missing when the box is left or the rig saved', async () => {
    await page.getByRole('button', { name: '+ Add roof panels' }).click();
    const watts = page.locator('#arrays-0-ratedWatts');
    await watts.waitFor();
    await page.getByRole('button', { name: '+ DC-DC charger' }).click();
    const amps = page.locator('#chargers-0-amps');
    await amps.waitFor();
    // A second panel after the first: adding rows must not judge the rows already there either.
    await page.getByRole('button', { name: '+ Add a portable panel' }).click();
    await page.locator('#arrays-1-ratedWatts').waitFor();
    await page.waitForTimeout(300);
    expect(await errorLines(page)).toEqual([]);
    expect(await watts.getAttribute('aria-invalid')).toBeNull();

    // Leaving the box empty is the moment to say so.
    await watts.focus();
    await amps.focus();
    await page.locator('#arrays-0-ratedWatts-error').waitFor();
    expect(await page.locator('#arrays-0-ratedWatts-error').textContent()).toBe('Rated power: enter a number.');
    expect(await page.locator('#chargers-0-amps-error').count()).toBe(0);

    // Saving shows every missing number.
    await page.getByRole('button', { name: 'Save power system' }).click();
    await page.locator('#chargers-0-amps-error').waitFor();
    await page.locator('#arrays-1-ratedWatts-error').waitFor();
    // Typing a number clears its message.
    await amps.fill('30');
    await page.locator('#chargers-0-amps-error').waitFor({ state: 'detached' });
  });
});
