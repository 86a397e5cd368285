import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { browserPool, hydrated, SCREENSHOTS, seriousViolations, shot, signIn } from '../helpers/browser';
import { addMember, createLoad, createRig, personalCrewId } from '../helpers/fixtures';
import { waitForMail } from '../helpers/mail';
import { demoPlan } from '../../src/engine';
import { watchedTripInput } from '../../scripts/seed-demo';

// The trip watch as the demo shows it: the camper van's trip a week from today (the demo's own
// watched trip, no typed weather), run by the watch on the fake's normal weather, then the weather
// turned on /dev and the watch run again — the trip page tells the new answer with the cutoff in the
// stop's local time, and the crew's owner gets one e-mail saying the same.

const PASSWORD = 'watch-the-sky-27';
const ZONE = 'America/Mazatlan';

interface WatchBody {
  notice: { verdict: string; previousVerdict: string | null; forecastId: string } | null;
  runs: { forecastId: string; verdict: string; firstCutoffAt: string | null; changed: boolean }[];
}

/** "Tue 15 Dec, 02:00" for an instant, worked out here from the zone's own clock (Intl), not the app's formatter. */
function wallClock(ms: number, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone,
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)!.value;
  return `${get('weekday')} ${get('day')} ${get('month')}, ${get('hour')}:${get('minute')}`;
}

async function fakeTurn(mode: 'normal' | 'storm'): Promise<void> {
  const r = await fetch(`${inject('weatherUrl')}/__fake/turn`, { method: 'POST', body: JSON.stringify({ mode }) });
  expect(r.status).toBe(200);
}

describe('trip watch: the weather turns and the crew is told', () => {
  const pool = browserPool();
  let camper: Session;
  let tripId: string;
  let page: Page;
  const hydrationErrors: string[] = [];

  beforeAll(async () => {
    await fakeTurn('normal');
    camper = await signUp({ name: 'Watch Camper', password: PASSWORD });
    const plan = demoPlan();
    const rig = await createRig(camper, {
      name: 'Camper van (6.1 m)',
      bank: plan.bank,
      arrays: plan.arrays,
      chargers: plan.chargers,
      inverter: plan.inverter,
    });
    for (const load of plan.loads ?? []) await createLoad(camper, rig.id, { ...load, standby: load.name === 'Parasitic draw' });
    const res = await api('/api/trips', { method: 'POST', session: camper, json: watchedTripInput(rig.id) });
    expect(res.status).toBe(201);
    tripId = ((await res.json()) as { id: string }).id;
    page = await pool.open('desktop', { timezoneId: 'Europe/Berlin' });
    // React's hydration mismatches (#418 and its kin) land in the console: the panel must cause none.
    page.on('console', (m) => {
      if (m.type() === 'error' && /hydrat|#418|#425|#423/i.test(m.text())) hydrationErrors.push(m.text());
    });
    await signIn(page, camper.email, PASSWORD, '/dev');
  });
  afterAll(async () => {
    await fakeTurn('normal');
    await pool.closeAll();
  });

  const watchOf = async (): Promise<WatchBody> =>
    (await (await api(`/api/trips/${tripId}/watch`, { session: camper })).json()) as WatchBody;

  async function runWatchFromDev(): Promise<string> {
    await page.goto(`${baseUrl()}/dev`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Run the watch now' }).click();
    const result = page.getByTestId('dev-tick-result');
    await result.waitFor({ timeout: 45_000 });
    return (await result.textContent()) ?? '';
  }

  it('runs the watch on the normal weather: one run, the van makes it, nothing to tell', async () => {
    expect(await runWatchFromDev()).toMatch(/^Forecast \d+ trips? again;/);
    const w = await watchOf();
    expect(w.runs.map((r) => r.verdict)).toEqual(['makes-it']);
    expect(w.notice).toBeNull();

    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    const panel = page.getByTestId('trip-watch');
    await panel.waitFor();
    expect(await panel.getByTestId('watch-notice').count()).toBe(0);
    expect(
      await panel
        .getByTestId('watch-stretches')
        .locator('li')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-verdict'))),
    ).toEqual(['makes-it']);
    // The mark (✓, hidden from screen readers) stands beside the words, never instead of them.
    expect(await panel.getByTestId('watch-stretches').textContent()).toMatch(/^✓Makes it, lowest \d+ % · 1 run, /);
    expect(await panel.getByRole('switch', { name: 'Watch this trip' }).getAttribute('aria-checked')).toBe('true');
  });

  it('turns the weather on /dev, runs the watch again, and the trip page tells the new answer with the local cutoff', async () => {
    await page.goto(`${baseUrl()}/dev`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Turn the weather' }).click();
    await expect.poll(() => page.getByTestId('dev-weather-now').textContent()).toMatch(/forecasts a storm on every day/);
    const said = await runWatchFromDev();
    expect(said).toMatch(/[1-9]\d* answers? changed/);
    await shot(page, 'dev-controls-desktop');
    expect(await seriousViolations(page)).toEqual([]);

    const w = await watchOf();
    expect(w.runs.map((r) => r.verdict)).toEqual(['makes-it', 'runs-out']);
    const last = w.runs[1]!;
    expect(last.changed).toBe(true);
    expect(w.notice).toMatchObject({ verdict: 'runs-out', previousVerdict: 'makes-it', forecastId: last.forecastId });
    // The cutoff is a row time in the stop's own offset; Mazatlán keeps UTC−07:00 all year.
    expect(last.firstCutoffAt).toMatch(/-07:00$/);
    const local = wallClock(Date.parse(last.firstCutoffAt!), ZONE);

    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    const notice = page.getByTestId('watch-notice');
    await notice.waitFor();
    expect(await notice.getByRole('heading').textContent()).toBe('The answer changed: runs out, no longer makes it');
    // The browser is in Berlin; the cutoff is still told in the stop's local time.
    expect(await notice.getByTestId('watch-notice-cutoff').textContent()).toBe(`Cutoff: ${local} (UTC−07:00), local time at the stop.`);
    expect(
      await page
        .getByTestId('watch-stretches')
        .locator('li')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-verdict'))),
    ).toEqual(['makes-it', 'runs-out']);
    const link = notice.getByRole('link', { name: 'Open the watch forecast' });
    expect(await link.getAttribute('href')).toBe(`/trips/${tripId}/forecasts/${last.forecastId}`);

    // One e-mail to the crew's owner, with the same cutoff in the stop's local time.
    const [mail, ...more] = await waitForMail(camper.email, { timeoutMs: 20_000 });
    expect(more).toHaveLength(0);
    expect(mail!.subject).toMatch(/^Winter sun at Cardón Flat \(watched\): Runs out /);
    expect(mail!.text_body).toContain(`Cutoff: ${local} local time at Cardón Flat (Mazatlan time, UTC−07:00).`);
    expect(mail!.text_body).toContain(`${baseUrl()}/trips/${tripId}`);

    await page.getByTestId('trip-watch').scrollIntoViewIfNeeded();
    await shot(page, 'trip-watch-desktop');
    expect(hydrationErrors).toEqual([]);
    await page.getByTestId('trip-watch').screenshot({ path: path.join(SCREENSHOTS, 'trip-watch-panel-desktop.png') });
    expect(await seriousViolations(page)).toEqual([]);
  });

  it('says when the watch starts for a trip still outside its window', async () => {
    const rigs = (await (await api('/api/rigs', { session: camper })).json()) as { id: string }[];
    const input = watchedTripInput(rigs[0]!.id, new Date(Date.now() + 12 * 86_400_000));
    // Arriving in 18 days: watched by default (within 21 days) but the watch starts 16 days before arrival, in 2 days.
    const res = await api('/api/trips', { method: 'POST', session: camper, json: { ...input, name: 'Later at Cardón Flat' } });
    expect(res.status).toBe(201);
    const later = ((await res.json()) as { id: string }).id;
    const arrive = input.stops[0]!.arrive;
    const start = new Date(Date.parse(`${arrive}T12:00:00Z`) - 16 * 86_400_000);
    const startWords = new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short' })
      .format(start)
      .replace(',', '');
    await page.goto(`${baseUrl()}/trips/${later}`);
    await hydrated(page);
    const status = page.getByTestId('watch-status');
    await status.waitFor();
    expect(await status.textContent()).toBe(`The watch starts 16 days before you arrive: on ${startWords}.`);
    expect(await page.getByTestId('watch-timeline').count()).toBe(0);
    await page.getByTestId('trip-watch').screenshot({ path: path.join(SCREENSHOTS, 'trip-watch-panel-waiting.png') });
  });

  it('shows a viewer of the crew the same panel on a phone, with "Follow by e-mail" instead of the on/off switch', async () => {
    const viewer = await signUp({ name: 'Watch Viewer', password: PASSWORD });
    addMember(personalCrewId(camper.userId), viewer.userId, 'viewer');
    const phone = await pool.open('phone', { timezoneId: 'America/Mazatlan' });
    await signIn(phone, viewer.email, PASSWORD, `/trips/${tripId}`);
    const panel = phone.getByTestId('trip-watch');
    await panel.waitFor();
    await panel.getByTestId('watch-notice').waitFor();
    expect(await panel.getByRole('switch', { name: 'Watch this trip' }).count()).toBe(0);
    const follow = panel.getByRole('switch', { name: 'Follow by e-mail' });
    expect(await follow.getAttribute('aria-checked')).toBe('false');
    await follow.click();
    await expect.poll(() => follow.getAttribute('aria-checked')).toBe('true');
    expect(((await (await api(`/api/trips/${tripId}/watch`, { session: viewer })).json()) as { following: boolean }).following).toBe(true);
    const box = await panel.boundingBox();
    // Nothing of the panel spills past the phone's 390 px.
    expect(box!.x + box!.width).toBeLessThanOrEqual(390);
    await panel.scrollIntoViewIfNeeded();
    await shot(phone, 'trip-watch-phone');
    await panel.screenshot({ path: path.join(SCREENSHOTS, 'trip-watch-panel-phone.png') });
    expect(await seriousViolations(phone)).toEqual([]);

    await phone.goto(`${baseUrl()}/dev`);
    await hydrated(phone);
    await phone.getByTestId('dev-weather-now').waitFor();
    await shot(phone, 'dev-controls-phone');
    expect(await seriousViolations(phone)).toEqual([]);
  });

  it('goes back to normal on /dev: the next run tells the better answer on the page, and no second e-mail goes within 12 hours', async () => {
    await page.goto(`${baseUrl()}/dev`);
    await hydrated(page);
    await page.getByRole('button', { name: 'Back to normal' }).click();
    await expect
      .poll(() => page.getByTestId('dev-weather-now').textContent())
      .toBe('The local fake weather service forecasts its normal weather.');
    expect(await runWatchFromDev()).toMatch(/[1-9]\d* answers? changed/);
    const w = await watchOf();
    expect(w.runs.map((r) => r.verdict)).toEqual(['makes-it', 'runs-out', 'makes-it']);
    expect(w.notice).toMatchObject({ verdict: 'makes-it', previousVerdict: 'runs-out', forecastId: w.runs[2]!.forecastId });
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    const notice = page.getByTestId('watch-notice');
    await notice.waitFor();
    expect(await notice.getByRole('heading').textContent()).toBe('The answer changed: makes it, no longer runs out');
    expect(await notice.textContent()).toContain('better than before');
    // Still the one e-mail of the first change (at most one per person and trip in 12 hours).
    await new Promise((r) => setTimeout(r, 1500));
    expect(await waitForMail(camper.email)).toHaveLength(1);
  });

  it('says on the trip page when a run could not get the weather, and keeps the last answer', async () => {
    const mode = await fetch(`${inject('weatherUrl')}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode: 'fail' }) });
    expect(mode.status).toBe(200);
    try {
      // Turning the weather forgets the cached forecasts, so the run has to ask the (failing) service.
      await page.goto(`${baseUrl()}/dev`);
      await hydrated(page);
      await page.getByRole('button', { name: 'Turn the weather' }).click();
      await expect.poll(() => page.getByTestId('dev-weather-now').textContent()).toMatch(/forecasts a storm/);
      await runWatchFromDev();
    } finally {
      await fetch(`${inject('weatherUrl')}/__fake/reset`, { method: 'POST' });
    }
    const w = await watchOf();
    expect(w.runs).toHaveLength(3);
    expect(w.notice).toMatchObject({ verdict: 'makes-it' });
    await page.goto(`${baseUrl()}/trips/${tripId}`);
    await hydrated(page);
    const error = page.getByTestId('watch-error');
    await error.waitFor();
    expect(await error.textContent()).toMatch(
      /^The last run could not finish: .+ The answer below still stands until the next run succeeds\.$/,
    );
    expect(await page.getByTestId('watch-notice').getByRole('heading').textContent()).toBe(
      'The answer changed: makes it, no longer runs out',
    );
    await page.getByTestId('trip-watch').screenshot({ path: path.join(SCREENSHOTS, 'trip-watch-panel-error.png') });
  });
});
