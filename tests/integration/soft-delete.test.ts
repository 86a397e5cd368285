import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, makeTrip, member } from '../helpers/crew';
import { CHECK_IN_INPUT } from '../helpers/routes';
import { cleanup, startServer } from '../helpers/server';
import { openTestDb } from '../helpers/test-db';

// Issue 16, item 2: deleting a rig or a trip is for crew owners, says what goes with it, hides it
// everywhere at once, can be undone for 30 days, and is purged after that.

let owner: Session;
let editor: Session;
let installer: Session;
let crewId: string;

beforeAll(async () => {
  owner = await signUp({ name: 'Rig Owner' });
  crewId = (await activeCrew(owner)).id;
  editor = await member(owner, crewId, 'editor', 'Tobi Editor');
  installer = await signUp({ kind: 'installer', name: 'Shared Installer' });
});

async function body<T>(res: Response, status: number): Promise<T> {
  const text = await res.text();
  expect(res.status, text).toBe(status);
  return (text ? JSON.parse(text) : null) as T;
}

/** A rig with 2 loads, 2 trips, 5 saved forecasts and 3 check-ins. */
async function fullRig() {
  const rig = await makeRig(owner, crewId);
  await makeLoad(owner, rig.id);
  await makeLoad(owner, rig.id, { name: 'Water pump', watts: 60, dutyPct: 5 });
  const trips = [await makeTrip(owner, rig.id), await makeTrip(owner, rig.id)];
  const forecasts: string[] = [];
  for (const [i, n] of [3, 2].entries()) {
    for (let k = 0; k < n; k++) {
      const f = await body<{ id: string }>(
        await api(`/api/trips/${trips[i]!.id}/forecasts`, { method: 'POST', session: owner, json: { name: `Run ${k}` } }),
        201,
      );
      forecasts.push(f.id);
    }
  }
  for (const [i, n] of [2, 1].entries()) {
    for (let k = 0; k < n; k++)
      await body(await api(`/api/trips/${trips[i]!.id}/check-ins`, { method: 'POST', session: owner, json: CHECK_IN_INPUT() }), 201);
  }
  return { rig, trips, forecasts };
}

const version = async (s: Session, url: string) => (await body<{ version: number }>(await api(url, { session: s }), 200)).version;

describe('deleting a rig', () => {
  it('is refused to an editor with a message naming the owners, and the rig stays', async () => {
    const rig = await makeRig(owner, crewId);
    const res = await api(`/api/rigs/${rig.id}?version=${rig.version}`, { method: 'DELETE', session: editor });
    const err = await body<{ error: { code: string; message: string } }>(res, 403);
    expect(err.error.message).toMatch(/Only the crew's owners can delete a rig/);
    expect(err.error.message).toMatch(/saved forecasts and check-ins/);
    await body(await api(`/api/rigs/${rig.id}`, { session: editor }), 200);
    // The rig as the editor reads it says they cannot delete it; the owner's says they can.
    expect((await body<{ canDelete: boolean }>(await api(`/api/rigs/${rig.id}`, { session: editor }), 200)).canDelete).toBe(false);
    expect((await body<{ canDelete: boolean }>(await api(`/api/rigs/${rig.id}`, { session: owner }), 200)).canDelete).toBe(true);
  });

  it('counts what goes with it, hides all of it everywhere, lists it for owners, and restores all of it', async () => {
    const { rig, trips, forecasts } = await fullRig();
    await body(await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } }), 202);
    expect(
      (await body<{ rigId: string }[]>(await api('/api/installer/rigs', { session: installer }), 200)).some((r) => r.rigId === rig.id),
    ).toBe(true);

    expect(await body(await api(`/api/rigs/${rig.id}/deletion`, { session: owner }), 200)).toEqual({
      loads: 2,
      trips: 2,
      forecasts: 5,
      checkIns: 3,
      logs: 0,
    });

    const v = await version(owner, `/api/rigs/${rig.id}`);
    await body(await api(`/api/rigs/${rig.id}?version=${v}`, { method: 'DELETE', session: owner }), 204);

    // Hidden everywhere: the rig, its loads, trips, forecasts, check-ins; the lists; the installer's view; the pages.
    for (const url of [
      `/api/rigs/${rig.id}`,
      `/api/rigs/${rig.id}/loads`,
      `/api/trips/${trips[0]!.id}`,
      `/api/trips/${trips[1]!.id}/forecasts`,
      `/api/forecasts/${forecasts[0]}`,
      `/api/trips/${trips[0]!.id}/check-ins`,
    ]) {
      expect((await api(url, { session: owner })).status, url).toBe(404);
      expect((await api(url, { session: editor })).status, url).toBe(404);
    }
    expect((await api(`/api/rigs/${rig.id}`, { session: installer })).status).toBe(404);
    expect((await body<{ id: string }[]>(await api('/api/rigs', { session: owner }), 200)).some((r) => r.id === rig.id)).toBe(false);
    expect(
      (await body<{ id: string }[]>(await api('/api/trips', { session: editor }), 200)).some((t) => trips.some((x) => x.id === t.id)),
    ).toBe(false);
    expect(
      (await body<{ rigId: string }[]>(await api('/api/installer/rigs', { session: installer }), 200)).some((r) => r.rigId === rig.id),
    ).toBe(false);
    expect((await api(`/rigs/${rig.id}`, { session: owner })).status).toBe(404);
    expect((await api(`/trips/${trips[0]!.id}`, { session: owner })).status).toBe(404);
    expect((await api(`/trips/${trips[0]!.id}/forecasts/${forecasts[0]}`, { session: owner })).status).toBe(404);

    // Owners see it in "Recently deleted" with 30 days left; editors see nothing there and cannot restore it.
    const listed = await body<{ kind: string; id: string; daysLeft: number; deletedBy: string }[]>(
      await api('/api/deleted', { session: owner }),
      200,
    );
    expect(listed.find((d) => d.id === rig.id)).toMatchObject({ kind: 'rig', daysLeft: 30, deletedBy: 'Rig Owner' });
    expect((await body<{ id: string }[]>(await api('/api/deleted', { session: editor }), 200)).some((d) => d.id === rig.id)).toBe(false);
    expect((await api(`/api/rigs/${rig.id}/restore`, { method: 'POST', session: editor })).status).toBe(403);
    expect((await api(`/api/rigs/${rig.id}/restore`, { method: 'POST', session: installer })).status).toBe(403);

    const restored = await body<{ id: string; name: string }>(
      await api(`/api/rigs/${rig.id}/restore`, { method: 'POST', session: owner }),
      200,
    );
    expect(restored.id).toBe(rig.id);
    expect((await body<unknown[]>(await api(`/api/rigs/${rig.id}/loads`, { session: editor }), 200)).length).toBe(2);
    expect((await body<unknown[]>(await api(`/api/trips/${trips[0]!.id}/forecasts`, { session: editor }), 200)).length).toBe(3);
    expect((await body<unknown[]>(await api(`/api/trips/${trips[0]!.id}/check-ins`, { session: editor }), 200)).length).toBe(2);
    await body(await api(`/api/forecasts/${forecasts[4]}`, { session: owner }), 200);
    expect(
      (await body<{ rigId: string }[]>(await api('/api/installer/rigs', { session: installer }), 200)).some((r) => r.rigId === rig.id),
    ).toBe(true);
    expect((await body<{ id: string }[]>(await api('/api/deleted', { session: owner }), 200)).some((d) => d.id === rig.id)).toBe(false);
  });
});

describe('what a deletion counts', () => {
  it("counts the crew's saved forecasts, not the trip watch's own runs", async () => {
    const { rig, trips, forecasts } = await fullRig();
    // One of the first trip's three forecasts becomes a watch run (as the watch saves them: kind 'watch').
    const db = openTestDb({ write: true });
    db.prepare("update forecasts set kind = 'watch' where id = ?").run(forecasts[0]);
    db.close();
    expect(await body(await api(`/api/trips/${trips[0]!.id}/deletion`, { session: owner }), 200)).toEqual({ forecasts: 2, checkIns: 2 });
    expect(await body(await api(`/api/rigs/${rig.id}/deletion`, { session: owner }), 200)).toMatchObject({ forecasts: 4 });
  });
});

describe('deleting a trip', () => {
  it('is for owners, counts its forecasts and check-ins, and waits for its rig when both are deleted', async () => {
    const { rig, trips } = await fullRig();
    const trip = trips[0]!;
    expect(await body(await api(`/api/trips/${trip.id}/deletion`, { session: owner }), 200)).toEqual({ forecasts: 3, checkIns: 2 });
    const tv = await version(owner, `/api/trips/${trip.id}`);
    const refused = await body<{ error: { message: string } }>(
      await api(`/api/trips/${trip.id}?version=${tv}`, { method: 'DELETE', session: editor }),
      403,
    );
    expect(refused.error.message).toMatch(/Only the crew's owners can delete a trip/);

    await body(await api(`/api/trips/${trip.id}?version=${tv}`, { method: 'DELETE', session: owner }), 204);
    expect((await api(`/api/trips/${trip.id}`, { session: owner })).status).toBe(404);
    expect((await body<{ id: string }[]>(await api(`/api/trips?rigId=${rig.id}`, { session: owner }), 200)).map((t) => t.id)).toEqual([
      trips[1]!.id,
    ]);
    // The rig's own count no longer holds the deleted trip.
    expect(await body(await api(`/api/rigs/${rig.id}/deletion`, { session: owner }), 200)).toMatchObject({
      trips: 1,
      forecasts: 2,
      checkIns: 1,
    });

    const rv = await version(owner, `/api/rigs/${rig.id}`);
    await body(await api(`/api/rigs/${rig.id}?version=${rv}`, { method: 'DELETE', session: owner }), 204);
    const listed = await body<{ kind: string; id: string; rigDeleted?: boolean }[]>(await api('/api/deleted', { session: owner }), 200);
    expect(listed.find((d) => d.id === trip.id)).toMatchObject({ kind: 'trip', rigDeleted: true });
    const wait = await body<{ error: { message: string } }>(
      await api(`/api/trips/${trip.id}/restore`, { method: 'POST', session: owner }),
      409,
    );
    expect(wait.error.message).toMatch(/restore the rig first/);

    await body(await api(`/api/rigs/${rig.id}/restore`, { method: 'POST', session: owner }), 200);
    // The trip deleted on its own stays deleted until it is restored itself.
    expect((await api(`/api/trips/${trip.id}`, { session: owner })).status).toBe(404);
    await body(await api(`/api/trips/${trip.id}/restore`, { method: 'POST', session: owner }), 200);
    expect((await body<unknown[]>(await api(`/api/trips/${trip.id}/forecasts`, { session: owner }), 200)).length).toBe(3);
  });
});

describe('the purge', () => {
  let dir: string | undefined;
  afterAll(() => {
    if (dir) cleanup(dir);
  });

  it('removes rigs and trips deleted more than 30 days ago when a server starts, and keeps younger ones', async () => {
    const old = await fullRig();
    const young = await fullRig();
    const oldTrip = young.trips[0]!;
    await body(
      await api(`/api/rigs/${old.rig.id}?version=${await version(owner, `/api/rigs/${old.rig.id}`)}`, { method: 'DELETE', session: owner }),
      204,
    );
    await body(
      await api(`/api/trips/${oldTrip.id}?version=${await version(owner, `/api/trips/${oldTrip.id}`)}`, {
        method: 'DELETE',
        session: owner,
      }),
      204,
    );
    await body(
      await api(`/api/trips/${young.trips[1]!.id}?version=${await version(owner, `/api/trips/${young.trips[1]!.id}`)}`, {
        method: 'DELETE',
        session: owner,
      }),
      204,
    );

    // Make two of the deletions 31 days old; the third stays from today.
    const db = openTestDb({ write: true });
    const monthAgo = new Date(Date.now() - 31 * 86_400_000).toISOString();
    db.prepare('update rigs set deleted_at = ? where id = ?').run(monthAgo, old.rig.id);
    db.prepare('update trips set deleted_at = ? where id = ?').run(monthAgo, oldTrip.id);

    // Past the window: no longer listed, no longer restorable, though the rows are still there until the purge.
    const listed = await body<{ id: string }[]>(await api('/api/deleted', { session: owner }), 200);
    expect(listed.some((d) => d.id === old.rig.id || d.id === oldTrip.id)).toBe(false);
    expect(listed.some((d) => d.id === young.trips[1]!.id)).toBe(true);
    expect((await api(`/api/rigs/${old.rig.id}/restore`, { method: 'POST', session: owner })).status).toBe(404);
    expect(db.prepare('select count(*) as n from forecasts where rig_id = ?').get(old.rig.id)).toMatchObject({ n: 5 });

    // A server starting on this database purges them (with their forecasts and check-ins) and nothing else.
    dir = mkdtempSync(path.join(tmpdir(), 'sunreckon-purge-'));
    const second = await startServer({}, { dir, dbPath: inject('dbPath') });
    try {
      const gone = () => db.prepare('select count(*) as n from rigs where id = ?').get(old.rig.id) as { n: number | string };
      for (let i = 0; i < 50 && Number(gone().n) !== 0; i++) await new Promise((r) => setTimeout(r, 100));
      expect(Number(gone().n)).toBe(0);
      expect(Number((db.prepare('select count(*) as n from forecasts where rig_id = ?').get(old.rig.id) as { n: number }).n)).toBe(0);
      expect(Number((db.prepare('select count(*) as n from trips where id = ?').get(oldTrip.id) as { n: number }).n)).toBe(0);
      expect(Number((db.prepare('select count(*) as n from check_ins where trip_id = ?').get(oldTrip.id) as { n: number }).n)).toBe(0);
      // The young deletion and the live rig stay.
      expect(Number((db.prepare('select count(*) as n from trips where id = ?').get(young.trips[1]!.id) as { n: number }).n)).toBe(1);
      await body(await api(`/api/rigs/${young.rig.id}`, { session: owner }), 200);
    } finally {
      await second.stop();
      db.close();
    }
  });
});
