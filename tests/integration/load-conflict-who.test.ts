import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, member } from '../helpers/crew';

// Issue 16, item 17: a stale edit of a load is told whose change it met and when — the 409 carries
// the load as it is now with who saved it last and at what time.

let owner: Session;
let tobi: Session;
let crewId: string;

beforeAll(async () => {
  owner = await signUp({ name: 'Ines Owner' });
  crewId = (await activeCrew(owner)).id;
  tobi = await member(owner, crewId, 'editor', 'Tobi');
});

describe('a stale edit of a load', () => {
  it('answers 409 with the current load naming who changed it and when', async () => {
    const rig = await makeRig(owner, crewId);
    const load = await makeLoad(owner, rig.id);
    // A new load names its author as its last editor.
    const list = (await (await api(`/api/rigs/${rig.id}/loads`, { session: owner })).json()) as {
      id: string;
      updatedBy: { name: string } | null;
    }[];
    expect(list.find((l) => l.id === load.id)?.updatedBy?.name).toBe('Ines Owner');

    const theirs = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: tobi, json: { version: load.version, watts: 60 } });
    expect(theirs.status).toBe(200);
    const saved = (await theirs.json()) as { updatedAt: string; updatedBy: { id: string; name: string } };
    expect(saved.updatedBy).toEqual({ id: tobi.userId, name: 'Tobi' });

    const mine = await api(`/api/loads/${load.id}`, { method: 'PATCH', session: owner, json: { version: load.version, watts: 30 } });
    expect(mine.status).toBe(409);
    const body = (await mine.json()) as {
      current: { watts: number; version: number; updatedAt: string; updatedBy: { id: string; name: string } };
    };
    expect(body.current).toMatchObject({
      watts: 60,
      version: load.version + 1,
      updatedAt: saved.updatedAt,
      updatedBy: { id: tobi.userId, name: 'Tobi' },
    });
  });
});
