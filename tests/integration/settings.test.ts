import { describe, expect, it } from 'vitest';
import { api, openTestDb, signUp } from '../helpers/api';

describe('PATCH /api/settings', () => {
  it('answers 401 to an anonymous visitor', async () => {
    const res = await api('/api/settings', { method: 'PATCH', json: { units: 'imperial' } });
    expect(res.status).toBe(401);
    expect((await res.json()).error.code).toBe('unauthorized');
  });

  it('switches units and renames the signed-in user, and only them', async () => {
    const me = await signUp({ name: 'Ada Camper' });
    const other = await signUp({ name: 'Other Camper' });
    const res = await api('/api/settings', { method: 'PATCH', session: me, json: { units: 'imperial', name: '  Ada R.  ' } });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ name: 'Ada R.', units: 'imperial', timeZone: null });
    const db = openTestDb();
    const rows = db.prepare('select id, name, units from user where id in (?, ?)').all(me.userId, other.userId) as { id: string; name: string; units: string }[];
    db.close();
    expect(rows.find((r) => r.id === me.userId)).toMatchObject({ name: 'Ada R.', units: 'imperial' });
    expect(rows.find((r) => r.id === other.userId)).toMatchObject({ name: 'Other Camper', units: 'metric' });

    // The next page reads the new name and units from the session's user (units reach the island as a prop).
    const html = await (await api('/settings', { session: me })).text();
    expect(html).toContain('aria-label="Account menu for Ada R."'); // the header's account menu names the user
    expect(html).toContain('&quot;units&quot;:[0,&quot;imperial&quot;]');
  });

  it('changes one field and keeps the other', async () => {
    const me = await signUp({ name: 'Bea' });
    await api('/api/settings', { method: 'PATCH', session: me, json: { units: 'imperial' } });
    const res = await api('/api/settings', { method: 'PATCH', session: me, json: { name: 'Bea K.' } });
    expect(await res.json()).toEqual({ name: 'Bea K.', units: 'imperial', timeZone: null });
  });

  it.each([
    [{ units: 'kelvin' }, 'units', 'Choose metric or imperial.'],
    [{ name: '   ' }, 'name', 'Enter your name.'],
    [{ name: 'x'.repeat(81) }, 'name', 'Use at most 80 characters.'],
    [{}, '(body)', 'Send a name, units or time zone to change.'],
  ])('refuses %j with 400 naming %s', async (body, path, message) => {
    const me = await signUp();
    const res = await api('/api/settings', { method: 'PATCH', session: me, json: body });
    expect(res.status).toBe(400);
    const env = await res.json();
    expect(env.error.code).toBe('invalid_request');
    expect(env.issues).toContainEqual({ path, message });
  });

  it('refuses a body that is not JSON', async () => {
    const me = await signUp();
    const res = await api('/api/settings', { method: 'PATCH', session: me, body: 'units=imperial', headers: { 'content-type': 'application/x-www-form-urlencoded' } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues[0].path).toBe('(headers).content-type');
  });
});

describe('POST /api/auth/change-password (better-auth), used by the Password form on /settings', () => {
  const signInStatus = async (email: string, password: string) =>
    (await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password } })).status;

  it('answers 401 to an anonymous visitor', async () => {
    const res = await api('/api/auth/change-password', { method: 'POST', json: { currentPassword: 'correct-horse-1', newPassword: 'another-horse-2' } });
    expect(res.status).toBe(401);
  });

  it('refuses a wrong current password and a short new one, and the old password keeps working', async () => {
    const me = await signUp();
    const wrong = await api('/api/auth/change-password', { method: 'POST', session: me, json: { currentPassword: 'not-my-password', newPassword: 'another-horse-2' } });
    expect(wrong.status).toBe(400);
    expect((await wrong.json()).code).toBe('INVALID_PASSWORD');
    const short = await api('/api/auth/change-password', { method: 'POST', session: me, json: { currentPassword: 'correct-horse-1', newPassword: 'short' } });
    expect(short.status).toBe(400);
    expect((await short.json()).code).toBe('PASSWORD_TOO_SHORT');
    expect(await signInStatus(me.email, 'correct-horse-1')).toBe(200);
  });

  it('changes the password; the old one no longer signs in, and other devices are signed out when asked', async () => {
    const me = await signUp();
    const otherDevice = await api('/api/auth/sign-in/email', { method: 'POST', json: { email: me.email, password: 'correct-horse-1' } });
    const otherCookie = otherDevice.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    expect((await api('/api/settings', { method: 'PATCH', headers: { cookie: otherCookie }, json: { units: 'metric' } })).status).toBe(200);

    const res = await api('/api/auth/change-password', { method: 'POST', session: me, json: { currentPassword: 'correct-horse-1', newPassword: 'another-horse-2', revokeOtherSessions: true } });
    expect(res.status).toBe(200);
    expect(await signInStatus(me.email, 'correct-horse-1')).toBe(401);
    expect(await signInStatus(me.email, 'another-horse-2')).toBe(200);
    // The other device's session is gone; the one that made the change carries a fresh session cookie.
    expect((await api('/api/settings', { method: 'PATCH', headers: { cookie: otherCookie }, json: { units: 'metric' } })).status).toBe(401);
    const fresh = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    expect((await api('/api/settings', { method: 'PATCH', headers: { cookie: fresh || me.cookie }, json: { units: 'metric' } })).status).toBe(200);
  });
});
