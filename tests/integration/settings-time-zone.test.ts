import { describe, expect, it } from 'vitest';
import { api, signUp, uniqueEmail } from '../helpers/api';
import { activeCrew, inviteToken } from '../helpers/crew';
import { dbGet } from '../helpers/fixtures';

// The user's time zone (migration 0016): chosen in Settings, or this browser's own zone sent once.
// App-event times on every page are then formatted in it on the server, so the HTML already says
// what the browser will show.

const zoneOf = (userId: string) => dbGet<{ timeZone: string | null }>('select "timeZone" from "user" where id = ?', userId)?.timeZone;

describe('the user time zone setting', () => {
  it('is empty for a new account, and the browser’s zone fills it once without overwriting a choice', async () => {
    const me = await signUp();
    expect(zoneOf(me.userId)).toBeNull();

    let res = await api('/api/settings', { method: 'PATCH', session: me, json: { deviceTimeZone: 'America/Vancouver' } });
    expect(res.status).toBe(200);
    expect((await res.json()).timeZone).toBe('America/Vancouver');
    expect(zoneOf(me.userId)).toBe('America/Vancouver');

    // Another device (or a stale tab) on another zone does not move it: only a choice in Settings does.
    res = await api('/api/settings', { method: 'PATCH', session: me, json: { deviceTimeZone: 'Europe/Berlin' } });
    expect((await res.json()).timeZone).toBe('America/Vancouver');
    res = await api('/api/settings', { method: 'PATCH', session: me, json: { timeZone: 'Pacific/Auckland' } });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ timeZone: 'Pacific/Auckland' });
    expect(zoneOf(me.userId)).toBe('Pacific/Auckland');
  });

  it.each([
    [{ timeZone: 'Mars/Olympus_Mons' }, 'timeZone', 'Choose a time zone from the list, such as America/Vancouver.'],
    [{ timeZone: 42 }, 'timeZone', 'must be text'],
    [{ deviceTimeZone: 'Nowhere/At_All' }, 'deviceTimeZone', 'This device sent a time zone the server does not know.'],
  ])('refuses %j with 400 naming %s, and stores nothing', async (body, path, message) => {
    const me = await signUp();
    const res = await api('/api/settings', { method: 'PATCH', session: me, json: body });
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toContainEqual({ path, message });
    expect(zoneOf(me.userId)).toBeNull();
  });

  it('formats a saved forecast’s time in the stored zone in the server’s HTML', async () => {
    const me = await signUp();
    const rig = await api('/api/rigs', {
      method: 'POST',
      session: me,
      json: { name: 'Zone van', bank: { chemistry: 'lifepo4', capacityAh: 200, nominalVolts: 12.8 } },
    }).then((r) => r.json());
    const trip = await api('/api/trips', {
      method: 'POST',
      session: me,
      json: {
        rigId: rig.id,
        name: 'Zone trip',
        stops: [{ name: 'Mesa camp', lat: 36.1, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-20', nights: 1 }],
      },
    }).then((r) => r.json());
    const saved = await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: me, json: {} }).then((r) => r.json());
    await api('/api/settings', { method: 'PATCH', session: me, json: { timeZone: 'Asia/Kolkata' } });
    const html = await (await api(`/trips/${trip.id}/forecasts/${saved.id}`, { session: me })).text();
    // Kolkata is UTC+05:30 all year (IANA tz database): the saved instant shown there, computed here by hand.
    const t = new Date(Date.parse(saved.createdAt) + 330 * 60_000);
    const days = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
    const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
    const p = (n: number) => String(n).padStart(2, '0');
    const want = `${days[t.getUTCDay()]} ${t.getUTCDate()} ${months[t.getUTCMonth()]}, ${p(t.getUTCHours())}:${p(t.getUTCMinutes())}`;
    expect(html.match(/saved <time[^<]*<\/time>/)?.[0]).toBe(`saved <time dateTime="${saved.createdAt}">${want}</time>`);
  });

  it('shows an invitation’s expiry in the signed-in visitor’s zone, and in UTC, said so, to anyone else', async () => {
    const owner = await signUp();
    const email = uniqueEmail('invitee');
    const token = await inviteToken(owner, (await activeCrew(owner)).id, email, 'viewer');
    const expiresAt = dbGet<{ expires_at: string }>('select expires_at from invitations where email = ?', email)?.expires_at;
    expect(expiresAt).toBeTruthy();
    const anonymous = await (await api(`/invite/${token}`)).text();
    const utc = new Date(String(expiresAt));
    const days = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
    const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
    const p = (n: number) => String(n).padStart(2, '0');
    const day = (t: Date) =>
      `${days[t.getUTCDay()]} ${t.getUTCDate()} ${months[t.getUTCMonth()]} ${t.getUTCFullYear()}, ${p(t.getUTCHours())}:${p(t.getUTCMinutes())}`;
    expect(anonymous).toContain(`The link works once, until ${day(utc)} UTC.`);
    // A signed-in visitor in Kolkata (UTC+05:30 all year) reads it in their own zone, named.
    await api('/api/settings', { method: 'PATCH', session: owner, json: { timeZone: 'Asia/Kolkata' } });
    const signedIn = await (await api(`/invite/${token}`, { session: owner })).text();
    expect(signedIn).toContain(`The link works once, until ${day(new Date(utc.getTime() + 330 * 60_000))} Kolkata time (UTC+05:30).`);
  });
});
