import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, uniqueEmail, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, makeTrip, member } from '../helpers/crew';
import { waitForMail } from '../helpers/mail';

type Grant = { id: string; installer: { email: string; name: string }; grantedBy: string };
type Invited = { id: string; rigId: string; email: string; invitedBy: string; createdAt: string };
type Listed = { grants: Grant[]; invited: Invited[]; canManage: boolean };

async function grant(owner: Session, rigId: string, email: string) {
  return api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email } });
}

describe('installers by grant', () => {
  let owner: Session;
  let crewId: string;
  let installer: Session;
  beforeAll(async () => {
    owner = await signUp({ name: 'Marisol' });
    crewId = (await activeCrew(owner)).id;
    installer = await signUp({ kind: 'installer', name: 'Wren', email: uniqueEmail('installer') });
  });

  it('an owner grants one rig; the installer reads it, its loads and trips, and changes nothing', async () => {
    const rig = await makeRig(owner, crewId);
    const other = await makeRig(owner, crewId);
    const load = await makeLoad(owner, rig.id);
    const trip = await makeTrip(owner, rig.id);

    expect((await api(`/api/rigs/${rig.id}`, { session: installer })).status).toBe(404);
    const res = await grant(owner, rig.id, installer.email.toUpperCase());
    expect(res.status).toBe(202);
    expect(await res.json()).toMatchObject({ invited: { rigId: rig.id, email: installer.email.toUpperCase(), invitedBy: 'Marisol' }, message: expect.stringMatching(/^If this address belongs to an installer account/) });
    // Until the installer opens their shared rigs, the crew sees the address as typed, like any other.
    const before = (await (await api(`/api/rigs/${rig.id}/grants`, { session: owner })).json()) as Listed;
    expect(before.grants).toEqual([]);
    expect(before.invited.map((i) => i.email)).toEqual([installer.email.toUpperCase()]);

    const [mail] = await waitForMail(installer.email);
    expect(mail!.subject).toBe('A crew shared a rig with you on Sunreckon');
    expect(mail!.text_body).toContain('/installer');

    const mine = (await (await api('/api/installer/rigs', { session: installer })).json()) as { rigId: string; rigName: string; loadCount: number; tripCount: number }[];
    expect(mine).toEqual([expect.objectContaining({ rigId: rig.id, loadCount: 1, tripCount: 1 })]);
    const opened = (await (await api(`/api/rigs/${rig.id}/grants`, { session: owner })).json()) as Listed;
    expect(opened.invited).toEqual([]);
    expect(opened.grants).toEqual([expect.objectContaining({ rigId: rig.id, installer: expect.objectContaining({ email: installer.email, name: 'Wren' }), grantedBy: 'Marisol' })]);

    const rigRes = await api(`/api/rigs/${rig.id}`, { session: installer });
    expect(rigRes.status).toBe(200);
    expect(await rigRes.json()).toMatchObject({ id: rig.id, canEdit: false });
    expect((await api(`/api/rigs/${rig.id}/loads`, { session: installer })).status).toBe(200);
    expect((await api(`/api/trips/${trip.id}`, { session: installer })).status).toBe(200);
    // Only the granted rig.
    expect((await api(`/api/rigs/${other.id}`, { session: installer })).status).toBe(404);
    const list = (await (await api('/api/rigs', { session: installer })).json()) as { id: string }[];
    expect(list.map((r) => r.id)).toEqual([rig.id]);

    const patch = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: installer, json: { name: 'Mine now', version: rig.version } });
    expect(patch.status).toBe(403);
    expect(((await patch.json()) as { error: { message: string } }).error.message).toMatch(/installers cannot change/);
    expect((await api(`/api/loads/${load.id}?version=${load.version}`, { method: 'DELETE', session: installer })).status).toBe(403);
    expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: installer, json: { name: 'Kettle', watts: 1000 } })).status).toBe(403);
    // Crew-only views and the grant list itself.
    expect((await api(`/api/rigs/${rig.id}/activity`, { session: installer })).status).toBe(403);
    expect((await api(`/api/rigs/${rig.id}/grants`, { session: installer })).status).toBe(403);
    expect((await grant(installer, rig.id, installer.email)).status).toBe(403);
  });

  it('revoking takes the access away at once', async () => {
    const rig = await makeRig(owner, crewId);
    const inst = await signUp({ kind: 'installer' });
    const g = ((await (await grant(owner, rig.id, inst.email)).json()) as { invited: Invited }).invited;
    await api('/api/installer/rigs', { session: inst });
    expect((await api(`/api/rigs/${rig.id}`, { session: inst })).status).toBe(200);

    const editor = await member(owner, crewId, 'editor');
    expect((await api(`/api/grants/${g.id}`, { method: 'DELETE', session: editor })).status).toBe(403);
    expect((await api(`/api/grants/${g.id}`, { method: 'DELETE', session: inst })).status).toBe(403);
    expect((await api(`/api/grants/${g.id}`, { method: 'DELETE', session: await signUp() })).status).toBe(404);

    expect((await api(`/api/grants/${g.id}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(`/api/rigs/${rig.id}`, { session: inst })).status).toBe(404);
    expect(await (await api('/api/installer/rigs', { session: inst })).json()).toEqual([]);
    const listed = (await (await api(`/api/rigs/${rig.id}/grants`, { session: owner })).json()) as Listed;
    expect(listed).toEqual({ grants: [], invited: [], canManage: true });
    expect((await api(`/api/grants/${g.id}`, { method: 'DELETE', session: owner })).status).toBe(404);
  });

  it('a camper account and no account are listed as invited and never get access; non-owners and duplicates are refused', async () => {
    const rig = await makeRig(owner, crewId);
    const camper = await signUp();
    const asCamper = await grant(owner, rig.id, camper.email);
    expect(asCamper.status).toBe(202);
    const nobodyEmail = uniqueEmail('nobody');
    const nobody = await grant(owner, rig.id, nobodyEmail);
    expect(nobody.status).toBe(202);
    expect((await api(`/api/rigs/${rig.id}`, { session: camper })).status).toBe(404);
    const malformed = await grant(owner, rig.id, 'wren at home');
    expect(malformed.status).toBe(400);
    expect(await malformed.json()).toMatchObject({ issues: [{ path: 'email' }] });

    const inst = await signUp({ kind: 'installer' });
    expect((await grant(owner, rig.id, inst.email)).status).toBe(202);
    // Before the installer opens it, a second share answers alike; after, the list names them, so a 409 tells nothing new.
    expect((await grant(owner, rig.id, inst.email)).status).toBe(202);
    await api('/api/installer/rigs', { session: inst });
    const dup = await grant(owner, rig.id, inst.email);
    expect(dup.status).toBe(409);
    expect(await dup.json()).toMatchObject({ current: { installer: { email: inst.email } } });

    const viewer = await member(owner, crewId, 'viewer');
    expect((await grant(viewer, rig.id, inst.email)).status).toBe(403);
    const listed = (await (await api(`/api/rigs/${rig.id}/grants`, { session: viewer })).json()) as Listed;
    expect(listed.canManage).toBe(false);
    expect(listed.grants.map((g) => g.installer.email)).toEqual([inst.email]);
    expect(listed.invited.map((i) => i.email)).toEqual([camper.email, nobodyEmail]);
    expect((await grant(await signUp(), rig.id, inst.email)).status).toBe(404);
  });

  it('a camper has no installer list', async () => {
    expect((await api('/api/installer/rigs', { session: owner })).status).toBe(403);
  });
});

describe('load activity on the rig', () => {
  it('shows who added, changed and removed which load, newest first, to the crew', async () => {
    const owner = await signUp({ name: 'Inés' });
    const crewId = (await activeCrew(owner)).id;
    const tobi = await member(owner, crewId, 'editor', 'Tobi');
    const rig = await makeRig(owner, crewId);
    const load = await makeLoad(tobi, rig.id, { name: 'Laptop', watts: 60, windows: [[19, 22]] });
    const changed = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { watts: 45, version: load.version } });
    expect(changed.status).toBe(200);
    const after = (await changed.json()) as { version: number };
    expect((await api(`/api/loads/${load.id}?version=${after.version}`, { method: 'DELETE', session: tobi })).status).toBe(204);

    const res = await api(`/api/rigs/${rig.id}/activity`, { session: owner });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { items: { action: string; by: string; loadName: string; changes: Record<string, unknown> }[]; nextBefore: string | null };
    expect(body.items.map((i) => [i.action, i.by, i.loadName])).toEqual([
      ['removed', 'Tobi', 'Laptop'],
      ['changed', 'Inés', 'Laptop'],
      ['added', 'Tobi', 'Laptop'],
    ]);
    expect(body.items[1]!.changes).toEqual({ watts: [60, 45] });
    expect(body.nextBefore).toBeNull();

    // Paging: one at a time walks the same three entries.
    const seen: string[] = [];
    let before: string | null = null;
    do {
      const page = (await (await api(`/api/rigs/${rig.id}/activity?limit=1${before ? `&before=${encodeURIComponent(before)}` : ''}`, { session: owner })).json()) as typeof body;
      seen.push(...page.items.map((i) => i.action));
      before = page.nextBefore;
    } while (before);
    expect(seen).toEqual(['removed', 'changed', 'added']);

    const bad = await api(`/api/rigs/${rig.id}/activity?limit=0`, { session: owner });
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ issues: [{ path: 'limit' }] });
    expect((await api(`/api/rigs/${rig.id}/activity`, { session: await signUp() })).status).toBe(404);
  });
});
