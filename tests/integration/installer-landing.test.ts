import { beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, signUp, type Session } from '../helpers/api';
import { activeCrew, makeRig } from '../helpers/crew';
import { linkIn, waitForMail } from '../helpers/mail';

// Installers have their own page, and a crew can invite an installer who has no account yet:
// the e-mail offers an installer account, and the share follows once they sign up through it.

const fresh = (tag: string) => `${tag}-${crypto.randomUUID().slice(0, 8)}@example.test`;
type Share = { invited: { id: string; email: string }; message: string };

describe('installer landing and invitations to an address without an account', () => {
  let owner: Session;
  let rigId: string;

  beforeAll(async () => {
    owner = await signUp({ name: 'Ottilie' });
    rigId = (await makeRig(owner, (await activeCrew(owner)).id)).id;
  });

  it('sends an installer to their own page, never to the Trips page', async () => {
    const installer = await signUp({ kind: 'installer', name: 'Pim Volt' });
    const trips = await api('/trips', { session: installer });
    expect(trips.status).toBe(302);
    expect(trips.headers.get('location')).toBe('/installer');
    for (const page of ['/rigs', '/rigs/new']) {
      const res = await api(page, { session: installer });
      expect(res.headers.get('location'), page).toBe('/installer');
    }
    const signIn = await api('/sign-in', { session: installer });
    expect(signIn.headers.get('location')).toBe('/installer');
    const page = await api('/installer', { session: installer });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Rigs shared with me');
    // Their proposals are on the same page (an island that loads the list).
    expect(html).toMatch(/component-url="[^"]*ProposalsPage[^"]*"/);
    expect(html).not.toContain('New trip');
    // A camper still lands on Trips.
    expect((await api('/sign-in', { session: owner })).headers.get('location')).toBe('/trips');
  });

  it('answers alike for an installer, a camper and no account, keeping the address as typed', async () => {
    const installer = await signUp({ kind: 'installer', name: 'Same Answer' });
    const camper = await signUp({ name: 'A Camper' });
    const answers: Share[] = [];
    for (const email of [installer.email.toUpperCase(), camper.email.toUpperCase(), fresh('Nobody').replace('nobody', 'NoBody')]) {
      const res = await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email: `  ${email} ` } });
      expect(res.status).toBe(202);
      const body = (await res.json()) as Share;
      expect(body.invited.email).toBe(email);
      answers.push(body);
    }
    expect(new Set(answers.map((a) => a.message)).size).toBe(1);
    expect(new Set(answers.map((a) => Object.keys(a.invited).sort().join()))).toEqual(new Set([Object.keys(answers[0]!.invited).sort().join()]));
  });

  it('invites an address with no account to sign up as an installer; the share follows the sign-up', async () => {
    const email = fresh('new-installer');
    const shared = (await (await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email } })).json()) as Share;
    const [mail] = await waitForMail(email);
    expect(mail!.subject).toBe('A crew wants to share a rig with you on Sunreckon');
    expect(mail!.text_body).toContain('Create an installer account with this same address');
    const link = linkIn(mail!, `${baseUrl()}/sign-up`);
    const url = new URL(link);
    expect(url.searchParams.get('as')).toBe('installer');
    const next = url.searchParams.get('next')!;
    expect(next).toBe(`/installer?share=${shared.invited.id}`);

    // The sign-up page offers the installer choice first.
    const signUpPage = await (await api(`${url.pathname}${url.search}`)).text();
    expect(signUpPage).toContain('&quot;kind&quot;:[0,&quot;installer&quot;]');

    // Someone else with an installer account cannot take the share with the link.
    const other = await signUp({ kind: 'installer', name: 'Not Them' });
    expect((await api(next, { session: other })).status).toBe(200);
    expect(((await (await api('/api/installer/rigs', { session: other })).json()) as unknown[]).length).toBe(0);

    const installer = await signUp({ kind: 'installer', name: 'New Installer', email });
    // Before following the link nothing is shared.
    expect(((await (await api('/api/installer/rigs', { session: installer })).json()) as unknown[]).length).toBe(0);
    expect((await api(next, { session: installer })).status).toBe(200);
    const rigs = (await (await api('/api/installer/rigs', { session: installer })).json()) as { rigId: string; grantId: string }[];
    expect(rigs.map((r) => r.rigId)).toEqual([rigId]);
    expect(rigs[0]!.grantId).toBe(shared.invited.id);
    expect((await api(`/api/rigs/${rigId}`, { session: installer })).status).toBe(200);
    // The crew sees the share as opened: a grant, no longer invited.
    const list = (await (await api(`/api/rigs/${rigId}/grants`, { session: owner })).json()) as { grants: { installer: { email: string } }[]; invited: { email: string }[] };
    expect(list.grants.map((g) => g.installer.email)).toContain(email);
    expect(list.invited.map((i) => i.email)).not.toContain(email);
  });
});
