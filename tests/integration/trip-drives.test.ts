import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { createRig } from '../helpers/fixtures';

let owner: Session;
let rig: { id: string };

// Mesa camp (Denver time) for 3 nights from 21 Oct 2027, then Canyon rim (Phoenix time) from 16:00 on 24 Oct.
const stops = [
  { name: 'Mesa camp', lat: 35.6, lon: -105.9, timeZone: 'America/Denver', arrive: '2027-10-21', nights: 3 },
  { name: 'Canyon rim', lat: 36.06, lon: -112.14, timeZone: 'America/Phoenix', arrive: '2027-10-24', nights: 2, arriveHour: 16 },
];
const longDrive = [{ date: '2027-10-24', startHour: 9, hours: 30 }];

beforeAll(async () => {
  owner = await signUp({ name: 'Drive Tester' });
  rig = await createRig(owner);
});

const pathsOf = async (res: Response) => ((await res.json()).issues as { path: string; message: string }[]);

describe('trips API: where a drive may lie', () => {
  it('POST answers 400 naming drives.0.hours for a 30-hour drive past the next stop’s arrival, and saves nothing', async () => {
    const before = await (await api(`/api/trips?rigId=${rig.id}`, { session: owner })).json();
    const res = await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'Too long a drive', stops, drives: longDrive } });
    expect(res.status).toBe(400);
    const issues = await pathsOf(res);
    const hours = issues.find((i) => i.path === 'drives.0.hours');
    expect(hours?.message).toContain('would still be on the road when you arrive at Canyon rim');
    const after = await (await api(`/api/trips?rigId=${rig.id}`, { session: owner })).json();
    expect(after.length).toBe(before.length);
  });

  it('PATCH answers 400 for the same drive on a saved trip and keeps the trip as it was', async () => {
    const created = await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'October high desert', stops, drives: [{ date: '2027-10-24', startHour: 9, hours: 4 }] } });
    expect(created.status).toBe(201);
    const t = await created.json();
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: t.version, drives: longDrive } });
    expect(res.status).toBe(400);
    expect((await pathsOf(res)).map((i) => i.path)).toContain('drives.0.hours');
    const now = await (await api(`/api/trips/${t.id}`, { session: owner })).json();
    expect(now.drives).toEqual([{ date: '2027-10-24', startHour: 9, hours: 4 }]);
    expect(now.version).toBe(t.version);
  });

  it('PATCH answers 400 naming drives.1.startHour for two drives that overlap', async () => {
    const created = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'Two drives', stops } })).json();
    const res = await api(`/api/trips/${created.id}`, {
      method: 'PATCH',
      session: owner,
      json: { version: created.version, drives: [{ date: '2027-10-22', startHour: 9, hours: 4 }, { date: '2027-10-22', startHour: 11, hours: 2 }] },
    });
    expect(res.status).toBe(400);
    expect((await pathsOf(res)).map((i) => i.path)).toEqual(['drives.1.startHour']);
  });
});
