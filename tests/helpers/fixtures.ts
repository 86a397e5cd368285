import { openTestDb, type TestDb } from './test-db';
import { api, type Session } from './api';

// Shared data for the rig, load and trip suites. The demo rig is the invented camper van of
// product.md's demo scenario: 300 Ah LiFePO4, 2 × 200 W flat roof panels on MPPT, 30 A DC-DC charger.

export const vanRig = {
  name: 'Camper van',
  bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 300 },
  arrays: [{ name: 'Roof', ratedWatts: 400 }],
  chargers: [{ kind: 'alternator', amps: 30 }],
  inverter: { efficiencyPct: 90, idleWatts: 12 },
};

/** Creates a rig through the API and returns its DTO. */
export async function createRig(session: Session, overrides: Record<string, unknown> = {}): Promise<any> {
  const res = await api('/api/rigs', { method: 'POST', session, json: { ...vanRig, ...overrides } });
  if (res.status !== 201) throw new Error(`createRig: ${res.status} ${await res.text()}`);
  return res.json();
}

/** Adds a load through the API and returns its DTO. */
export async function createLoad(session: Session, rigId: string, load: Record<string, unknown>): Promise<any> {
  const res = await api(`/api/rigs/${rigId}/loads`, { method: 'POST', session, json: load });
  if (res.status !== 201) throw new Error(`createLoad: ${res.status} ${await res.text()}`);
  return res.json();
}

/** A read-write handle on the test database, for set-ups the API cannot make yet (crew roles). */
function writeDb(): TestDb {
  return openTestDb({ write: true });
}

/** The user's personal crew. */
export function personalCrewId(userId: string): string {
  const db = writeDb();
  try {
    return (db.prepare("select crew_id from crew_members where user_id = ? and role = 'owner' order by created_at limit 1").get(userId) as { crew_id: string }).crew_id;
  } finally {
    db.close();
  }
}

/** Puts a user into a crew with a role (the crews issue will do this through invitations). */
export function addMember(crewId: string, userId: string, role: 'owner' | 'editor' | 'viewer'): void {
  const db = writeDb();
  try {
    db.prepare('insert into crew_members (crew_id, user_id, role, created_at) values (?, ?, ?, ?)').run(crewId, userId, role, new Date().toISOString());
  } finally {
    db.close();
  }
}

/** One row of the test database, read with plain SQL. */
export function dbGet<T = Record<string, unknown>>(query: string, ...params: unknown[]): T | undefined {
  const db = openTestDb();
  try {
    return db.prepare(query).get(...params) as T | undefined;
  } finally {
    db.close();
  }
}

/** Rows of the test database, read with plain SQL. */
export function dbAll<T = Record<string, unknown>>(query: string, ...params: unknown[]): T[] {
  const db = openTestDb();
  try {
    return db.prepare(query).all(...params) as T[];
  } finally {
    db.close();
  }
}
