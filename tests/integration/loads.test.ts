import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { createLoad, createRig, dbAll, dbGet } from '../helpers/fixtures';
import { at } from '../../src/lib/invariant';

let owner: Session;
let stranger: Session;

beforeAll(async () => {
  owner = await signUp({ name: 'Rosa Reyes' });
  stranger = await signUp({ name: 'Someone Else' });
});

// Draws are typical figures from trade-notes.md (compressor fridge 35–60 W [meas], LED ~0.1 A per
// fixture [meas], CPAP ~25 W dry [meas]); the tests only need plausible numbers.
const fridge = { name: 'Compressor fridge', watts: 45, dutyPct: 40, response: 'cooling' };

function activity(rigId: string) {
  return dbAll<{ load_id: string; user_id: string; action: string; load_name: string; changes: string }>(
    'select load_id, user_id, action, load_name, changes from load_activity where rig_id = ? order by at, rowid',
    rigId,
  );
}

function csvImport(rigId: string, body: string, session: Session, query = '') {
  return api(`/api/rigs/${rigId}/loads/import${query}`, { method: 'POST', session, headers: { 'content-type': 'text/csv' }, body });
}

describe('anonymous callers', () => {
  it.each([
    ['GET', '/api/rigs/x/loads'],
    ['POST', '/api/rigs/x/loads'],
    ['POST', '/api/rigs/x/loads/import'],
    ['GET', '/api/rigs/x/loads.csv'],
    ['PATCH', '/api/loads/x'],
    ['DELETE', '/api/loads/x?version=1'],
  ])('get 401 from %s %s', async (method, path) => {
    const res = await api(path, { method, json: method === 'PATCH' || method === 'POST' ? {} : undefined });
    expect(res.status).toBe(401);
  });
});

describe('POST and GET /api/rigs/:id/loads', () => {
  it('adds a load with the contract defaults, who added it, and an "added" activity row', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: fridge });
    expect(res.status).toBe(201);
    const load = await res.json();
    expect(load).toMatchObject({
      rigId: rig.id,
      name: 'Compressor fridge',
      watts: 45,
      quantity: 1,
      supply: 'dc',
      windows: [[0, 24]],
      dutyPct: 40,
      days: 'all',
      response: 'cooling',
      setpointC: 18,
      note: '',
      standby: false,
      position: 0,
      addedBy: { id: owner.userId, name: 'Rosa Reyes' },
      version: 1,
    });
    const log = activity(rig.id);
    expect(log).toHaveLength(1);
    expect(log[0]).toMatchObject({ load_id: load.id, user_id: owner.userId, action: 'added', load_name: 'Compressor fridge' });
    expect(JSON.parse(at(log, 0, 'activity row').changes).watts).toEqual([null, 45]);
  });

  it('lists by position, then by when they were added', async () => {
    const rig = await createRig(owner);
    const a = await createLoad(owner, rig.id, { name: 'A', watts: 1 });
    const b = await createLoad(owner, rig.id, { name: 'B', watts: 1 });
    const first = await createLoad(owner, rig.id, { name: 'First', watts: 1, position: 0 });
    expect([a.position, b.position]).toEqual([0, 1]);
    const res = await api(`/api/rigs/${rig.id}/loads`, { session: owner });
    expect(res.status).toBe(200);
    expect((await res.json()).map((l: { name: string }) => l.name)).toEqual(['A', 'First', 'B']);
    expect(first.position).toBe(0);
  });

  it('names the fields that need fixing', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: { name: '', watts: -1, windows: [[25, 3]], supply: 'solar' } });
    expect(res.status).toBe(400);
    const paths = (await res.json()).issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'watts', 'windows.0.0', 'supply']));
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
    expect(activity(rig.id)).toEqual([]);
  });

  it("answers 404 for another crew's rig", async () => {
    const rig = await createRig(owner);
    expect((await api(`/api/rigs/${rig.id}/loads`, { session: stranger })).status).toBe(404);
    expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: stranger, json: fridge })).status).toBe(404);
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
  });
});

describe('PATCH /api/loads/:id', () => {
  it('changes the fields sent, increments the version and records before → after', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, { ...fridge, note: 'Door seal is old' });
    const res = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: 1, watts: 60, windows: [[18, 23], [6, 8]] } });
    expect(res.status).toBe(200);
    const after = await res.json();
    // Regression: .partial() used to reset unsent fields to their defaults (note '', dutyPct 100).
    expect(after).toMatchObject({ watts: 60, windows: [[18, 23], [6, 8]], note: 'Door seal is old', dutyPct: 40, response: 'cooling', version: 2 });
    const log = activity(rig.id);
    expect(log.map((l) => l.action)).toEqual(['added', 'changed']);
    expect(JSON.parse(at(log, 1, 'activity row').changes)).toEqual({ watts: [45, 60], windows: [[[0, 24]], [[18, 23], [6, 8]]] });
  });

  it('needs the version read (400 naming version)', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    const res = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { watts: 50 } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues.map((i: { path: string }) => i.path)).toEqual(['version']);
  });

  it('answers 409 with the current load on a stale version, and changes nothing', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: 1, watts: 50 } });
    const res = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: 1, watts: 99, name: 'Stale' } });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error).toEqual({ code: 'conflict', message: 'Someone changed this load since you opened it.' });
    expect(body.current).toMatchObject({ id: load.id, watts: 50, name: 'Compressor fridge', version: 2, addedBy: { id: owner.userId } });
    expect(dbGet('select watts, name, version from loads where id = ?', load.id)).toEqual({ watts: 50, name: 'Compressor fridge', version: 2 });
    expect(activity(rig.id).map((l) => l.action)).toEqual(['added', 'changed']);
  });

  it("answers 404 for another crew's load, and changes nothing", async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    const res = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: stranger, json: { version: 1, watts: 1 } });
    expect(res.status).toBe(404);
    expect((await api('/api/loads/no-such-load', { method: 'PATCH', session: owner, json: { version: 1 } })).status).toBe(404);
    expect(dbGet('select watts from loads where id = ?', load.id)).toEqual({ watts: 45 });
  });
});

describe('DELETE /api/loads/:id', () => {
  it('removes with ?version=N and keeps a "removed" activity row', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    const res = await api(`/api/loads/${load.id}?version=1`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(204);
    expect(dbGet('select id from loads where id = ?', load.id)).toBeUndefined();
    const log = activity(rig.id);
    expect(log.map((l) => [l.action, l.load_id, l.load_name])).toEqual([
      ['added', load.id, 'Compressor fridge'],
      ['removed', load.id, 'Compressor fridge'],
    ]);
    expect(JSON.parse(at(log, 1, 'activity row').changes).watts).toEqual([45, null]);
  });

  it('answers 409 with the current load on a stale version, and removes nothing', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: 1, quantity: 2 } });
    const res = await api(`/api/loads/${load.id}`, { method: 'DELETE', session: owner, headers: { 'if-match': '1' } });
    expect(res.status).toBe(409);
    expect((await res.json()).current).toMatchObject({ id: load.id, quantity: 2, version: 2 });
    expect(dbGet('select version from loads where id = ?', load.id)).toEqual({ version: 2 });
    expect(activity(rig.id).map((l) => l.action)).toEqual(['added', 'changed']);
  });

  it('needs the version, and answers 404 to another crew', async () => {
    const rig = await createRig(owner);
    const load = await createLoad(owner, rig.id, fridge);
    const missing = await api(`/api/loads/${load.id}`, { method: 'DELETE', session: owner });
    expect(missing.status).toBe(400);
    expect((await missing.json()).issues[0].path).toBe('version');
    expect((await api(`/api/loads/${load.id}?version=1`, { method: 'DELETE', session: stranger })).status).toBe(404);
    expect(dbGet('select id from loads where id = ?', load.id)).toBeDefined();
  });
});

describe('POST /api/rigs/:id/loads/import', () => {
  const good = [
    'name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note',
    'Fridge,45,1,dc,0-24,40,all,cooling,18,no,',
    'LED lights,1.2,6,dc,18-23;6-8,100,all,none,18,no,"0.1 A each, six fixtures"',
    'Furnace blower,60,1,dc,0-24,100,camp,heating,19,no,',
    'Detectors and radio memory,14,1,dc,0-24,100,all,none,18,yes,parasitic',
  ].join('\n');

  it('previews without saving: rows with their lines, errors by line and column', async () => {
    const rig = await createRig(owner);
    const csv = 'name,watts,windows\nFridge,45,0-24\nLamp,abc,18-23\n\nFan,12,25-3\n';
    const res = await csvImport(rig.id, csv, owner, '?preview=1');
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.rows).toEqual([expect.objectContaining({ line: 2, name: 'Fridge', watts: 45, windows: [[0, 24]] })]);
    expect(body.errors).toEqual([
      { line: 3, column: 'watts', message: expect.stringContaining('not a number') },
      { line: 5, column: 'windows', message: expect.any(String) },
    ]);
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
  });

  it('imports every row in one go, with an "imported" activity row per load', async () => {
    const rig = await createRig(owner);
    await createLoad(owner, rig.id, { name: 'Already there', watts: 5 });
    const res = await csvImport(rig.id, good, owner);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.imported).toBe(4);
    expect(body.loads.map((l: { name: string; position: number }) => [l.name, l.position])).toEqual([
      ['Fridge', 1],
      ['LED lights', 2],
      ['Furnace blower', 3],
      ['Detectors and radio memory', 4],
    ]);
    expect(body.loads[1]).toMatchObject({ watts: 1.2, quantity: 6, windows: [[18, 23], [6, 8]], note: '0.1 A each, six fixtures' });
    expect(body.loads[3]).toMatchObject({ standby: true });
    expect(activity(rig.id).map((l) => l.action)).toEqual(['added', 'imported', 'imported', 'imported', 'imported']);
  });

  it('refuses the whole file when one line is wrong: 400 with issues by line, nothing saved', async () => {
    const rig = await createRig(owner);
    const csv = good + '\nHeater pad,,1,dc,0-24,100,all,none,18,maybe,';
    const res = await csvImport(rig.id, csv, owner);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_request');
    expect(body.issues).toEqual([
      { path: 'line 6.standby', message: expect.stringContaining('yes or no') },
      { path: 'line 6.watts', message: expect.any(String) },
    ]);
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
    expect(activity(rig.id)).toEqual([]);
  });

  it('counts lines as the file has them, quoted line breaks included', async () => {
    const rig = await createRig(owner);
    const csv = 'name,watts,note\r\nFridge,45,"two\r\nlines"\r\nLamp,-3,\r\n';
    const res = await csvImport(rig.id, csv, owner);
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toEqual([{ path: 'line 4.watts', message: expect.any(String) }]);
  });

  it('reads a Windows-1252 file, as spreadsheets on Windows save CSV', async () => {
    const rig = await createRig(owner);
    const bytes = Uint8Array.from([...Buffer.from('name,watts\nCaf'), 0xe9, ...Buffer.from(' maker,800\n')]);
    const res = await api(`/api/rigs/${rig.id}/loads/import`, { method: 'POST', session: owner, headers: { 'content-type': 'text/csv' }, body: bytes });
    expect(res.status).toBe(201);
    expect((await res.json()).loads[0].name).toBe('Café maker');
  });

  it('accepts JSON { csv }', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}/loads/import`, { method: 'POST', session: owner, json: { csv: 'name,watts\nCPAP,25\n' } });
    expect(res.status).toBe(201);
    expect((await res.json()).loads[0]).toMatchObject({ name: 'CPAP', watts: 25 });
  });

  it('refuses a wrong content type (415), a missing csv field (400) and more than 1 MB (413)', async () => {
    const rig = await createRig(owner);
    const xml = await api(`/api/rigs/${rig.id}/loads/import`, { method: 'POST', session: owner, headers: { 'content-type': 'application/xml' }, body: '<x/>' });
    expect(xml.status).toBe(415);
    expect((await xml.json()).error.code).toBe('unsupported_media_type');
    const noCsv = await api(`/api/rigs/${rig.id}/loads/import`, { method: 'POST', session: owner, json: { text: 'name,watts' } });
    expect(noCsv.status).toBe(400);
    expect((await noCsv.json()).issues[0].path).toBe('csv');
    const big = 'name,watts,note\n' + `Lamp,5,${'x'.repeat(400)}\n`.repeat(3000);
    const huge = await csvImport(rig.id, big, owner);
    expect(huge.status).toBe(413);
    const hugeJson = await api(`/api/rigs/${rig.id}/loads/import`, { method: 'POST', session: owner, json: { csv: big } });
    expect(hugeJson.status).toBe(413);
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
  });

  it('stops at the 200-load limit of a rig, naming the first line over it', async () => {
    const rig = await createRig(owner);
    const csv = 'name,watts\n' + Array.from({ length: 201 }, (_, i) => `Load ${i + 1},1`).join('\n');
    const res = await csvImport(rig.id, csv, owner);
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toEqual([{ path: 'line 202', message: expect.stringContaining('at most 200') }]);
  });

  it("answers 404 for another crew's rig", async () => {
    const rig = await createRig(owner);
    expect((await csvImport(rig.id, good, stranger)).status).toBe(404);
    expect(dbAll('select id from loads where rig_id = ?', rig.id)).toEqual([]);
  });
});

describe('revision 2 load fields: location and surge watts', () => {
  it('saves a load’s place and surge, reads them back, changes them, and defaults an old-style load to the cabin with no surge', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: { ...fridge, location: 'outside', surgeWatts: 150 } });
    expect(res.status).toBe(201);
    const load = await res.json();
    expect(load).toMatchObject({ location: 'outside', surgeWatts: 150 });
    expect(dbGet<{ location: string; surge_watts: number | null }>('select location, surge_watts from loads where id = ?', load.id)).toEqual({ location: 'outside', surge_watts: 150 });

    const patched = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: load.version, location: 'cabin', surgeWatts: null } });
    expect(patched.status).toBe(200);
    expect(await patched.json()).toMatchObject({ location: 'cabin', surgeWatts: null, watts: 45 });
    // The activity trail names the changed fields.
    const changed = activity(rig.id).find((a) => a.action === 'changed');
    expect(JSON.parse(changed!.changes)).toMatchObject({ location: ['outside', 'cabin'], surgeWatts: [150, null] });

    const plain = await createLoad(owner, rig.id, { name: 'Lamp', watts: 5 });
    expect(plain).toMatchObject({ location: 'cabin', surgeWatts: null });
  });

  it('refuses a place that is not cabin or outside and a negative surge, naming the field', async () => {
    const rig = await createRig(owner);
    const res = await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: { ...fridge, location: 'roof', surgeWatts: -5 } });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.issues.map((i: { path: string }) => i.path).sort()).toEqual(['location', 'surgeWatts']);
  });

  it('imports a CSV with the place and surge columns, and one without them (cabin, no surge)', async () => {
    const rig = await createRig(owner);
    const res = await csvImport(rig.id, 'name,watts,response,location,surge watts\nLocker fridge,50,cooling,outside,180\nMicrowave,1200,none,,1500\n', owner);
    expect(res.status).toBe(201);
    const old = await csvImport(rig.id, 'name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note\nCPAP,25,1,dc,22-6,100,all,none,18,no,\n', owner);
    expect(old.status).toBe(201);
    const loads = await (await api(`/api/rigs/${rig.id}/loads`, { session: owner })).json();
    expect(loads.map((l: { name: string; location: string; surgeWatts: number | null }) => [l.name, l.location, l.surgeWatts])).toEqual([
      ['Locker fridge', 'outside', 180],
      ['Microwave', 'cabin', 1500],
      ['CPAP', 'cabin', null],
    ]);
  });
});

describe('GET /api/rigs/:id/loads.csv', () => {
  it('downloads the loads as CSV with the import columns', async () => {
    const rig = await createRig(owner, { name: 'Señora Van' });
    await createLoad(owner, rig.id, { ...fridge, note: 'hums, a bit' });
    const res = await api(`/api/rigs/${rig.id}/loads.csv`, { session: owner });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="senora-van-loads.csv"');
    const text = await res.text();
    const lines = text.replace(/^\uFEFF/, '').split('\r\n');
    expect(lines[0]).toBe('name,watts,quantity,supply,windows,dutyPct,days,response,setpointC,standby,note,location,surgeWatts');
    expect(lines[1]).toBe('Compressor fridge,45,1,dc,0-24,40,all,cooling,18,no,"hums, a bit",cabin,');
  });

  it('escapes formula-like cells with an apostrophe, and leaves negative numbers alone', async () => {
    const rig = await createRig(owner);
    await createLoad(owner, rig.id, { name: '=HYPERLINK("http://x.test","fridge")', watts: 45, note: '@SUM(A1)' });
    await createLoad(owner, rig.id, { name: '+1 lamp', watts: 5, response: 'heating', setpointC: -5, note: '-oops' });
    const text = (await (await api(`/api/rigs/${rig.id}/loads.csv`, { session: owner })).text()).replace(/^\uFEFF/, '');
    const [, first, second] = text.split('\r\n');
    expect(first).toBe(`"'=HYPERLINK(""http://x.test"",""fridge"")",45,1,dc,0-24,100,all,none,18,no,'@SUM(A1),cabin,`);
    expect(second).toBe(`'+1 lamp,5,1,dc,0-24,100,all,heating,-5,no,'-oops,cabin,`);
  });

  it('round-trips: export, then import into another rig, gives the same loads', async () => {
    const from = await createRig(owner);
    await createLoad(owner, from.id, { ...fridge, note: 'line one\nline two', windows: [[22, 6]] });
    await createLoad(owner, from.id, { name: '=cmd|calc', watts: 0.35, quantity: 3, supply: 'ac', windows: [], dutyPct: 12.5, days: 'drive', response: 'heating', setpointC: -2.5, standby: true, note: "'quoted, \"really\"" });
    await createLoad(owner, from.id, { name: 'Søren’s CPAP', watts: 78, windows: [[22, 24], [0, 6]] });
    await createLoad(owner, from.id, { name: 'Locker fridge', watts: 50, dutyPct: 35, response: 'cooling', location: 'outside', surgeWatts: 180 });
    const csv = await (await api(`/api/rigs/${from.id}/loads.csv`, { session: owner })).text();
    const to = await createRig(owner);
    const res = await csvImport(to.id, csv, owner);
    expect(res.status).toBe(201);
    const strip = (l: Record<string, unknown>) => {
      const { id, rigId, version, createdAt, updatedAt, addedBy, ...rest } = l;
      return rest;
    };
    const before = (await (await api(`/api/rigs/${from.id}/loads`, { session: owner })).json()).map(strip);
    const after = (await (await api(`/api/rigs/${to.id}/loads`, { session: owner })).json()).map(strip);
    expect(after).toEqual(before);
  });

  it("answers 404 for another crew's rig", async () => {
    const rig = await createRig(owner);
    expect((await api(`/api/rigs/${rig.id}/loads.csv`, { session: stranger })).status).toBe(404);
  });
});
