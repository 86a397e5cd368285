import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { browserPool, hydrated, SCREENSHOTS, shot, type ViewportName } from '../helpers/browser';
import { activeCrew } from '../helpers/crew';
import { demoPlan } from '../../src/engine';
import { TEST_PRICES } from '../helpers/prices';

// The proposal as a document an installer hands over: company block and quote number on page 1,
// the cable check as rows of the parts table with each run drawn, labour, tax and total, at
// 390 and 1280 px; printed through Chromium's PDF to at most two Letter or A4 pages; the installer
// lands on their own page after signing in.

const PASSWORD = 'quote-and-cable-31';

async function signIn(page: Page, email: string, next?: string) {
  await page.goto(`${baseUrl()}/sign-in${next ? `?next=${encodeURIComponent(next)}` : ''}`);
  await hydrated(page);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

async function serious(page: Page): Promise<string[]> {
  const r = await new AxeBuilder({ page }).analyze();
  return r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(' | ')}`);
}

/** Pages in a PDF: its page objects (Chromium writes one `/Type /Page` per page). */
function pdfPages(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
}

describe('a proposal as a document, on screen and on paper', () => {
  let owner: Session;
  let installer: Session;
  let proposalId: string;
  const browsers = browserPool();
  const open = browsers.open;
  beforeAll(async () => {
    owner = await signUp({ name: 'Halvard', password: PASSWORD });
    const crewId = (await activeCrew(owner)).id;
    // The invented demo van and its late-October trip (src/engine/demo-plan.ts, as the demo seed makes them).
    const plan = demoPlan();
    const rigRes = await api('/api/rigs', { method: 'POST', session: owner, json: { crewId, name: 'Camper van (6.1 m)', bank: plan.bank, arrays: plan.arrays, chargers: plan.chargers, inverter: plan.inverter } });
    expect(rigRes.status).toBe(201);
    const rig = (await rigRes.json()) as { id: string };
    for (const load of plan.loads ?? []) {
      expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: { ...load, standby: load.name === 'Parasitic draw' } })).status).toBe(201);
    }
    const tripRes = await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'High desert loop, late October', stops: plan.stops, drives: plan.drives, reserveSocPct: 20 } });
    expect(tripRes.status).toBe(201);
    const tripId = ((await tripRes.json()) as { id: string }).id;
    const f = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'First look' } });
    const forecastId = ((await f.json()) as { id: string }).id;
    installer = await signUp({ kind: 'installer', name: 'Sable Okonkwo', password: PASSWORD });
    await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } });
    await api('/api/installer/rigs', { session: installer });
    const prices = { ...TEST_PRICES, wiring: { cablePerMm2M: 0.42, fuse: 24, busBars: 58 } };
    const created = await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { bank: { chemistry: 'lifepo4', capacityAh: 400 }, panel: { watts: 200, mounting: 'portable' } }, prices } });
    expect(created.status).toBe(201);
    const p = (await created.json()) as { id: string; version: number; document: Record<string, unknown> };
    proposalId = p.id;
    const patched = await api(`/api/proposals/${p.id}`, {
      method: 'PATCH',
      session: installer,
      json: {
        version: p.version,
        notes: 'The new bank sits where the old one was; the controller goes beside it.',
        document: {
          ...p.document,
          company: 'Okonkwo Mobile Electric',
          contactName: 'Sable Okonkwo',
          phone: '555 0142',
          email: 'quotes@okonkwo.example',
          address: '14 Quarry Road, Lone Pine',
          licence: 'RV-EL 20931',
          taxRatePct: 7.5,
          terms: 'Half on acceptance, the rest on handover. Parts carry their makers’ warranties; our work is guaranteed for two years.',
          labour: [{ name: 'Fit the new bank, main feed and fuse', hours: 3, rate: 95 }, { name: 'Fit the portable panel’s socket and controller, run the cable', hours: 2, rate: 95 }],
          removals: [{ name: 'Old 300 Ah LiFePO4 bank, traded in', kind: 'trade-in', amount: 450 }],
        },
      },
    });
    expect(patched.status).toBe(200);
  });
  afterAll(async () => {
    await browsers.closeAll();
  });

  it('signs an installer in to their own page, not the Trips page', async () => {
    const page = await open('phone');
    await signIn(page, installer.email);
    await page.waitForURL((u) => u.pathname === '/installer');
    await hydrated(page);
    await page.locator('[data-shared-rig="Camper van (6.1 m)"]').waitFor();
    await page.locator(`a[href="/proposals/${proposalId}"]`).waitFor();
    expect(await page.getByRole('link', { name: 'New trip' }).count()).toBe(0);
    expect(await serious(page)).toEqual([]);
    await shot(page, 'installer-landing-phone');
  });

  it.each(['phone', 'desktop'] as ViewportName[])('shows the document at %s width: who quotes, the quote number, each run drawn in the parts table, labour and tax', async (viewport) => {
    const page = await open(viewport);
    await signIn(page, installer.email, `/proposals/${proposalId}`);
    await page.waitForURL((u) => u.pathname === `/proposals/${proposalId}`);
    await hydrated(page);
    await page.getByTestId('document-head').waitFor();
    expect(await page.getByTestId('installer-block').textContent()).toMatch(/Okonkwo Mobile Electric.*Sable Okonkwo.*555 0142.*RV-EL 20931/s);
    expect(await page.getByTestId('quote-number').textContent()).toMatch(/^Q-\d{4}-001$/);
    const table = page.getByTestId('parts-table');
    expect(await table.getByTestId('run-sketch').count()).toBe(2);
    expect(await table.textContent()).toMatch(/Fit the new bank.*Old 300 Ah LiFePO4 bank, traded in \(trade-in, a credit\)/s);
    expect(await page.getByTestId('run-basis').first().textContent()).toMatch(/^Sized for /);
    expect(await page.getByTestId('tax').textContent()).toMatch(/^\$/);
    expect(await page.getByTestId('cautions').textContent()).toMatch(/qualified electrician decide/);
    expect(await serious(page)).toEqual([]);
    await page.getByTestId('parts-table').scrollIntoViewIfNeeded();
    await shot(page, `proposal-document-${viewport}`);
    // Close-ups to look at: the head of the document and the quote with its drawn runs.
    await page.locator('article header').screenshot({ path: path.join(SCREENSHOTS, `proposal-head-${viewport}.png`) });
    await page.locator('section:has([data-testid="parts-table"])').screenshot({ path: path.join(SCREENSHOTS, `proposal-quote-${viewport}.png`) });
    await page.getByTestId('draft-editor').screenshot({ path: path.join(SCREENSHOTS, `proposal-editor-${viewport}.png`) });
  });

  it('prints to at most two pages on Letter and on A4, with the installer block on page 1 and no status chip', async () => {
    const page = await open('desktop');
    await signIn(page, installer.email, `/proposals/${proposalId}`);
    await page.waitForURL((u) => u.pathname === `/proposals/${proposalId}`);
    await hydrated(page);
    await page.getByTestId('document-head').waitFor();
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByTestId('proposal-status').isVisible()).toBe(false);
    expect(await page.getByTestId('installer-block').isVisible()).toBe(true);
    const out = path.join(SCREENSHOTS, 'pdf');
    mkdirSync(out, { recursive: true });
    for (const format of ['Letter', 'A4'] as const) {
      const pdf = await page.pdf({ format, printBackground: true });
      const file = path.join(out, `proposal-${format}.pdf`);
      writeFileSync(file, pdf);
      expect(pdfPages(pdf), `${format} pages`).toBeGreaterThanOrEqual(1);
      expect(pdfPages(pdf), `${format} pages`).toBeLessThanOrEqual(2);
      // Pictures of the pages to look at (pdftoppm from poppler-utils, when installed).
      if (existsSync('/usr/bin/pdftoppm')) execFileSync('/usr/bin/pdftoppm', ['-png', '-r', '60', file, path.join(out, `proposal-${format}`)]);
    }
    // Page 1 holds the installer block: it sits above the fold of a Letter page in print layout.
    const box = await page.getByTestId('installer-block').boundingBox();
    expect(box!.y).toBeLessThan(900);
    await page.emulateMedia({ media: 'screen' });
  });
});
