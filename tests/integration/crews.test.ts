import { createHash } from 'node:crypto';
import { openTestDb, type TestDb } from '../helpers/test-db';
import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, uniqueEmail, type Session } from '../helpers/api';
import { activeCrew, inviteToken, makeLoad, makeRig, member } from '../helpers/crew';
import { waitForMail } from '../helpers/mail';

type Crew = { id: string; name: string; version: number; role: string; members: { userId: string; email: string; role: string; version: number }[]; invitations: { id: string; email: string; version: number; status: string }[] };

async function crew(s: Session, id: string): Promise<Crew> {
  const res = await api(`/api/crews/${id}`, { session: s });
  expect(res.status).toBe(200);
  return (await res.json()) as Crew;
}

function writeDb(): TestDb {
  return openTestDb({ write: true });
}

async function accept(s: Session, token: string) {
  return api('/api/invitations/accept', { method: 'POST', session: s, json: { token } });
}

describe('a crew and its owner', () => {
  it('a new camper owns one active crew; an installer has none', async () => {
    const s = await signUp({ name: 'Ada' });
    const res = await api('/api/crews', { session: s });
    const list = (await res.json()) as { name: string; role: string; active: boolean; memberCount: number }[];
    expect(list).toEqual([expect.objectContaining({ name: "Ada's crew", role: 'owner', active: true, memberCount: 1 })]);
    const inst = await signUp({ kind: 'installer' });
    expect(await (await api('/api/crews', { session: inst })).json()).toEqual([]);
    const create = await api('/api/crews', { method: 'POST', session: inst, json: { name: 'Nope' } });
    expect(create.status).toBe(403);
  });

  it('renames with the version read; a stale version is a 409 with the current crew', async () => {
    const s = await signUp();
    const c = await activeCrew(s);
    const ok = await api(`/api/crews/${c.id}`, { method: 'PATCH', session: s, json: { name: 'Dune Rovers', version: c.version } });
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ name: 'Dune Rovers', version: c.version + 1 });
    const stale = await api(`/api/crews/${c.id}`, { method: 'PATCH', session: s, json: { name: 'Lost edit', version: c.version } });
    expect(stale.status).toBe(409);
    expect(await stale.json()).toMatchObject({ error: { code: 'conflict' }, current: { name: 'Dune Rovers', version: c.version + 1 } });
    const blank = await api(`/api/crews/${c.id}`, { method: 'PATCH', session: s, json: { name: '  ', version: c.version + 1 } });
    expect(blank.status).toBe(400);
    expect(await blank.json()).toMatchObject({ issues: [{ path: 'name' }] });
  });

  it('starts a second crew and switches between crews; a crew one is not in is 404', async () => {
    const s = await signUp();
    const first = await activeCrew(s);
    const made = await api('/api/crews', { method: 'POST', session: s, json: { name: 'Weekend crew' } });
    expect(made.status).toBe(201);
    const second = (await made.json()) as { id: string };
    expect((await activeCrew(s)).id).toBe(second.id);
    const back = await api('/api/crews/active', { method: 'PUT', session: s, json: { crewId: first.id } });
    expect(back.status).toBe(200);
    expect((await activeCrew(s)).id).toBe(first.id);

    const stranger = await signUp();
    expect((await api('/api/crews/active', { method: 'PUT', session: stranger, json: { crewId: first.id } })).status).toBe(404);
    expect((await api(`/api/crews/${first.id}`, { session: stranger })).status).toBe(404);
    const missing = await api('/api/crews/active', { method: 'PUT', session: s, json: {} });
    expect(missing.status).toBe(400);
    expect(await missing.json()).toMatchObject({ issues: [{ path: 'crewId' }] });
  });
});

describe('invitations by e-mail', () => {
  let owner: Session;
  let crewId: string;
  beforeAll(async () => {
    owner = await signUp({ name: 'Inés' });
    crewId = (await activeCrew(owner)).id;
    await api(`/api/crews/${crewId}`, { method: 'PATCH', session: owner, json: { name: 'Canyon crew', version: 1 } });
  });

  it('invite → e-mail caught by the real catcher → link → sign up with that address → accept → the role works', async () => {
    const email = uniqueEmail('tobi');
    const res = await api(`/api/crews/${crewId}/invitations`, { method: 'POST', session: owner, json: { email, role: 'editor' } });
    expect(res.status).toBe(201);
    const inv = (await res.json()) as Record<string, unknown>;
    expect(inv).toMatchObject({ email, role: 'editor', status: 'pending', invitedBy: 'Inés' });
    expect(JSON.stringify(inv)).not.toMatch(/token/i);

    const [mail] = await waitForMail(email);
    expect(mail!.subject).toBe('You are invited to a crew on Sunreckon');
    expect(mail!.text_body).toContain('in its members’ own words: “Canyon crew”');
    expect(mail!.html_body).toContain('Join the crew');
    const token = await inviteTokenFromMail(mail!.text_body);

    // Only the hash is stored.
    const db = writeDb();
    const row = db.prepare('select token_hash from invitations where id = ?').get(inv.id) as { token_hash: string };
    db.close();
    expect(row.token_hash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(row.token_hash).not.toContain(token);

    const page = await api(`/invite/${token}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Join “Canyon crew”');
    expect(html).toContain(email);

    const tobi = await signUp({ email, name: 'Tobi' });
    const ok = await accept(tobi, token);
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ crewId, role: 'editor', joined: true });
    expect((await activeCrew(tobi)).id).toBe(crewId);
    expect((await crew(owner, crewId)).members.find((m) => m.email === email)).toMatchObject({ role: 'editor' });

    // The role is effective: an editor adds a load to the crew's rig; the owner sees it.
    const rig = await makeRig(owner, crewId);
    const load = await makeLoad(tobi, rig.id, { name: 'Tobi’s laptop', watts: 60, windows: [[19, 22]] });
    const loads = (await (await api(`/api/rigs/${rig.id}/loads`, { session: owner })).json()) as { id: string; name: string }[];
    expect(loads.map((l) => l.name)).toContain('Tobi’s laptop');
    expect(load.name).toBe('Tobi’s laptop');

    // Used once.
    const again = await accept(tobi, token);
    expect(again.status).toBe(400);
    expect((await again.json()) as { error: { message: string } }).toMatchObject({ error: { message: expect.stringContaining('already used') }, issues: [{ path: 'token' }] });
    expect((await api(`/invite/${token}`)).status).toBe(410);
  });

  it('a viewer reads but cannot edit', async () => {
    const viewer = await member(owner, crewId, 'viewer');
    const rig = await makeRig(owner, crewId);
    expect((await api(`/api/rigs/${rig.id}`, { session: viewer })).status).toBe(200);
    const write = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: viewer, json: { name: 'Kettle', watts: 1200 } });
    expect(write.status).toBe(403);
    expect(((await write.json()) as { error: { message: string } }).error.message).toMatch(/viewer/);
  });

  it('refuses the link for another account, for an installer, when expired, revoked or unknown', async () => {
    const email = uniqueEmail('invitee');
    const token = await inviteToken(owner, crewId, email, 'viewer');
    const other = await signUp();
    const wrong = await accept(other, token);
    expect(wrong.status).toBe(403);
    expect(((await wrong.json()) as { error: { message: string } }).error.message).toContain(email);
    const wrongPage = await api(`/invite/${token}`, { session: other });
    expect(await wrongPage.text()).toContain(`You are signed in as ${other.email}`);

    const db = writeDb();
    db.prepare('update invitations set expires_at = ? where email = ?').run(new Date(Date.now() - 1000).toISOString(), email);
    db.close();
    const invitee = await signUp({ email });
    const expired = await accept(invitee, token);
    expect(expired.status).toBe(400);
    expect(((await expired.json()) as { error: { message: string } }).error.message).toMatch(/expired/);
    expect((await api(`/invite/${token}`)).status).toBe(410);

    const unknown = await accept(invitee, 'x'.repeat(43));
    expect(unknown.status).toBe(404);
    expect((await api(`/invite/${'y'.repeat(43)}`)).status).toBe(404);
    const blank = await accept(invitee, '');
    expect(blank.status).toBe(400);
    expect(await blank.json()).toMatchObject({ issues: [{ path: 'token' }] });

    // Invited before they signed up as an installer: installers never join crews.
    const instEmail = uniqueEmail('later-installer');
    const instToken = await inviteToken(owner, crewId, instEmail, 'viewer');
    const inst = await signUp({ email: instEmail, kind: 'installer' });
    const refused = await accept(inst, instToken);
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/Installer accounts cannot join/);

    const email2 = uniqueEmail('revoked');
    const token2 = await inviteToken(owner, crewId, email2, 'editor');
    const list = (await crew(owner, crewId)).invitations.find((i) => i.email === email2)!;
    const stale = await api(`/api/invitations/${list.id}?version=${list.version + 5}`, { method: 'DELETE', session: owner });
    expect(stale.status).toBe(409);
    expect((await api(`/api/invitations/${list.id}?version=${list.version}`, { method: 'DELETE', session: owner })).status).toBe(204);
    const revoked = await accept(await signUp({ email: email2 }), token2);
    expect(revoked.status).toBe(400);
    expect(((await revoked.json()) as { error: { message: string } }).error.message).toMatch(/withdrawn/);
  });

  it('resend mails a fresh link; the old one stops working', async () => {
    const email = uniqueEmail('resend');
    const first = await inviteToken(owner, crewId, email, 'editor');
    const inv = (await crew(owner, crewId)).invitations.find((i) => i.email === email)!;
    const res = await api(`/api/invitations/${inv.id}/resend`, { method: 'POST', session: owner, json: { version: inv.version } });
    expect(res.status).toBe(200);
    const mails = await waitForMail(email, { count: 2 });
    const second = (await inviteTokenFromMail(mails[1]!.text_body));
    expect(second).not.toBe(first);
    const stale = await api(`/api/invitations/${inv.id}/resend`, { method: 'POST', session: owner, json: { version: inv.version } });
    expect(stale.status).toBe(409);
    const s = await signUp({ email });
    expect((await accept(s, first)).status).toBe(404);
    expect((await accept(s, second)).status).toBe(200);
  });

  it('refuses members, installers, a second open invitation, bad fields, non-owners and other crews', async () => {
    const editor = await member(owner, crewId, 'editor');
    const post = (s: Session, body: unknown, id = crewId) => api(`/api/crews/${id}/invitations`, { method: 'POST', session: s, json: body });

    const dup = await post(owner, { email: editor.email, role: 'viewer' });
    expect(dup.status).toBe(409);
    expect(await dup.json()).toMatchObject({ issues: [{ path: 'email' }] });

    const installer = await signUp({ kind: 'installer' });
    const inst = await post(owner, { email: installer.email, role: 'viewer' });
    expect(inst.status).toBe(400);
    expect(await inst.json()).toMatchObject({ issues: [{ path: 'email', message: expect.stringContaining('installer') }] });

    const email = uniqueEmail('twice');
    expect((await post(owner, { email, role: 'viewer' })).status).toBe(201);
    const twice = await post(owner, { email: email.toUpperCase(), role: 'viewer' });
    expect(twice.status).toBe(409);

    const bad = await post(owner, { email: 'not-mail', role: 'captain' });
    expect(bad.status).toBe(400);
    const paths = ((await bad.json()) as { issues: { path: string }[] }).issues.map((i) => i.path).sort();
    expect(paths).toEqual(['email', 'role']);

    const notJson = await api(`/api/crews/${crewId}/invitations`, { method: 'POST', session: owner, body: 'email=x', headers: { 'content-type': 'text/plain' } });
    expect(notJson.status).toBe(400);

    expect((await post(editor, { email: uniqueEmail(), role: 'viewer' })).status).toBe(403);
    const outsider = await signUp();
    expect((await post(outsider, { email: uniqueEmail(), role: 'viewer' })).status).toBe(404);
  });
});

describe('roles and membership', () => {
  it('changes roles with versions, keeps at least one owner, removes and lets members leave', async () => {
    const owner = await signUp({ name: 'Owner One' });
    const crewId = (await activeCrew(owner)).id;
    const ed = await member(owner, crewId, 'editor');
    const patch = (s: Session, userId: string, body: unknown) => api(`/api/crews/${crewId}/members/${userId}`, { method: 'PATCH', session: s, json: body });

    let c = await crew(owner, crewId);
    const me = c.members.find((m) => m.userId === owner.userId)!;
    const last = await patch(owner, owner.userId, { role: 'editor', version: me.version });
    expect(last.status).toBe(400);
    expect(await last.json()).toMatchObject({ issues: [{ path: 'role', message: expect.stringContaining('at least one owner') }] });
    const leave = await api(`/api/crews/${crewId}/members/${owner.userId}?version=${me.version}`, { method: 'DELETE', session: owner });
    expect(leave.status).toBe(400);
    expect(((await leave.json()) as { error: { message: string } }).error.message).toMatch(/only owner/);

    const edRow = c.members.find((m) => m.userId === ed.userId)!;
    const promote = await patch(owner, ed.userId, { role: 'owner', version: edRow.version });
    expect(promote.status).toBe(200);
    expect(await promote.json()).toMatchObject({ role: 'owner', version: edRow.version + 1 });
    const stale = await patch(owner, ed.userId, { role: 'viewer', version: edRow.version });
    expect(stale.status).toBe(409);
    expect(await stale.json()).toMatchObject({ current: { role: 'owner', version: edRow.version + 1 } });

    // Two owners now: the first may step down.
    c = await crew(owner, crewId);
    const down = await patch(owner, owner.userId, { role: 'viewer', version: c.members.find((m) => m.userId === owner.userId)!.version });
    expect(down.status).toBe(200);
    // As a viewer they can no longer manage members.
    expect((await patch(owner, ed.userId, { role: 'editor', version: edRow.version + 1 })).status).toBe(403);
    expect((await api(`/api/crews/${crewId}/invitations`, { session: owner })).status).toBe(403);

    // The viewer leaves; afterwards the crew is 404 to them.
    c = await crew(ed, crewId);
    const v = c.members.find((m) => m.userId === owner.userId)!.version;
    expect((await api(`/api/crews/${crewId}/members/${owner.userId}`, { method: 'DELETE', session: owner })).status).toBe(400);
    expect((await api(`/api/crews/${crewId}/members/${owner.userId}?version=${v}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(`/api/crews/${crewId}`, { session: owner })).status).toBe(404);

    const bad = await patch(ed, ed.userId, { role: 'admiral', version: 1 });
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ issues: [{ path: 'role' }] });
  });

  it('an owner removes a member, who then loses the crew’s rigs (404)', async () => {
    const owner = await signUp();
    const crewId = (await activeCrew(owner)).id;
    const ed = await member(owner, crewId, 'editor');
    const rig = await makeRig(owner, crewId);
    expect((await api(`/api/rigs/${rig.id}`, { session: ed })).status).toBe(200);
    const row = (await crew(owner, crewId)).members.find((m) => m.userId === ed.userId)!;
    expect((await api(`/api/crews/${crewId}/members/${ed.userId}?version=${row.version}`, { method: 'DELETE', session: ed.userId === owner.userId ? ed : owner })).status).toBe(204);
    expect((await api(`/api/rigs/${rig.id}`, { session: ed })).status).toBe(404);
    expect((await api(`/api/crews/${crewId}`, { session: ed })).status).toBe(404);
  });
});

async function inviteTokenFromMail(text: string): Promise<string> {
  const m = text.match(/\/invite\/([A-Za-z0-9_-]+)/);
  if (!m) throw new Error(`no invitation link in:\n${text}`);
  return m[1]!;
}
