import { describe, expect, it } from 'vitest';
import { api, baseUrl, openTestDb, signUp, uniqueEmail } from '../helpers/api';

describe('health', () => {
  it('answers ok with the database reachable', async () => {
    const res = await api('/api/health');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true, db: 'ok' });
  });
});

describe('sign-up, sign-in, sign-out', () => {
  it('creates a camper with a personal crew they own', async () => {
    const s = await signUp({ name: 'Mara' });
    const db = openTestDb();
    const row = db.prepare('select kind from user where id = ?').get(s.userId) as { kind: string };
    const member = db.prepare('select role from crew_members where user_id = ?').all(s.userId) as { role: string }[];
    db.close();
    expect(row.kind).toBe('camper');
    expect(member).toEqual([{ role: 'owner' }]);
  });

  it('creates an installer without a crew', async () => {
    const s = await signUp({ kind: 'installer', name: 'Ike' });
    const db = openTestDb();
    const row = db.prepare('select kind from user where id = ?').get(s.userId) as { kind: string };
    const members = db.prepare('select count(*) as n from crew_members where user_id = ?').get(s.userId) as { n: number };
    db.close();
    expect(row.kind).toBe('installer');
    expect(members.n).toBe(0);
  });

  it('refuses an unknown account kind, naming the field', async () => {
    const res = await api('/api/auth/sign-up/email', { method: 'POST', json: { name: 'X', email: uniqueEmail(), password: 'long-enough-1', kind: 'wizard' } });
    expect(res.status).toBe(400);
    expect(JSON.stringify(await res.json())).toContain('kind');
  });

  it('refuses a short password', async () => {
    const res = await api('/api/auth/sign-up/email', { method: 'POST', json: { name: 'X', email: uniqueEmail(), password: 'short', kind: 'camper' } });
    expect(res.status).toBe(400);
  });

  it('signs in with the right password only, and signs out', async () => {
    const email = uniqueEmail();
    await signUp({ email, password: 'right-password-1' });
    const bad = await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password: 'wrong-password-1' } });
    expect(bad.status).toBe(401);
    const good = await api('/api/auth/sign-in/email', { method: 'POST', json: { email, password: 'right-password-1' } });
    expect(good.status).toBe(200);
    const setCookie = good.headers.getSetCookie().join('\n');
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
    const cookie = good.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const page = await fetch(`${baseUrl()}/rigs`, { headers: { cookie }, redirect: 'manual' });
    expect(page.status).toBe(200);
    const out = await fetch(`${baseUrl()}/sign-out`, { method: 'POST', headers: { cookie, origin: baseUrl(), 'content-type': 'application/x-www-form-urlencoded' }, redirect: 'manual' });
    expect(out.status).toBe(303);
    const after = await fetch(`${baseUrl()}/rigs`, { headers: { cookie }, redirect: 'manual' });
    expect(after.status).toBe(302);
  });
});

describe('anonymous visitors', () => {
  it.each(['/rigs', '/trips', '/crew', '/proposals', '/settings'])('are sent from %s to sign-in', async (path) => {
    const res = await api(path);
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe(`/sign-in?next=${encodeURIComponent(path)}`);
  });

  it('get 401 JSON from an API route', async () => {
    const res = await api('/api/rigs');
    expect(res.status).toBe(401);
    expect(await res.json()).toMatchObject({ error: { code: 'unauthorized' } });
  });

  it.each(['/', '/sign-in', '/sign-up'])('can open %s', async (path) => {
    const res = await api(path);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/html/);
  });
});

describe('security headers', () => {
  it('are on every page', async () => {
    const res = await api('/');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('referrer-policy')).toBeTruthy();
    expect(res.headers.get('content-security-policy')).toContain("frame-ancestors 'none'");
  });
});

describe('compression', () => {
  /** A raw request, so the body arrives as sent (fetch would unpack it). */
  async function raw(path: string, acceptEncoding?: string): Promise<{ status: number; headers: Headers; bytes: number; body: Buffer }> {
    const { request } = await import('node:http');
    return new Promise((resolve, reject) => {
      const req = request(baseUrl() + path, { headers: acceptEncoding ? { 'accept-encoding': acceptEncoding } : {} }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => {
          const body = Buffer.concat(chunks);
          const headers = new Headers();
          for (const [k, v] of Object.entries(res.headers)) if (typeof v === 'string') headers.set(k, v);
          resolve({ status: res.statusCode ?? 0, headers, bytes: body.byteLength, body });
        });
      });
      req.on('error', reject);
      req.end();
    });
  }

  it('sends pages and scripts gzip- or brotli-packed to browsers that ask, and plain to those that do not', async () => {
    const { gunzipSync, brotliDecompressSync } = await import('node:zlib');
    const plain = await raw('/');
    expect(plain.status).toBe(200);
    expect(plain.headers.get('content-encoding')).toBeNull();
    const html = plain.body.toString('utf8');
    expect(html).toContain('Sunreckon');

    const gz = await raw('/', 'gzip');
    expect(gz.headers.get('content-encoding')).toBe('gzip');
    expect(gz.headers.get('vary')).toMatch(/accept-encoding/i);
    expect(gz.headers.get('content-security-policy')).toContain("frame-ancestors 'none'");
    expect(gz.bytes).toBeLessThan(plain.bytes / 2);
    expect(gunzipSync(gz.body).toString('utf8')).toBe(html);

    const script = html.match(/\/_astro\/[\w.-]+\.js/)?.[0];
    if (!script) throw new Error('the landing page names no script');
    const js = await raw(script);
    const br = await raw(script, 'br, gzip');
    expect(br.headers.get('content-encoding')).toBe('br');
    expect(brotliDecompressSync(br.body).equals(js.body)).toBe(true);
    expect(br.headers.get('cache-control')).toContain('immutable');
  });

  it('leaves fonts as they are (already packed)', async () => {
    const html = (await raw('/')).body.toString('utf8');
    const css = html.match(/\/_astro\/[\w.-]+\.css/)?.[0];
    if (!css) throw new Error('the landing page names no stylesheet');
    const font = (await raw(css)).body.toString('utf8').match(/\/_astro\/[\w.-]+\.woff2/)?.[0];
    if (!font) throw new Error('the stylesheet names no font');
    const res = await raw(font, 'gzip, br');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-encoding')).toBeNull();
  });
});

describe('the landing page as the server sends it', () => {
  it('carries the quick plan’s starting values, so the form is not blank before it hydrates', async () => {
    const html = await (await api('/')).text();
    const tag = (id: string) => html.match(new RegExp(`<(?:input|select)[^>]*id="${id}"[^>]*>`))?.[0] ?? '';
    expect(tag('qp-capacityAh')).toMatch(/value="100"/);
    expect(tag('qp-panelWatts')).toMatch(/value="200"/);
    expect(tag('qp-nights')).toMatch(/value="3"/);
    expect(tag('qp-placeName')).toMatch(/value="Your camp"/);
    expect(html).toMatch(/<option value="America\/Denver" selected="">/);
    const choice = (name: string, value: string) => html.match(new RegExp(`<input[^>]*name="${name}"[^>]*value="${value}"[^>]*>`))?.[0] ?? '';
    expect(choice('chemistry', 'lifepo4')).toContain('checked=""');
    expect(choice('chemistry', 'agm')).not.toContain('checked');
    expect(choice('loads', 'fridge')).toContain('checked=""');
    expect(choice('loads', 'cpap')).not.toContain('checked');
  });
});
