import { api, signUp, type Session } from './api';
import { activeCrew, inviteToken, makeLoad, makeRig, makeTrip, member } from './crew';
import { uniqueEmail } from './api';
import { CHECK_IN_INPUT, monitorLogUpload, TEST_PRICES, type Actor, type Cast, type World } from './routes';

/** Signs up the matrix's people: a crew with owner, editor, viewer (and a spare editor), a camper elsewhere, two installers. */
export async function makeCast(): Promise<Cast> {
  const owner = await signUp({ name: 'Matrix Owner' });
  const crewId = (await activeCrew(owner)).id;
  const [editor, viewer, spare] = [await member(owner, crewId, 'editor'), await member(owner, crewId, 'viewer'), await member(owner, crewId, 'editor', 'Spare')];
  const outsider = await signUp({ name: 'Other Crew' });
  // The outsider has rows of their own, which the fixture crew must not see either.
  await makeRig(outsider);
  const installer = await signUp({ kind: 'installer', name: 'Granted Installer' });
  const stranger = await signUp({ kind: 'installer', name: 'Ungranted Installer' });
  return { owner, editor, viewer, outsider, installer, stranger, crewId, spare };
}

async function ok<T>(res: Response, status: number, what: string): Promise<T> {
  if (res.status !== status) throw new Error(`${what}: expected ${status}, got ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** A fresh set of rows in the cast's crew, all made by the owner through the API. */
export async function makeWorld(cast: Cast, needs: 'member'[] = []): Promise<World> {
  const { owner, crewId } = cast;
  const rig = await makeRig(owner, crewId);
  const load = await makeLoad(owner, rig.id);
  const trip = await makeTrip(owner, rig.id);
  const forecast = await ok<{ id: string }>(await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: {} }), 201, 'forecast');
  const email = uniqueEmail('world');
  const token = await inviteToken(owner, crewId, email, 'viewer');
  const crew = await ok<{ invitations: { id: string; email: string; version: number }[] }>(await api(`/api/crews/${crewId}`, { session: owner }), 200, 'crew');
  const inv = crew.invitations.find((i) => i.email === email)!;
  const grant = (await ok<{ invited: { id: string } }>(await api(`/api/rigs/${rig.id}/grants`, { method: 'POST', session: owner, json: { email: cast.installer.email } }), 202, 'grant')).invited;
  const propose = async () =>
    ok<{ id: string; version: number }>(
      await api('/api/proposals', { method: 'POST', session: cast.installer, json: { forecastId: forecast.id, changes: { bank: { chemistry: 'lifepo4', capacityAh: 300 } }, prices: TEST_PRICES } }),
      201,
      'proposal',
    );
  const draft = await propose();
  const toSend = await propose();
  const proposal = await ok<{ id: string; version: number }>(await api(`/api/proposals/${toSend.id}/send`, { method: 'POST', session: cast.installer, json: { version: toSend.version } }), 200, 'send');
  const upload = monitorLogUpload(true);
  const monitorLog = await ok<{ id: string; version: number }>(
    await api(`/api/rigs/${rig.id}/monitor-logs`, { method: 'POST', session: owner, body: upload.body, headers: { 'content-type': upload.contentType } }),
    201,
    'monitor log',
  );
  const checkIn = await ok<{ id: string; version: number }>(await api(`/api/trips/${trip.id}/check-ins`, { method: 'POST', session: owner, json: CHECK_IN_INPUT() }), 201, 'check-in');
  const extra = needs.includes('member') ? await member(owner, crewId, 'viewer', 'Short-stay member') : undefined;
  return {
    cast,
    crewId,
    rig: { id: rig.id, version: rig.version },
    load: { id: load.id, version: load.version },
    trip: { id: trip.id, version: trip.version },
    forecast: { id: forecast.id },
    invitation: { id: inv.id, version: inv.version, token },
    grant: { id: grant.id },
    proposal: { id: proposal.id, version: proposal.version },
    draft: { id: draft.id, version: draft.version },
    monitorLog: { id: monitorLog.id, version: monitorLog.version },
    checkIn: { id: checkIn.id, version: checkIn.version },
    member: extra ? { userId: extra.userId } : undefined,
    crewVersion: async () => (await ok<{ version: number }>(await api(`/api/crews/${crewId}`, { session: owner }), 200, 'crew')).version,
    memberVersion: async (userId: string) =>
      (await ok<{ members: { userId: string; version: number }[] }>(await api(`/api/crews/${crewId}`, { session: owner }), 200, 'crew')).members.find((m) => m.userId === userId)!.version,
  };
}

/** The session an actor calls with (none for anonymous). */
export function sessionOf(cast: Cast, actor: Actor): Session | undefined {
  return actor === 'anonymous' ? undefined : cast[actor];
}
