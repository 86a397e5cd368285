import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { addMember, createLoad, createRig, dbAll, personalCrewId } from '../helpers/fixtures';

let owner: Session;
let editor: Session;

beforeAll(async () => {
  owner = await signUp({ name: 'Rosa Reyes' });
  editor = await signUp({ name: 'Tobi Hart' });
});

// Typical figures from trade-notes.md (compressor fridge 35–60 W [meas], LED ~0.1 A per fixture [meas]);
// the tests only need plausible numbers.
async function rigWithTwoLoads(): Promise<{ id: string }> {
  const rig = await createRig(owner);
  await createLoad(owner, rig.id, { name: 'Compressor fridge', watts: 45, dutyPct: 45, response: 'cooling' });
  await createLoad(owner, rig.id, { name: 'LED lights', watts: 1.5, quantity: 6, windows: [[18, 23]] });
  return rig;
}

const importCsv = (rigId: string, body: string, query: string, session = owner) =>
  api(`/api/rigs/${rigId}/loads/import${query}`, { method: 'POST', session, headers: { 'content-type': 'text/csv' }, body });
const names = async (rigId: string) => ((await (await api(`/api/rigs/${rigId}/loads`, { session: owner })).json()) as { name: string }[]).map((l) => l.name);
const exported = async (rigId: string) => (await api(`/api/rigs/${rigId}/loads.csv`, { session: owner })).text();
const actions = (rigId: string) => dbAll<{ action: string; load_name: string }>('select action, load_name from load_activity where rig_id = ? order by at, action desc, load_name', rigId);

describe('importing the list’s own export', () => {
  it('adding doubles the list, and the preview says which names are already there', async () => {
    const rig = await rigWithTwoLoads();
    const csv = await exported(rig.id);
    const preview = await (await importCsv(rig.id, csv, '?preview=1&mode=add')).json();
    expect(preview.alreadyListed.map((r: { name: string }) => r.name)).toEqual(['Compressor fridge', 'LED lights']);
    expect(preview.alreadyListed.map((r: { line: number }) => r.line)).toEqual([2, 3]);
    expect((await importCsv(rig.id, csv, '?mode=add')).status).toBe(201);
    expect((await names(rig.id)).sort()).toEqual(['Compressor fridge', 'Compressor fridge', 'LED lights', 'LED lights']);
  });

  it('replacing gives the same list once, after a preview listing what goes, with removed and imported activity rows', async () => {
    const rig = await rigWithTwoLoads();
    const csv = await exported(rig.id);
    const preview = await (await importCsv(rig.id, csv, '?preview=1&mode=replace')).json();
    expect(preview.list.loads.map((l: { name: string }) => l.name)).toEqual(['Compressor fridge', 'LED lights']);
    expect(preview.list.version).toMatch(/^[0-9a-f]{20}$/);
    const res = await importCsv(rig.id, csv, `?mode=replace&listVersion=${preview.list.version}`);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ imported: 2, removed: 2 });
    expect(await names(rig.id)).toEqual(['Compressor fridge', 'LED lights']);
    expect(actions(rig.id).filter((a) => a.action !== 'added')).toEqual([
      { action: 'removed', load_name: 'Compressor fridge' },
      { action: 'removed', load_name: 'LED lights' },
      { action: 'imported', load_name: 'Compressor fridge' },
      { action: 'imported', load_name: 'LED lights' },
    ]);
  });
});

describe('replacing with two editors', () => {
  it('answers 409 with the list as it is now when another editor added a load after the check, and changes nothing', async () => {
    const rig = await rigWithTwoLoads();
    addMember(personalCrewId(owner.userId), editor.userId, 'editor');
    const csv = 'name,watts\nWater pump,50\n';
    const preview = await (await importCsv(rig.id, csv, '?preview=1&mode=replace')).json();
    await createLoad(editor, rig.id, { name: 'Roof vent fan', watts: 18 });
    const res = await importCsv(rig.id, csv, `?mode=replace&listVersion=${preview.list.version}`);
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error.code).toBe('conflict');
    expect(body.current.loads.map((l: { name: string }) => l.name)).toContain('Roof vent fan');
    expect(body.current.version).not.toBe(preview.list.version);
    expect(await names(rig.id)).toEqual(['Compressor fridge', 'LED lights', 'Roof vent fan']);
  });

  it('answers 409 when a load was changed after the check', async () => {
    const rig = await rigWithTwoLoads();
    const preview = await (await importCsv(rig.id, 'name,watts\nWater pump,50\n', '?preview=1&mode=replace')).json();
    const [fridge] = await (await api(`/api/rigs/${rig.id}/loads`, { session: owner })).json();
    expect((await api(`/api/loads/${fridge.id}`, { method: 'PATCH', session: owner, json: { version: fridge.version, watts: 50 } })).status).toBe(200);
    expect((await importCsv(rig.id, 'name,watts\nWater pump,50\n', `?mode=replace&listVersion=${preview.list.version}`)).status).toBe(409);
    expect(await names(rig.id)).toEqual(['Compressor fridge', 'LED lights']);
  });
});

describe('replacing refuses without losing anything', () => {
  it('a file with a bad row removes nothing and imports nothing (400 naming the line)', async () => {
    const rig = await rigWithTwoLoads();
    const csv = 'name,watts\nWater pump,50\nHeater pads,lots\n';
    const preview = await (await importCsv(rig.id, csv, '?preview=1&mode=replace')).json();
    const before = actions(rig.id).length;
    const res = await importCsv(rig.id, csv, `?mode=replace&listVersion=${preview.list.version}`);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.message).toContain('nothing removed');
    expect(body.issues.map((i: { path: string }) => i.path)).toEqual(['line 3.watts']);
    expect(await names(rig.id)).toEqual(['Compressor fridge', 'LED lights']);
    expect(actions(rig.id).length).toBe(before);
  });

  it('asks for the list version (400 naming listVersion) and a known mode (400 naming mode)', async () => {
    const rig = await rigWithTwoLoads();
    const noVersion = await importCsv(rig.id, 'name,watts\nWater pump,50\n', '?mode=replace');
    expect(noVersion.status).toBe(400);
    expect((await noVersion.json()).issues.map((i: { path: string }) => i.path)).toEqual(['listVersion']);
    const badMode = await importCsv(rig.id, 'name,watts\nWater pump,50\n', '?mode=merge');
    expect(badMode.status).toBe(400);
    expect((await badMode.json()).issues.map((i: { path: string }) => i.path)).toEqual(['mode']);
    expect(await names(rig.id)).toEqual(['Compressor fridge', 'LED lights']);
  });

  it('a replace may bring a full list: the room is the whole list, not what is left', async () => {
    const rig = await rigWithTwoLoads();
    const lines = Array.from({ length: 200 }, (_, i) => `Load ${i + 1},1`);
    const csv = `name,watts\n${lines.join('\n')}\n`;
    const addPreview = await (await importCsv(rig.id, csv, '?preview=1&mode=add')).json();
    const replacePreview = await (await importCsv(rig.id, csv, '?preview=1&mode=replace')).json();
    // A rig holds at most 200 loads (LIMITS.maxLoads): adding leaves room for 198, replacing for 200.
    expect(addPreview.errors).toEqual([expect.objectContaining({ line: 200, message: expect.stringContaining('room for 198 more') })]);
    expect(replacePreview.errors).toEqual([]);
    expect(replacePreview.rows.length).toBe(200);
  });
});
