import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { addMember, createRig, dbGet } from '../helpers/fixtures';

let owner: Session;
let stranger: Session;
let rig: any;

// The invented demo trip of product.md: two high-desert stops in late October with a drive day between.
const stops = [
  {
    name: 'Mesa camp',
    lat: 35.6,
    lon: -105.9,
    timeZone: 'America/Denver',
    arrive: '2027-10-21',
    nights: 3,
    shadePct: 10,
    weather: [{ date: '2027-10-21', cloudOktas: 2, highC: 18, lowC: -2 }],
  },
  { name: 'Canyon rim', lat: 36.06, lon: -112.14, timeZone: 'America/Phoenix', arrive: '2027-10-24', nights: 2, arriveHour: 16 },
];
const drives = [{ date: '2027-10-24', startHour: 9, hours: 4 }];
const trip = () => ({ rigId: rig.id, name: 'October high desert', stops, drives });

async function createTrip(session: Session, body: Record<string, unknown>): Promise<any> {
  const res = await api('/api/trips', { method: 'POST', session, json: body });
  if (res.status !== 201) throw new Error(`createTrip: ${res.status} ${await res.text()}`);
  return res.json();
}

beforeAll(async () => {
  owner = await signUp({ name: 'Rosa Reyes' });
  stranger = await signUp({ name: 'Someone Else' });
  rig = await createRig(owner);
});

describe('anonymous callers', () => {
  it.each([
    ['GET', '/api/trips'],
    ['POST', '/api/trips'],
    ['GET', '/api/trips/x'],
    ['PATCH', '/api/trips/x'],
    ['DELETE', '/api/trips/x?version=1'],
  ])('get 401 from %s %s', async (method, path) => {
    const res = await api(path, { method, json: method === 'POST' || method === 'PATCH' ? {} : undefined });
    expect(res.status).toBe(401);
  });
});

describe('POST /api/trips', () => {
  it("saves a trip on the user's rig with the contract defaults filled in", async () => {
    const res = await api('/api/trips', { method: 'POST', session: owner, json: trip() });
    expect(res.status).toBe(201);
    const t = await res.json();
    expect(res.headers.get('location')).toBe(`/api/trips/${t.id}`);
    expect(t).toMatchObject({
      rigId: rig.id,
      crewId: rig.crewId,
      name: 'October high desert',
      drives,
      reserveSocPct: null,
      canEdit: true,
      version: 1,
    });
    expect(t.stops[0]).toMatchObject({ name: 'Mesa camp', arriveHour: 15, hookup: 'none', generatorHours: [8, 20], shadePct: 10 });
    expect(t.stops[1]).toMatchObject({ arriveHour: 16, weather: [] });
    expect(dbGet('select created_by, crew_id from trips where id = ?', t.id)).toEqual({ created_by: owner.userId, crew_id: rig.crewId });
  });

  it('names the fields that need fixing', async () => {
    const res = await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: '', stops: [{ ...stops[0], lat: 95, timeZone: 'Mars/Olympus' }] } });
    expect(res.status).toBe(400);
    const paths = (await res.json()).issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'stops.0.lat', 'stops.0.timeZone']));
  });

  it('checks the itinerary rules: stops in order without overlap, drives inside the trip', async () => {
    const overlap = await api('/api/trips', { method: 'POST', session: owner, json: { ...trip(), stops: [stops[0], { ...stops[1], arrive: '2027-10-22' }] } });
    expect(overlap.status).toBe(400);
    expect((await overlap.json()).issues).toEqual([{ path: 'stops.1.arrive', message: expect.stringContaining('overlaps') }]);
    const outside = await api('/api/trips', { method: 'POST', session: owner, json: { ...trip(), drives: [{ date: '2027-11-10', startHour: 9, hours: 4 }] } });
    expect(outside.status).toBe(400);
    // Engine revision 2 words the rule as where a drive may start (at or after the first arrival, before the end).
    expect((await outside.json()).issues).toEqual([{ path: 'drives.0.date', message: expect.stringContaining('must start inside the trip') }]);
    const weather = await api('/api/trips', { method: 'POST', session: owner, json: { ...trip(), stops: [{ ...stops[0], weather: [{ date: '2027-10-21', cloudOktas: 2, highC: -5, lowC: 3 }] }, stops[1]] } });
    expect((await weather.json()).issues).toEqual([{ path: 'stops.0.weather.0.highC', message: expect.any(String) }]);
  });

  it("answers 404 naming rigId for an unknown rig or another crew's rig", async () => {
    for (const rigId of ['no-such-rig', (await createRig(stranger)).id]) {
      const res = await api('/api/trips', { method: 'POST', session: owner, json: { ...trip(), rigId } });
      expect(res.status).toBe(404);
      expect((await res.json()).issues).toEqual([{ path: 'rigId', message: expect.any(String) }]);
    }
  });

  it('answers 403 naming rigId to a crew viewer', async () => {
    const viewer = await signUp({ name: 'Viewer' });
    addMember(rig.crewId, viewer.userId, 'viewer');
    const res = await api('/api/trips', { method: 'POST', session: viewer, json: trip() });
    expect(res.status).toBe(403);
    expect((await res.json()).issues).toEqual([{ path: 'rigId', message: expect.any(String) }]);
    // …but sees the crew's trips, read-only.
    const list = await (await api(`/api/trips?rigId=${rig.id}`, { session: viewer })).json();
    expect(list.length).toBeGreaterThan(0);
    expect(list.every((t: { canEdit: boolean }) => t.canEdit === false)).toBe(true);
  });
});

describe('GET /api/trips and /api/trips/:id', () => {
  it("lists the trips of the user's rigs by start date, optionally of one rig", async () => {
    const other = await createRig(owner, { name: 'Trailer' });
    const later = await createTrip(owner, { ...trip(), name: 'Later', stops: [{ ...stops[0], arrive: '2028-05-01' }], drives: [] });
    const onOther = await createTrip(owner, { ...trip(), rigId: other.id, name: 'On the trailer', stops: [{ ...stops[0], arrive: '2026-05-01' }], drives: [] });
    const all = await (await api('/api/trips', { session: owner })).json();
    const names = all.map((t: { name: string }) => t.name);
    expect(names.indexOf('On the trailer')).toBeLessThan(names.indexOf('Later'));
    const one = await api(`/api/trips?rigId=${other.id}`, { session: owner });
    expect(one.status).toBe(200);
    expect((await one.json()).map((t: { id: string }) => t.id)).toEqual([onOther.id]);
    expect(names).toContain(later.name);
    const theirs = await (await api('/api/trips', { session: stranger })).json();
    expect(theirs.map((t: { id: string }) => t.id)).not.toContain(later.id);
  });

  it("answers 404 naming rigId when filtering by another crew's rig", async () => {
    const res = await api(`/api/trips?rigId=${rig.id}`, { session: stranger });
    expect(res.status).toBe(404);
    expect((await res.json()).issues[0].path).toBe('rigId');
  });

  it("reads one trip, and answers 404 to another crew", async () => {
    const t = await createTrip(owner, trip());
    const res = await api(`/api/trips/${t.id}`, { session: owner });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual(t);
    expect((await api(`/api/trips/${t.id}`, { session: stranger })).status).toBe(404);
    expect((await api('/api/trips/no-such-trip', { session: owner })).status).toBe(404);
  });
});

describe('PATCH /api/trips/:id', () => {
  it('changes the fields sent and increments the version', async () => {
    const t = await createTrip(owner, { ...trip(), reserveSocPct: 30 });
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Renamed' } });
    expect(res.status).toBe(200);
    // Regression: .partial() used to reset drives to [] and reserveSocPct to null when not sent.
    expect(await res.json()).toMatchObject({ name: 'Renamed', version: 2, drives, reserveSocPct: 30, stops: t.stops });
  });

  it('checks the itinerary as it would be after the change', async () => {
    const t = await createTrip(owner, trip());
    // Revision 2 lets a drive start on the last morning (before 11:00), so keeping only the first
    // stop (3 nights: the trip ends 24 Oct, 11:00) would still hold the 09:00 drive on the 24th.
    // With 2 nights the trip ends on the 23rd and the drive on the 24th falls outside it.
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, stops: [{ ...stops[0], nights: 2 }] } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues).toEqual([{ path: 'drives.0.date', message: expect.any(String) }]);
    expect(dbGet('select version from trips where id = ?', t.id)).toEqual({ version: 1 });
  });

  it('moves the trip to another rig of the user, but not to a rig of another crew', async () => {
    const t = await createTrip(owner, trip());
    const other = await createRig(owner, { name: 'Second rig' });
    const moved = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, rigId: other.id } });
    expect(moved.status).toBe(200);
    expect((await moved.json()).rigId).toBe(other.id);
    const foreign = await createRig(stranger);
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 2, rigId: foreign.id } });
    expect(res.status).toBe(404);
    expect((await res.json()).issues[0].path).toBe('rigId');
  });

  it('needs the version read (400 naming version)', async () => {
    const t = await createTrip(owner, trip());
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { name: 'x' } });
    expect(res.status).toBe(400);
    expect((await res.json()).issues.map((i: { path: string }) => i.path)).toEqual(['version']);
  });

  it('answers 409 with the current trip on a stale version, and changes nothing', async () => {
    const t = await createTrip(owner, trip());
    await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'First edit' } });
    // Stale and, against today's stops, also an invalid itinerary: the conflict is what the user must see.
    const res = await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Second edit', drives: [{ date: '2030-01-01', startHour: 9, hours: 2 }] } });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error).toEqual({ code: 'conflict', message: 'Someone changed this trip since you opened it.' });
    expect(body.current).toMatchObject({ id: t.id, name: 'First edit', version: 2, drives });
    const row = dbGet<{ name: string; version: number; drives: string }>('select name, version, drives from trips where id = ?', t.id)!;
    expect([row.name, row.version, JSON.parse(row.drives)]).toEqual(['First edit', 2, drives]);
  });

  it("answers 404 for another crew's trip", async () => {
    const t = await createTrip(owner, trip());
    expect((await api(`/api/trips/${t.id}`, { method: 'PATCH', session: stranger, json: { version: 1, name: 'x' } })).status).toBe(404);
    expect(dbGet('select name from trips where id = ?', t.id)).toEqual({ name: 'October high desert' });
  });
});

describe('DELETE /api/trips/:id', () => {
  it('deletes with ?version=N', async () => {
    const t = await createTrip(owner, trip());
    const res = await api(`/api/trips/${t.id}?version=1`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(204);
    // Kept for 30 days (restorable), hidden meanwhile.
    expect(dbGet('select deleted_by from trips where id = ?', t.id)).toEqual({ deleted_by: owner.userId });
    expect((await api(`/api/trips/${t.id}`, { session: owner })).status).toBe(404);
  });

  it('answers 409 with the current trip on a stale version, and deletes nothing', async () => {
    const t = await createTrip(owner, trip());
    await api(`/api/trips/${t.id}`, { method: 'PATCH', session: owner, json: { version: 1, name: 'Edited' } });
    const res = await api(`/api/trips/${t.id}?version=1`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(409);
    expect((await res.json()).current).toMatchObject({ id: t.id, name: 'Edited', version: 2 });
    expect(dbGet('select version from trips where id = ?', t.id)).toEqual({ version: 2 });
  });

  it("needs the version, and answers 404 to another crew", async () => {
    const t = await createTrip(owner, trip());
    const res = await api(`/api/trips/${t.id}`, { method: 'DELETE', session: owner });
    expect(res.status).toBe(400);
    expect((await res.json()).issues[0].path).toBe('version');
    expect((await api(`/api/trips/${t.id}?version=1`, { method: 'DELETE', session: stranger })).status).toBe(404);
    expect(dbGet('select id from trips where id = ?', t.id)).toBeDefined();
  });

  it('goes with its rig', async () => {
    const r = await createRig(owner, { name: 'Short-lived' });
    const t = await createTrip(owner, { ...trip(), rigId: r.id });
    expect((await api(`/api/rigs/${r.id}?version=1`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(`/api/trips/${t.id}`, { session: owner })).status).toBe(404);
    expect((await (await api('/api/trips', { session: owner })).json()).some((x: { id: string }) => x.id === t.id)).toBe(false);
  });
});
