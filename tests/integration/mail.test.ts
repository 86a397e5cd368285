import { openTestDb } from '../helpers/test-db';
import { describe, expect, it } from 'vitest';
import { api, baseUrl, signUp, uniqueEmail } from '../helpers/api';
import { caughtFor, linkIn, outboxFor, waitForMail, waitForSent } from '../helpers/mail';
import { cleanup, startServer } from '../helpers/server';

async function requestReset(email: string) {
  return api('/api/auth/request-password-reset', { method: 'POST', json: { email, redirectTo: '/reset-password' } });
}

function tokenOf(link: string): string {
  return new URL(link).searchParams.get('token')!;
}

describe('password reset by e-mail (better-auth flow, real SMTP catcher)', () => {
  it('mails a single-use link to /reset-password that sets a new password', async () => {
    const email = uniqueEmail('reset');
    await signUp({ email, password: 'old-password-1', name: 'Rosa' });
    const res = await requestReset(email);
    expect(res.status).toBe(200);

    const [mail] = await waitForMail(email);
    expect(mail!.subject).toBe('Reset your Sunreckon password');
    expect(mail!.text_body).toContain('Hello Rosa,');
    const link = linkIn(mail!, `${baseUrl()}/reset-password?token=`);
    const token = tokenOf(link);
    expect(token.length).toBeGreaterThan(16);
    expect(await waitForSent(email)).toMatchObject([{ status: 'sent', attempts: 1, last_error: null, kind: 'password-reset' }]);

    // The token is stored hashed, never as sent.
    const db = openTestDb();
    const plain = db.prepare('select count(*) as n from verification where identifier like ?').get(`%${token}%`) as { n: number };
    db.close();
    expect(plain.n).toBe(0);

    const page = await api(`/reset-password?token=${encodeURIComponent(token)}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Choose a new password');

    const reset = await api('/api/auth/reset-password', { method: 'POST', json: { newPassword: 'new-password-2', token } });
    expect(reset.status).toBe(200);
    const oldPw = await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password: 'old-password-1' } });
    expect(oldPw.status).toBe(401);
    const newPw = await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password: 'new-password-2' } });
    expect(newPw.status).toBe(200);

    const again = await api('/api/auth/reset-password', { method: 'POST', json: { newPassword: 'third-password-3', token } });
    expect(again.status).toBe(400);
    expect(((await again.json()) as { code: string }).code).toBe('INVALID_TOKEN');
  });

  it('refuses an expired reset link', async () => {
    const email = uniqueEmail('reset-expired');
    const s = await signUp({ email, password: 'old-password-1' });
    await requestReset(email);
    const [mail] = await waitForMail(email);
    const token = tokenOf(linkIn(mail!, `${baseUrl()}/reset-password?token=`));
    const db = openTestDb({ write: true });
    db.prepare('update verification set expiresAt = ? where value = ?').run(new Date(Date.now() - 60_000).toISOString(), s.userId);
    db.close();
    const res = await api('/api/auth/reset-password', { method: 'POST', json: { newPassword: 'new-password-2', token } });
    expect(res.status).toBe(400);
    const ok = await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password: 'old-password-1' } });
    expect(ok.status).toBe(200);
  });

  it('answers the same for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('nobody');
    const res = await requestReset(email);
    expect(res.status).toBe(200);
    await new Promise((r) => setTimeout(r, 300));
    expect(caughtFor(email)).toHaveLength(0);
    expect(outboxFor(email)).toHaveLength(0);
  });

  it('names the field when the address is malformed', async () => {
    const res = await requestReset('not-an-address');
    expect(res.status).toBe(400);
    expect(JSON.stringify(await res.json()).toLowerCase()).toContain('email');
  });

  it('sends both parts in our look: plain text and HTML with Nunito, sand and ember, a rounded card', async () => {
    const email = uniqueEmail('look');
    await signUp({ email });
    await requestReset(email);
    const [mail] = await waitForMail(email);
    expect(mail!.text_body).not.toContain('<');
    expect(mail!.html_body).toContain('Nunito');
    expect(mail!.html_body).toContain('#F5EDE0');
    expect(mail!.html_body).toContain('#B24C1C');
    expect(mail!.html_body).toMatch(/border-radius:14px/);
    expect(mail!.html_body).toContain(linkIn(mail!, `${baseUrl()}/reset-password?token=`).replace(/&/g, '&amp;'));
    expect(mail!.message_id).toMatch(/@outbox\.sunreckon>$/);
  });
});

describe('/dev/mail', () => {
  it('lists caught messages with subject, recipient, time and both parts outside production', async () => {
    const email = uniqueEmail('devmail');
    await signUp({ email });
    await requestReset(email);
    await waitForMail(email);
    const res = await api(`/dev/mail?to=${encodeURIComponent(email)}`);
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('Reset your Sunreckon password');
    expect(html).toContain(email);
    expect(html).toContain('Plain text');
    expect(html).toContain('srcdoc=');
    expect(html).toMatch(/<time datetime="\d{4}-\d\d-\d\dT/);
  });

  it('does not exist in production', async () => {
    const prod = await startServer({ SUNRECKON_ENV: 'production', BETTER_AUTH_URL: 'http://127.0.0.1' });
    try {
      const res = await fetch(`${prod.url}/dev/mail`, { redirect: 'manual' });
      expect(res.status).toBe(404);
      expect(await res.text()).not.toContain('Caught mail');
    } finally {
      await prod.stop();
      cleanup(prod.dir);
    }
  });
});
