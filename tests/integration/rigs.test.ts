import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { addMember, createLoad, createRig, dbAll, dbGet, personalCrewId, vanRig } from '../helpers/fixtures';

let owner: Session;
let stranger: Session;

beforeAll(async () => {
  owner = await signUp({ name: 'Rosa Reyes' });
  stranger = await signUp({ name: 'Someone Else' });
});

describe('anonymous callers', () => {
  it.each([
    ['GET', '/api/rigs'],
    ['POST', '/api/rigs'],
    ['GET', '/api/rigs/any-id'],
    ['PATCH', '/api/rigs/any-id'],
    ['DELETE', '/api/rigs/any-id?version=1'],
  ])('get 401 from %s %s', async (method, path) => {
    const res = await api(path, { method, json: method === 'GET' || method === 'DELETE' ? undefined : vanRig });
    expect(res.status).toBe(401);
    expect(await res.json()).toMatchObject({ error: { code: 'unauthorized' } });
  });
});

describe('POST /api/rigs', () => {
  it('creates a rig in the personal crew with the engine defaults filled in', async () => {
    const res = await api('/api/rigs', { method: 'POST', session: owner, json: vanRig });
    expect(res.status).toBe(201);
    const rig = await res.json();
    expect(res.headers.get('location')).toBe(`/api/rigs/${rig.id}`);
    expect(rig).toMatchObject({
      name: 'Camper van',
      crewId: personalCrewId(owner.userId),
      bank: { chemistry: 'lifepo4', capacityAh: 300, initialSocPct: 100, cutoffVolts: null, insideHeatedSpace: false },
      arrays: [{ name: 'Roof', ratedWatts: 400, tiltDeg: 0, azimuthDeg: 180, controller: 'mppt' }],
      chargers: [{ kind: 'alternator', amps: 30 }],
      inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false },
      canEdit: true,
      version: 1,
    });
    expect(rig.createdAt).toMatch(/^\d{4}-\d\d-\d\dT/);
    const row = dbGet<{ created_by: string; version: number }>('select created_by, version from rigs where id = ?', rig.id);
    expect(row).toEqual({ created_by: owner.userId, version: 1 });
  });

  it('takes only a name and a bank; arrays and chargers default to none', async () => {
    const res = await api('/api/rigs', { method: 'POST', session: owner, json: { name: 'Trailer', bank: { chemistry: 'flooded', capacityAh: 225 } } });
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ arrays: [], chargers: [], inverter: null });
  });

  it('names every field that needs fixing', async () => {
    const res = await api('/api/rigs', { method: 'POST', session: owner, json: { name: ' ', bank: { chemistry: 'lead', capacityAh: -5 }, arrays: [{ ratedWatts: 'lots' }] } });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_request');
    const paths = body.issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'bank.chemistry', 'bank.capacityAh', 'arrays.0.ratedWatts']));
  });

  it('refuses bad JSON, a wrong content type and a huge body with the envelope', async () => {
    const bad = await api('/api/rigs', { method: 'POST', session: owner, headers: { 'content-type': 'application/json' }, body: '{"name":' });
    expect(bad.status).toBe(400);
    expect((await bad.json()).issues[0].path).toBe('(body)');
    const form = await api('/api/rigs', { method: 'POST', session: owner, headers: { 'content-type': 'application/xml' }, body: '<rig/>' });
    expect(form.status).toBe(400);
    expect((await form.json()).issues[0].path).toBe('(headers).content-type');
    const huge = await api('/api/rigs', { method: 'POST', session: owner, json: { ...vanRig, name: 'x'.repeat(400 * 1024) } });
    expect(huge.status).toBe(413);
    expect((await huge.json()).error.code).toBe('payload_too_large');
  });

  it("puts the rig in another crew only when the user may write there (404 naming crewId otherwise)", async () => {
    const res = await api('/api/rigs', { method: 'POST', session: owner, json: { ...vanRig, crewId: personalCrewId(stranger.userId) } });
    expect(res.status).toBe(404);
    expect((await res.json()).issues).toEqual([{ path: 'crewId', message: expect.any(String) }]);
  });

  it('answers 403 to an installer, who has no crew to add rigs to', async () => {
    const installer = await signUp({ kind: 'installer', name: 'Ike' });
    const res = await api('/api/rigs', { method: 'POST', session: installer, json: vanRig });
    expect(res.status).toBe(403);
  });
});

describe('GET /api/rigs and /api/rigs/:id', () => {
  it("lists only the rigs of the user's crews", async () => {
    const mine = await createRig(owner, { name: 'Listed rig' });
    const theirs = await createRig(stranger, { name: 'Their rig' });
    const res = await api('/api/rigs', { session: owner });
    expect(res.status).toBe(200);
    const ids = (await res.json()).map((r: { id: string }) => r.id);
    expect(ids).toContain(mine.id);
    expect(ids).not.toContain(theirs.id);
  });

  it('reads one rig, and answers 404 for a rig of another crew or an unknown id', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}`, { session: owner });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual(rig);
    for (const s of [stranger]) {
      const other = await api(`/api/rigs/${rig.id}`, { session: s });
      expect(other.status).toBe(404);
      expect((await other.json()).error.code).toBe('not_found');
    }
    expect((await api('/api/rigs/no-such-rig', { session: owner })).status).toBe(404);
  });
});

describe('PATCH /api/rigs/:id', () => {
  it('changes only the fields sent and increments the version', async () => {
    const rig = await createRig(owner);
    // Regression: zod's .partial() filled in `.default([])` for arrays not sent, so a rename wiped the panels.
    const res = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Renamed van' } });
    expect(res.status).toBe(200);
    const after = await res.json();
    expect(after).toMatchObject({ name: 'Renamed van', version: 2, arrays: rig.arrays, chargers: rig.chargers, inverter: rig.inverter, bank: rig.bank });
    const bank = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: 2, bank: { chemistry: 'agm', capacityAh: 200 }, inverter: null } });
    expect(await bank.json()).toMatchObject({ version: 3, bank: { chemistry: 'agm', capacityAh: 200 }, inverter: null, name: 'Renamed van' });
  });

  it('needs the version read (400 naming version)', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { name: 'No version' } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toEqual([{ path: 'version', message: 'Send the version you read.' }]);
  });

  it('answers 409 with the current rig on a stale version, and changes nothing', async () => {
    const rig = await createRig(owner);
    await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'First edit' } });
    const res = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Second edit', arrays: [] } });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error).toEqual({ code: 'conflict', message: 'Someone changed this rig since you opened it.' });
    expect(body.issues).toEqual([]);
    expect(body.current).toMatchObject({ id: rig.id, name: 'First edit', version: 2, arrays: rig.arrays });
    const row = dbGet<{ name: string; version: number; arrays: string }>('select name, version, arrays from rigs where id = ?', rig.id);
    expect(row).toMatchObject({ name: 'First edit', version: 2 });
    expect(JSON.parse(row!.arrays)).toEqual(rig.arrays);
  });

  it("answers 404 for another crew's rig", async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: stranger, json: { version: 1, name: 'Mine now' } });
    expect(res.status).toBe(404);
    expect(dbGet<{ name: string }>('select name from rigs where id = ?', rig.id)!.name).toBe('Camper van');
  });
});

describe('DELETE /api/rigs/:id', () => {
  it('deletes with ?version=N, hiding its loads with it (kept, restorable for 30 days)', async () => {
    const rig = await createRig(owner);
    await createLoad(owner, rig.id, { name: 'Fridge', watts: 45 });
    const res = await api(`/api/rigs/${rig.id}?version=1`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(204);
    expect(dbGet('select deleted_by from rigs where id = ?', rig.id)).toEqual({ deleted_by: owner.userId });
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toHaveLength(1);
    expect((await api(`/api/rigs/${rig.id}`, { session: owner })).status).toBe(404);
    expect((await api(`/api/rigs/${rig.id}/loads`, { session: owner })).status).toBe(404);
  });

  it('accepts the version as an If-Match header', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}`, { method: 'DELETE', session: owner, headers: { 'if-match': '"1"' } });
    expect(res.status).toBe(204);
  });

  it('needs the version (400 naming version)', async () => {
    const rig = await createRig(owner);
    for (const path of [`/api/rigs/${rig.id}`, `/api/rigs/${rig.id}?version=abc`, `/api/rigs/${rig.id}?version=0`]) {
      const res = await api(path, { method: 'DELETE', session: owner });
      expect(res.status).toBe(400);
      expect((await res.json()).issues[0].path).toBe('version');
    }
    expect(dbGet('select id from rigs where id = ?', rig.id)).toBeDefined();
  });

  it('answers 409 with the current rig on a stale version, and deletes nothing', async () => {
    const rig = await createRig(owner);
    await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Edited meanwhile' } });
    const res = await api(`/api/rigs/${rig.id}?version=1`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error.code).toBe('conflict');
    expect(body.current).toMatchObject({ id: rig.id, name: 'Edited meanwhile', version: 2 });
    expect(dbGet('select version from rigs where id = ?', rig.id)).toEqual({ version: 2 });
  });

  it("answers 404 for another crew's rig, and deletes nothing", async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}?version=1`, { method: 'DELETE', session: stranger });
    expect(res.status).toBe(404);
    expect(dbGet('select id from rigs where id = ?', rig.id)).toBeDefined();
  });
});

// The role matrix: what each crew role may do with a rig of the crew. Roles are put in the
// database directly until the crews issue brings invitations.
describe.each([
  { role: 'owner' as const, read: 200, write: 200, canEdit: true },
  { role: 'editor' as const, read: 200, write: 200, canEdit: true },
  { role: 'viewer' as const, read: 200, write: 403, canEdit: false },
])('a crew $role', ({ role, read, write, canEdit }) => {
  let member: Session;
  let rig: any;

  beforeAll(async () => {
    const host = await signUp({ name: 'Crew host' });
    rig = await createRig(host);
    member = await signUp({ name: `Crew ${role}` });
    addMember(rig.crewId, member.userId, role);
  });

  it(`reads the rig (${read}) and its loads`, async () => {
    const res = await api(`/api/rigs/${rig.id}`, { session: member });
    expect(res.status).toBe(read);
    expect((await res.json()).canEdit).toBe(canEdit);
    expect((await api(`/api/rigs/${rig.id}/loads`, { session: member })).status).toBe(200);
    expect((await api(`/api/rigs/${rig.id}/loads.csv`, { session: member })).status).toBe(200);
    const list = await (await api('/api/rigs', { session: member })).json();
    expect(list.find((r: { id: string }) => r.id === rig.id)).toMatchObject({ canEdit });
  });

  it(`changes the rig (${write}) and adds loads (${write === 200 ? 201 : write})`, async () => {
    const current = await (await api(`/api/rigs/${rig.id}`, { session: member })).json();
    const res = await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: member, json: { version: current.version, name: `Edited by ${role}` } });
    expect(res.status).toBe(write);
    if (write === 403) expect((await res.json()).error.code).toBe('forbidden');
    const load = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: member, json: { name: 'Lamp', watts: 5 } });
    expect(load.status).toBe(write === 200 ? 201 : write);
  });

  // Deleting takes the rig's trips, saved forecasts and check-ins with it: crew owners only.
  it(`deletes the rig (${role === 'owner' ? 204 : 403})`, async () => {
    const current = await (await api(`/api/rigs/${rig.id}`, { session: member })).json();
    expect(current.canDelete).toBe(role === 'owner');
    const res = await api(`/api/rigs/${rig.id}?version=${current.version}`, { method: 'DELETE', session: member });
    expect(res.status).toBe(role === 'owner' ? 204 : 403);
  });
});
