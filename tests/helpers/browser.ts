import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';
import { ROOT } from './server';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
/** Debian's Chromium, headless and quiet (no first-run, sync, updates or background traffic): the one list every browser run uses. */
export const CHROMIUM_FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
export const SCREENSHOTS = path.join(ROOT, 'test-results', 'screenshots');

export const VIEWPORTS = {
  phone: { width: 390, height: 844 },
  desktop: { width: 1280, height: 900 },
} as const;
export type ViewportName = keyof typeof VIEWPORTS;

export interface LaunchOptions {
  /** The browser's clock zone (IANA), e.g. a phone at camp; the machine's zone when absent. */
  timezoneId?: string;
  /** The browser's language and number format, e.g. 'de-DE'; Chromium's default when absent. */
  locale?: string;
}

/** Launches Debian's Chromium with a fresh profile (so a fresh service worker); fails loudly (never skips) when it is missing. */
export async function launch(viewport: ViewportName = 'desktop', options: LaunchOptions = {}): Promise<{ context: BrowserContext; page: Page; close(): Promise<void> }> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(
      `Chromium was not found at ${CHROMIUM}. The end-to-end tests drive Debian's Chromium: install it with ` +
        '`apt-get update && apt-get install -y chromium` (or set CHROMIUM_PATH), then run the tests again.',
    );
  }
  const profile = mkdtempSync(path.join(tmpdir(), 'sunreckon-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: VIEWPORTS[viewport],
    ...(options.timezoneId ? { timezoneId: options.timezoneId } : {}),
    ...(options.locale ? { locale: options.locale } : {}),
    args: CHROMIUM_FLAGS,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/**
 * Browsers a test file opens and closes together: `open(viewport)` launches one and gives its page,
 * `closeAll()` (in afterAll) closes every one opened.
 */
export function browserPool(): { open(viewport?: ViewportName, options?: LaunchOptions): Promise<Page>; closeAll(): Promise<void> } {
  const opened: { close(): Promise<void> }[] = [];
  return {
    open: async (viewport = 'desktop', options = {}) => {
      const b = await launch(viewport, options);
      opened.push(b);
      return b.page;
    },
    closeAll: async () => {
      for (const b of opened.splice(0)) await b.close();
    },
  };
}

/** Waits until every island on the page has hydrated. */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForLoadState('load');
  // Islands that hydrate when in view (client:visible): scroll through them as a camper would, then back.
  const lazy = await page.locator('astro-island[ssr][client="visible"]').elementHandles();
  if (lazy.length > 0) {
    const y = await page.evaluate(() => window.scrollY);
    for (const el of lazy) {
      await el.scrollIntoViewIfNeeded().catch(() => undefined);
      await page.waitForFunction((island) => !(island as Element).isConnected || !(island as Element).hasAttribute('ssr'), el, { timeout: 15_000 });
    }
    await page.evaluate((top) => window.scrollTo(0, top), y);
  }
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0, undefined, { timeout: 15_000 });
}

/** Saves a full-page screenshot under test-results/screenshots (git-ignored). */
export async function shot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const file = path.join(SCREENSHOTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Signs out the way a camper does: opens the account menu in the header and presses Sign out. */
export async function signOut(page: Page): Promise<void> {
  await page.locator('#account-menu > summary').click();
  await page.getByRole('button', { name: 'Sign out' }).click();
}

/**
 * Signs in through the sign-in form as a camper does, asking to land on `next` (default /trips),
 * and waits until that page (its path, without query or hash) has loaded and hydrated.
 */
export async function signIn(page: Page, email: string, password: string, next = '/trips'): Promise<void> {
  await page.goto(`${inject('baseUrl')}/sign-in?next=${encodeURIComponent(next)}`);
  await hydrated(page);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  const want = next.split('?')[0]!.split('#')[0];
  await page.waitForURL((u) => u.pathname === want);
  await hydrated(page);
}

/** axe's serious and critical findings on the page, one line each (rule, impact, help, first nodes). */
export async function seriousViolations(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page }).analyze();
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(' | ')}`);
}
