import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher, type MailCatcher } from '../../src/server/mail-catcher';
import { startFakeWeather, turnFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';
import { uniqueEmail } from '../helpers/api';
import { caughtFor, headerIn, linkIn, waitForMail, type Caught } from '../helpers/mail';
import { cleanup, freePort, startServer, type RunningServer } from '../helpers/server';
import { openTestDb } from '../helpers/test-db';
import type { TripWatch } from '../../src/domain/watch/view';

// The trip watch on the built server: two instances over one database (SQLite here, PostgreSQL in
// `npm run test:integration:pg`), their own fake weather service and mail catcher. Ticks are driven
// through POST /api/dev/watch/tick with a clock that moves forward hours at a time, so nothing waits
// for real time; the fake's "turn the weather" control makes the forecast change.

let a: RunningServer;
let b: RunningServer;
let catcher: MailCatcher;
let weather: FakeWeather;
let dbPath: string;

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
/** The tick's clock: starts now and only moves forward (the weather cache's age is read on it). */
let clock = Date.now();
const advance = (hours: number) => new Date((clock += hours * HOUR)).toISOString();

interface Who {
  cookie: string;
  userId: string;
  email: string;
}

type WatchBody = TripWatch;

async function call(server: RunningServer, path: string, init: { method?: string; who?: Who; json?: unknown } = {}): Promise<Response> {
  const headers: Record<string, string> = { origin: server.url };
  if (init.who) headers.cookie = init.who.cookie;
  if (init.json !== undefined) headers['content-type'] = 'application/json';
  return fetch(`${server.url}${path}`, { method: init.method ?? 'GET', headers, body: init.json === undefined ? undefined : JSON.stringify(init.json), redirect: 'manual' });
}

async function signUp(name: string): Promise<Who> {
  const email = uniqueEmail('watch');
  const res = await call(a, '/api/auth/sign-up/email', { method: 'POST', json: { name, email, password: 'trip-watch-pass-1', kind: 'camper' } });
  expect(res.status, await res.clone().text()).toBe(200);
  const body = (await res.json()) as { user: { id: string } };
  return { cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), userId: body.user.id, email };
}

function crewOf(userId: string): string {
  const db = openTestDb({ where: dbPath });
  try {
    return (db.prepare("select crew_id from crew_members where user_id = ? and role = 'owner'").get(userId) as { crew_id: string }).crew_id;
  } finally {
    db.close();
  }
}

function join(crewId: string, who: Who, role: 'editor' | 'viewer'): void {
  const db = openTestDb({ where: dbPath, write: true });
  try {
    db.prepare('insert into crew_members (crew_id, user_id, role, created_at, version) values (?, ?, ?, ?, 1)').run(crewId, who.userId, role, new Date().toISOString());
  } finally {
    db.close();
  }
}

let place = 0;
/**
 * A crew's rig (100 Ah LiFePO4, 300 W of panel, a fridge) and a trip starting two
 * days (or `arriveInDays`) from the clock at a place of its own (its own weather cache rows).
 */
async function watchedTrip(owner: Who, arriveInDays = 2): Promise<string> {
  const rig = await call(a, '/api/rigs', {
    method: 'POST',
    who: owner,
    json: {
      name: 'Watch van',
      bank: { chemistry: 'lifepo4', capacityAh: 100, nominalVolts: 12.8 },
      arrays: [{ name: 'Roof', ratedWatts: 300, tiltDeg: 0, azimuthDeg: 180, controller: 'mppt' }],
    },
  });
  expect(rig.status, await rig.clone().text()).toBe(201);
  const rigId = ((await rig.json()) as { id: string }).id;
  for (const load of [{ name: 'Compressor fridge', watts: 45, dutyPct: 40 }]) {
    const r = await call(a, `/api/rigs/${rigId}/loads`, { method: 'POST', who: owner, json: load });
    expect(r.status, await r.clone().text()).toBe(201);
  }
  place += 1;
  const arrive = new Date(clock + arriveInDays * DAY).toISOString().slice(0, 10);
  const trip = await call(a, '/api/trips', {
    method: 'POST',
    who: owner,
    json: { rigId, name: `Desert loop ${place}`, stops: [{ name: `Wash camp ${place}`, lat: 33.1 + place * 0.3, lon: -112.4, timeZone: 'America/Phoenix', arrive, nights: 4 }] },
  });
  expect(trip.status, await trip.clone().text()).toBe(201);
  return ((await trip.json()) as { id: string }).id;
}

async function tick(server: RunningServer, now: string): Promise<{ ran: number; changed: number; mailed: number }> {
  const res = await call(server, '/api/dev/watch/tick', { method: 'POST', json: { now } });
  expect(res.status, await res.clone().text()).toBe(200);
  return (await res.json()) as { ran: number; changed: number; mailed: number };
}

async function watchOf(tripId: string, who: Who): Promise<WatchBody> {
  const res = await call(a, `/api/trips/${tripId}/watch`, { who });
  expect(res.status, await res.clone().text()).toBe(200);
  return (await res.json()) as WatchBody;
}

async function setWatch(tripId: string, who: Who, enabled: boolean): Promise<void> {
  const res = await call(a, `/api/trips/${tripId}/watch`, { method: 'PUT', who, json: { enabled } });
  expect(res.status, await res.clone().text()).toBe(200);
}

function watchMails(to: string): Caught[] {
  return caughtFor(to, dbPath).filter((m) => m.text_body.includes('changed with the latest weather'));
}

/** Mail is sent by the outbox after the tick answers: waits for `count`, then a little longer to see that no more arrive. */
async function settledMails(to: string, count: number): Promise<Caught[]> {
  if (count > 0) await waitForMail(to, { count, dbPath, timeoutMs: 15_000 });
  await new Promise((r) => setTimeout(r, 600));
  return watchMails(to);
}

function outboxRows(to: string): number {
  const db = openTestDb({ where: dbPath });
  try {
    return (db.prepare("select id from outbox where to_address = ? and kind = 'trip-watch'").all(to) as unknown[]).length;
  } finally {
    db.close();
  }
}

beforeAll(async () => {
  weather = await startFakeWeather({ quiet: true });
  const port = await freePort();
  const env = { SMTP_URL: `smtp://127.0.0.1:${port}`, OUTBOX_RETRY_BASE_MS: '200', WEATHER_FORECAST_URL: weather.forecastUrl, WEATHER_ARCHIVE_URL: weather.archiveUrl };
  a = await startServer(env);
  dbPath = a.dbPath;
  catcher = await startMailCatcher({ dbPath, port, quiet: true });
  b = await startServer(env, { dir: a.dir, dbPath });
}, 180_000);

afterAll(async () => {
  await b?.stop();
  await a?.stop();
  await catcher?.stop();
  await weather?.stop();
  if (a) cleanup(a.dir);
});

describe('trip watch', () => {
  it('mails a change that matters once, to owners, editors and followers, and an unchanged answer not at all', async () => {
    const owner = await signUp('Rosa Owner');
    const editor = await signUp('Eli Editor');
    const follower = await signUp('Vik Follower');
    const viewer = await signUp('Noor Viewer');
    const crewId = crewOf(owner.userId);
    join(crewId, editor, 'editor');
    join(crewId, follower, 'viewer');
    join(crewId, viewer, 'viewer');
    const tripId = await watchedTrip(owner);

    const before = await watchOf(tripId, follower);
    expect(before).toMatchObject({ enabled: true, defaultOn: true, canToggle: false, following: false, notice: null, runs: [] });
    const follow = await call(a, `/api/trips/${tripId}/watch/follow`, { method: 'PUT', who: follower, json: { following: true } });
    expect(follow.status).toBe(200);
    expect(((await follow.json()) as WatchBody).following).toBe(true);

    await turnFakeWeather(weather.url, 'normal');
    // The first run is the answer the crew sees: nothing to compare with, nothing told.
    expect(await tick(a, advance(0))).toEqual({ ran: 1, changed: 0, mailed: 0 });
    // Not due again within the interval (6 hours).
    expect(await tick(b, advance(1))).toEqual({ ran: 0, changed: 0, mailed: 0 });
    // Due again; the weather cache has gone stale (3 hours), the same weather comes back: no change.
    expect(await tick(b, advance(5))).toEqual({ ran: 1, changed: 0, mailed: 0 });
    const calm = await watchOf(tripId, owner);
    expect(calm.runs).toHaveLength(2);
    expect(calm.runs.every((r) => !r.changed)).toBe(true);
    expect(calm.notice).toBeNull();
    expect(calm.lastError).toBeNull();

    // The weather turns to a storm over the whole trip.
    await turnFakeWeather(weather.url, 'storm');
    const turned = await tick(a, advance(6));
    expect(turned).toEqual({ ran: 1, changed: 1, mailed: 3 });
    const after = await watchOf(tripId, owner);
    expect(after.runs).toHaveLength(3);
    const last = after.runs[2]!;
    expect(last.changed).toBe(true);
    expect(last.reason).toBeTruthy();
    expect(after.notice).toMatchObject({ verdict: last.verdict, previousVerdict: calm.runs[1]!.verdict, forecastId: last.forecastId });
    // In the fake's normal weather the bank makes it; under the storm's tenth of the light it does not.
    expect(calm.runs[1]!.verdict).toBe('makes-it');
    expect(last.verdict).not.toBe('makes-it');
    expect(last.reason).toContain('the verdict changed');

    const mails = await settledMails(owner.email, 1);
    expect(mails).toHaveLength(1);
    const mail = mails[0]!;
    expect(mail.subject).toContain('Desert loop');
    expect(mail.text_body).toContain('Hello Rosa Owner,');
    if (last.firstCutoffAt) {
      // The cutoff in the stop's own time: Phoenix is UTC−7 all year, and the run's row time says so.
      expect(last.firstCutoffAt).toMatch(/-07:00$/);
      expect(mail.text_body).toContain(`Cutoff: ${last.firstCutoffLocal} local time at Wash camp`);
    } else {
      expect(mail.text_body).toContain('The bank does not cut off.');
    }
    expect(mail.text_body).toMatch(/Why: the weather for \w{3} \d{1,2} \w{3} at Wash camp \d+ changed the most\./);
    expect(linkIn(mail, `${a.url}/trips/${tripId}`)).toBe(`${a.url}/trips/${tripId}`);
    expect(linkIn(mail, `${a.url}/watch/unsubscribe?token=`)).toBeTruthy();
    expect(await settledMails(editor.email, 1)).toHaveLength(1);
    expect(await settledMails(follower.email, 1)).toHaveLength(1);
    // A viewer who does not follow gets nothing.
    expect(await settledMails(viewer.email, 0)).toHaveLength(0);

    // The storm stays: the new answer is the one the crew saw, so nothing more is told.
    expect(await tick(b, advance(6))).toEqual({ ran: 1, changed: 0, mailed: 0 });
    expect(await settledMails(owner.email, 1)).toHaveLength(1);
    // The trip's own list of saved forecasts keeps to the ones people ran.
    const list = await call(a, `/api/trips/${tripId}/forecasts`, { who: owner });
    expect(await list.json()).toEqual([]);
    // A watch run is a saved forecast with its engine revision, readable by id.
    const saved = await call(a, `/api/forecasts/${last.forecastId}`, { who: viewer });
    expect(saved.status).toBe(200);
    expect(((await saved.json()) as { engineRevision: number }).engineRevision).toBe(2);

    await turnFakeWeather(weather.url, 'normal');
    await setWatch(tripId, owner, false);
  });

  it('mails one person at most once in 12 hours, and an unsubscribe link works without signing in', async () => {
    const owner = await signUp('Tam Owner');
    const tripId = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(a, advance(6))).toMatchObject({ ran: 1, changed: 0 });

    await turnFakeWeather(weather.url, 'storm');
    expect(await tick(a, advance(6))).toEqual({ ran: 1, changed: 1, mailed: 1 });
    // Six hours later the weather is back: a change, but the owner was mailed only 6 hours ago.
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(a, advance(6))).toEqual({ ran: 1, changed: 1, mailed: 0 });
    const held = await watchOf(tripId, owner);
    expect(held.notice?.forecastId).toBe(held.runs.at(-1)!.forecastId);
    // Seven hours after that (13 since the mail) the storm is back: mailed again.
    await turnFakeWeather(weather.url, 'storm');
    expect(await tick(a, advance(7))).toEqual({ ran: 1, changed: 1, mailed: 1 });
    const mails = await settledMails(owner.email, 2);
    expect(mails).toHaveLength(2);

    // The link only shows the question (mail scanners open links); the button stops the mail.
    const link = linkIn(mails[1]!, `${a.url}/watch/unsubscribe?token=`);
    const page = await fetch(link, { redirect: 'manual' });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Desert loop');
    expect(html).toContain('Stop these e-mails');
    expect((await watchOf(tripId, owner)).following).toBe(true);
    const token = new URL(link).searchParams.get('token')!;
    const done = await fetch(`${a.url}/watch/unsubscribe`, {
      method: 'POST',
      headers: { origin: a.url, 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ token }).toString(),
      redirect: 'manual',
    });
    expect(done.status).toBe(200);
    expect(await done.text()).toContain('E-mails stopped');
    expect((await watchOf(tripId, owner)).following).toBe(false);
    // A forged token is refused.
    const forged = await fetch(`${a.url}/watch/unsubscribe?token=${token.slice(0, -4)}AAAA`);
    expect(forged.status).toBe(404);

    // The next change is told on the trip page but mailed to nobody.
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(b, advance(13))).toEqual({ ran: 1, changed: 1, mailed: 0 });
    expect(await settledMails(owner.email, 2)).toHaveLength(2);

    await setWatch(tripId, owner, false);
  });

  it('names its unsubscribe address in List-Unsubscribe, and a mail program stops the e-mail with one POST to it', async () => {
    const owner = await signUp('Ren Owner');
    const tripId = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    await tick(a, advance(6));
    await turnFakeWeather(weather.url, 'storm');
    expect(await tick(a, advance(6))).toEqual({ ran: 1, changed: 1, mailed: 1 });
    const [mail] = await settledMails(owner.email, 1);
    const link = linkIn(mail!, `${a.url}/watch/unsubscribe?token=`);
    // RFC 2369: the address in angle brackets; RFC 8058: the one-click key.
    expect(headerIn(mail!, 'List-Unsubscribe')).toBe(`<${link}>`);
    expect(headerIn(mail!, 'List-Unsubscribe-Post')).toBe('List-Unsubscribe=One-Click');
    expect((await watchOf(tripId, owner)).following).toBe(true);

    // A cross-site form POST to the page without a token in its address is still refused.
    const crossSite = await fetch(`${a.url}/watch/unsubscribe`, {
      method: 'POST',
      headers: { origin: 'https://elsewhere.example', 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ token: new URL(link).searchParams.get('token')! }).toString(),
      redirect: 'manual',
    });
    expect(crossSite.status).toBe(403);
    expect((await watchOf(tripId, owner)).following).toBe(true);

    // The mail program's POST: from its own servers (no Origin of ours, no cookie), the token in the address.
    const oneClick = await fetch(link, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'List-Unsubscribe=One-Click',
      redirect: 'manual',
    });
    expect(oneClick.status).toBe(200);
    expect(await oneClick.text()).toContain('E-mails stopped');
    expect((await watchOf(tripId, owner)).following).toBe(false);
    await setWatch(tripId, owner, false);
  });

  it('mails one person at most once in 12 hours across all their trips; the other change is told on its page', async () => {
    const owner = await signUp('Kai Owner');
    const first = await watchedTrip(owner);
    const second = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    await tick(a, advance(6));
    await turnFakeWeather(weather.url, 'storm');
    await tick(a, advance(6));
    // Both trips changed in one tick: both pages tell it, one e-mail reaches the owner.
    for (const id of [first, second]) expect((await watchOf(id, owner)).notice, id).not.toBeNull();
    expect(await settledMails(owner.email, 1)).toHaveLength(1);
    expect(outboxRows(owner.email)).toBe(1);
    await setWatch(first, owner, false);
    await setWatch(second, owner, false);
  });

  it('leaves the last answer standing and mails nothing while the weather service is down', async () => {
    const owner = await signUp('Ola Owner');
    const tripId = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(a, advance(6))).toMatchObject({ ran: 1, changed: 0 });
    const standing = await watchOf(tripId, owner);

    await turnFakeWeather(weather.url, 'storm');
    const down = await fetch(`${weather.url}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode: 'fail' }) });
    expect(down.status).toBe(200);
    try {
      expect(await tick(a, advance(6))).toEqual({ ran: 0, changed: 0, mailed: 0 });
      const w = await watchOf(tripId, owner);
      expect(w.lastError).toMatch(/Weather service unreachable/);
      expect(w.runs).toEqual(standing.runs);
      expect(w.notice).toBeNull();
    } finally {
      await fetch(`${weather.url}/__fake/mode`, { method: 'POST', body: JSON.stringify({ mode: 'normal' }) });
    }
    expect(await settledMails(owner.email, 0)).toHaveLength(0);
    // Back up (with the storm): the change is told and the error cleared.
    expect(await tick(a, advance(6))).toEqual({ ran: 1, changed: 1, mailed: 1 });
    const back = await watchOf(tripId, owner);
    expect(back.lastError).toBeNull();
    expect(back.runs).toHaveLength(2);

    await turnFakeWeather(weather.url, 'normal');
    await setWatch(tripId, owner, false);
  });

  it('two instances ticking at once tell one change once', async () => {
    const owner = await signUp('Dee Owner');
    const editor = await signUp('Kai Editor');
    join(crewOf(owner.userId), editor, 'editor');
    const tripId = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(a, advance(6))).toMatchObject({ ran: 1, changed: 0 });

    await turnFakeWeather(weather.url, 'storm');
    const now = advance(6);
    const results = await Promise.all([a, b, a, b, a, b].map((s) => tick(s, now)));
    expect(results.reduce((n, r) => n + r.ran, 0)).toBe(1);
    expect(results.reduce((n, r) => n + r.changed, 0)).toBe(1);
    expect(results.reduce((n, r) => n + r.mailed, 0)).toBe(2);
    expect(outboxRows(owner.email)).toBe(1);
    expect(outboxRows(editor.email)).toBe(1);
    expect(await settledMails(owner.email, 1)).toHaveLength(1);
    expect(await settledMails(editor.email, 1)).toHaveLength(1);
    expect((await watchOf(tripId, owner)).runs).toHaveLength(2);

    await turnFakeWeather(weather.url, 'normal');
    await setWatch(tripId, owner, false);
  });

  it('compares its first run with the forecast the crew last ran themselves', async () => {
    const owner = await signUp('Ines Owner');
    const tripId = await watchedTrip(owner);
    await turnFakeWeather(weather.url, 'normal');
    const ran = await call(a, `/api/trips/${tripId}/forecasts`, { method: 'POST', who: owner });
    expect(ran.status).toBe(201);
    const theirs = (await ran.json()) as { id: string; forecast: { summary: { firstCutoffAt: string | null } } };
    expect(theirs.forecast.summary.firstCutoffAt).toBeNull();

    await turnFakeWeather(weather.url, 'storm');
    expect(await tick(a, advance(6))).toEqual({ ran: 1, changed: 1, mailed: 1 });
    const w = await watchOf(tripId, owner);
    expect(w.notice).toMatchObject({ previousVerdict: 'makes-it', forecastId: w.runs[0]!.forecastId });
    expect(w.notice!.summary).toContain(w.runs[0]!.verdict === 'runs-out' ? 'Runs out' : 'below your');
    // Their own forecast stays in the trip's list, alone.
    const list = (await (await call(a, `/api/trips/${tripId}/forecasts`, { who: owner })).json()) as { id: string }[];
    expect(list.map((f) => f.id)).toEqual([theirs.id]);

    await turnFakeWeather(weather.url, 'normal');
    await setWatch(tripId, owner, false);
  });

  it('starts a run during the trip from the latest check-in’s state of charge', async () => {
    const owner = await signUp('Ana Owner');
    // Arrived two days ago (15:00 local), four nights.
    const tripId = await watchedTrip(owner, -2);
    const at = new Date(clock - 2 * HOUR);
    for (const [when, socPct] of [[new Date(clock - 20 * HOUR), 90], [at, 35]] as const) {
      const res = await call(a, `/api/trips/${tripId}/check-ins`, { method: 'POST', who: owner, json: { id: crypto.randomUUID(), at: when.toISOString(), socPct } });
      expect(res.status, await res.clone().text()).toBe(201);
    }
    await turnFakeWeather(weather.url, 'normal');
    expect(await tick(a, advance(1))).toMatchObject({ ran: 1 });
    const run = (await watchOf(tripId, owner)).runs[0]!;
    const saved = (await (await call(a, `/api/forecasts/${run.forecastId}`, { who: owner })).json()) as {
      forecast: { hourly: { time: string; socPct: number }[]; watch: { fromCheckIn: { socPct: number; atMs: number } | null } };
    };
    expect(saved.forecast.watch.fromCheckIn).toMatchObject({ socPct: 35, atMs: at.getTime() });
    // The run starts at the check-in's hour (Phoenix keeps whole-hour offsets), not at the arrival.
    expect(Date.parse(saved.forecast.hourly[0]!.time)).toBe(Math.floor(at.getTime() / HOUR) * HOUR);
    await setWatch(tripId, owner, false);
  });

  it('lets owners and editors turn the watch off and answers 400 naming the field on bad input', async () => {
    const owner = await signUp('Pia Owner');
    const viewer = await signUp('Lou Viewer');
    join(crewOf(owner.userId), viewer, 'viewer');
    const tripId = await watchedTrip(owner);

    const refused = await call(a, `/api/trips/${tripId}/watch`, { method: 'PUT', who: viewer, json: { enabled: false } });
    expect(refused.status).toBe(403);
    for (const [path, body, field] of [
      [`/api/trips/${tripId}/watch`, { enabled: 'no' }, 'enabled'],
      [`/api/trips/${tripId}/watch`, {}, 'enabled'],
      [`/api/trips/${tripId}/watch/follow`, { following: 1 }, 'following'],
    ] as const) {
      const res = await call(a, path, { method: 'PUT', who: owner, json: body });
      expect(res.status).toBe(400);
      expect(((await res.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toContain(field);
    }
    const badNow = await call(a, '/api/dev/watch/tick', { method: 'POST', json: { now: 'tomorrow' } });
    expect(badNow.status).toBe(400);
    expect(((await badNow.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toContain('now');

    const off = await call(a, `/api/trips/${tripId}/watch`, { method: 'PUT', who: owner, json: { enabled: false } });
    expect(off.status).toBe(200);
    expect(await off.json()).toMatchObject({ enabled: false, defaultOn: true, canToggle: true, nextRunAt: null });
    // Off: the tick passes it by.
    expect(await tick(a, advance(6))).toEqual({ ran: 0, changed: 0, mailed: 0 });
    const on = await call(a, `/api/trips/${tripId}/watch`, { method: 'PUT', who: owner, json: { enabled: true } });
    const body = (await on.json()) as WatchBody;
    expect(body.enabled).toBe(true);
    expect(body.nextRunAt).not.toBeNull();
    expect(Date.parse(body.window.to) - Date.parse(body.window.from)).toBeGreaterThan(16 * DAY);
    await setWatch(tripId, owner, false);
  });
});
