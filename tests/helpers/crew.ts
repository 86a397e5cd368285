import { expect } from 'vitest';
import { api, baseUrl, signUp, uniqueEmail, type Session } from './api';
import { linkIn, waitForMail } from './mail';

/** The id of the user's active crew (a new camper's personal crew). */
export async function activeCrew(s: Session): Promise<{ id: string; name: string; version: number }> {
  const res = await api('/api/crews', { session: s });
  expect(res.status).toBe(200);
  const list = (await res.json()) as { id: string; name: string; version: number; active: boolean }[];
  const active = list.find((c) => c.active);
  if (!active) throw new Error('no active crew');
  return active;
}

/** Invites `email` into the crew as `role` through the API and returns the link's token from the caught e-mail. */
export async function inviteToken(owner: Session, crewId: string, email: string, role: 'owner' | 'editor' | 'viewer', nth = 1): Promise<string> {
  const res = await api(`/api/crews/${crewId}/invitations`, { method: 'POST', session: owner, json: { email, role } });
  if (res.status !== 201) throw new Error(`invite failed: ${res.status} ${await res.text()}`);
  const mails = await waitForMail(email, { count: nth });
  const link = linkIn(mails[nth - 1]!, `${baseUrl()}/invite/`);
  return link.slice(`${baseUrl()}/invite/`.length);
}

/** A new camper who joined the owner's crew with `role` through the real invitation e-mail. */
export async function member(owner: Session, crewId: string, role: 'owner' | 'editor' | 'viewer', name = `Crew ${role}`): Promise<Session> {
  const email = uniqueEmail(role);
  const token = await inviteToken(owner, crewId, email, role);
  const s = await signUp({ email, name });
  const res = await api('/api/invitations/accept', { method: 'POST', session: s, json: { token } });
  if (res.status !== 200) throw new Error(`accept failed: ${res.status} ${await res.text()}`);
  return s;
}

export const RIG_INPUT = { name: 'Test van', bank: { chemistry: 'lifepo4', capacityAh: 200, nominalVolts: 12.8 } };
export const LOAD_INPUT = { name: 'Compressor fridge', watts: 45, dutyPct: 40 };
export const TRIP_INPUT = (rigId: string) => ({
  rigId,
  name: 'Test trip',
  stops: [{ name: 'Mesa camp', lat: 36.1, lon: -111.5, timeZone: 'America/Phoenix', arrive: '2027-10-20', nights: 2 }],
});

/** Creates a rig in a crew through the API. */
export async function makeRig(s: Session, crewId?: string): Promise<{ id: string; version: number; crewId: string }> {
  const res = await api('/api/rigs', { method: 'POST', session: s, json: { ...RIG_INPUT, ...(crewId ? { crewId } : {}) } });
  if (res.status !== 201) throw new Error(`rig failed: ${res.status} ${await res.text()}`);
  return (await res.json()) as { id: string; version: number; crewId: string };
}

/** Adds a load to a rig through the API. */
export async function makeLoad(s: Session, rigId: string, input: Record<string, unknown> = LOAD_INPUT): Promise<{ id: string; version: number; name: string }> {
  const res = await api(`/api/rigs/${rigId}/loads`, { method: 'POST', session: s, json: input });
  if (res.status !== 201) throw new Error(`load failed: ${res.status} ${await res.text()}`);
  return (await res.json()) as { id: string; version: number; name: string };
}

/** Plans a trip on a rig through the API. */
export async function makeTrip(s: Session, rigId: string): Promise<{ id: string; version: number }> {
  const res = await api('/api/trips', { method: 'POST', session: s, json: TRIP_INPUT(rigId) });
  if (res.status !== 201) throw new Error(`trip failed: ${res.status} ${await res.text()}`);
  return (await res.json()) as { id: string; version: number };
}
