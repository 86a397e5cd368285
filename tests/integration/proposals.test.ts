import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, makeTrip, member } from '../helpers/crew';
import { linkIn, waitForMail } from '../helpers/mail';
import { TEST_PRICES } from '../helpers/routes';
import { baseUrl } from '../helpers/api';

// Installer proposals end to end over HTTP: sweeps, price lists, drafts, sending, the owner's answer.
// Roles beyond these flows are in the authorization matrix (tests/helpers/routes.ts).

type Option = { key: string; total: number; passes: boolean; minSocPct: number; changes: { bank: { capacityAh: number } | null }; items: { name: string; amount: number }[] };
type Sweep = { options: Option[]; cheapestPassing: string | null; base: { passes: boolean; minSocPct: number }; combinations: number; currency: string };
type Proposal = {
  id: string;
  version: number;
  status: string;
  title: string;
  total: number;
  currency: string;
  parts: { name: string; quantity: number; unitPrice: number; amount: number }[];
  cables: { input: { label: string }; result: { suggested: { awg: string } | null; fuseA: number | null; chosen: { ok: boolean } | null; estimate: boolean } }[];
  cautions: string[];
  before: { minSocPct: number; forecast: { hourly: unknown[] } };
  after: { minSocPct: number; forecast: { hourly: unknown[] }; plan: { bank: { capacityAh: number } } };
  canEdit: boolean;
  canDecide: boolean;
  decision: { comment: string; by: string } | null;
};

const json = async <T>(res: Response, status: number): Promise<T> => {
  const text = await res.text();
  expect(res.status, text.slice(0, 400)).toBe(status);
  return (text ? JSON.parse(text) : undefined) as T;
};
/** Waits for the first message to `to` whose subject matches. */
async function mailAbout(to: string, subject: RegExp) {
  for (let n = 1; n <= 10; n++) {
    const found = (await waitForMail(to, { count: n })).find((m) => subject.test(m.subject));
    if (found) return found;
  }
  throw new Error(`no mail to ${to} about ${subject}`);
}
const issuePaths = async (res: Response) => ((await res.json()) as { issues: { path: string }[] }).issues.map((i) => i.path);

describe('installer proposals', () => {
  let owner: Session;
  let editor: Session;
  let installer: Session;
  let stranger: Session;
  let rigId: string;
  let forecastId: string;
  let grantId: string;

  beforeAll(async () => {
    owner = await signUp({ name: 'Inés' });
    const crewId = (await activeCrew(owner)).id;
    editor = await member(owner, crewId, 'editor', 'Tobi');
    rigId = (await makeRig(owner, crewId)).id;
    await makeLoad(owner, rigId);
    // A 100 W load around the clock: more than the 200 Ah bank holds over the trip.
    await makeLoad(owner, rigId, { name: 'Electric blanket', watts: 100 });
    const trip = await makeTrip(owner, rigId);
    forecastId = (await json<{ id: string }>(await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: {} }), 201)).id;
    installer = await signUp({ kind: 'installer', name: 'Wren Solar' });
    stranger = await signUp({ kind: 'installer', name: 'Other Installer' });
    grantId = (await json<{ invited: { id: string } }>(await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email: installer.email } }), 202)).invited.id;
  });

  const SWEEP = { candidates: { banks: [300, 400, 600, 800].map((capacityAh) => ({ chemistry: 'lifepo4', capacityAh })), panels: [{ watts: 200, mounting: 'flat' }] } };

  it('sweeps the saved forecast: every combination, ranked by cost, the cheapest passing one marked', async () => {
    const r = await json<Sweep>(await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json: { ...SWEEP, prices: TEST_PRICES } }), 200);
    expect(r.combinations).toBe(5 * 2 - 1);
    expect(r.base.passes).toBe(false);
    const totals = r.options.map((o) => o.total);
    expect(totals).toEqual([...totals].sort((a, b) => a - b));
    const cheapest = r.options.find((o) => o.key === r.cheapestPassing)!;
    expect(cheapest.passes).toBe(true);
    expect(Math.min(...r.options.filter((o) => o.passes).map((o) => o.total))).toBe(cheapest.total);
    // Price lines from the list: 5 per Ah plus 100 to install.
    const bankOnly = r.options.find((o) => o.key === 'b1.p0.d0.g0')!;
    expect(bankOnly.total).toBe(300 * 5 + 100);
  });

  it('only a granted installer sweeps: the crew 403, other installers and crews 404', async () => {
    const body = { ...SWEEP, prices: TEST_PRICES };
    expect((await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: owner, json: body })).status).toBe(403);
    expect((await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: editor, json: body })).status).toBe(403);
    expect((await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: stranger, json: body })).status).toBe(404);
    expect((await api(`/api/forecasts/no-such-forecast/sweep`, { method: 'POST', session: installer, json: body })).status).toBe(404);
  });

  it('names the fields of a bad sweep request', async () => {
    const call = (json: unknown) => api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json });
    let res = await call({ candidates: { banks: [{ chemistry: 'lifepo4', capacityAh: -5 }] }, prices: TEST_PRICES });
    expect(res.status).toBe(400);
    expect(await issuePaths(res)).toEqual(['candidates.banks.0.capacityAh']);
    res = await call({ candidates: {}, prices: TEST_PRICES });
    expect(await issuePaths(res)).toEqual(['candidates']);
    res = await call({ candidates: { generatorHours: [6], generatorStartHour: 20 }, prices: TEST_PRICES });
    expect(await issuePaths(res)).toEqual(['candidates.generatorHours.0']);
    res = await call({ ...SWEEP, prices: { ...TEST_PRICES, currency: 'dollars', panelPerWatt: 'cheap' } });
    expect((await issuePaths(res)).sort()).toEqual(['prices.currency', 'prices.panelPerWatt']);
    // No prices sent and none saved yet.
    res = await call(SWEEP);
    expect(res.status).toBe(400);
    expect(await issuePaths(res)).toEqual(['prices']);
  });

  it('keeps one versioned price list per installer, used when a sweep sends no prices', async () => {
    const empty = await json<{ version: number; saved: boolean; bankInstall: number }>(await api('/api/price-list', { session: installer }), 200);
    expect(empty).toMatchObject({ version: 0, saved: false, bankInstall: 0 });
    const bad = await api('/api/price-list', { method: 'PUT', session: installer, json: { ...TEST_PRICES, currency: 'EURO', version: 0 } });
    expect(bad.status).toBe(400);
    expect(await issuePaths(bad)).toEqual(['currency']);
    const saved = await json<{ version: number; currency: string }>(await api('/api/price-list', { method: 'PUT', session: installer, json: { ...TEST_PRICES, currency: 'cad', version: 0 } }), 200);
    expect(saved).toMatchObject({ version: 1, currency: 'CAD' });
    // A second save from the same stale read is refused with the list as it is now.
    const stale = await api('/api/price-list', { method: 'PUT', session: installer, json: { ...TEST_PRICES, bankInstall: 1, version: 0 } });
    expect(stale.status).toBe(409);
    expect(((await stale.json()) as { current: { version: number } }).current.version).toBe(1);
    const r = await json<Sweep>(await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json: SWEEP }), 200);
    expect(r.currency).toBe('CAD');
    // Campers have no price list.
    expect((await api('/api/price-list', { session: owner })).status).toBe(403);
  });

  let proposal: Proposal;

  it('a granted installer drafts a proposal: after forecast, priced parts, checked cables, cautions', async () => {
    const bad = await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: {}, prices: TEST_PRICES } });
    expect(bad.status).toBe(400);
    expect(await issuePaths(bad)).toEqual(['changes']);
    expect((await api('/api/proposals', { method: 'POST', session: stranger, json: { forecastId, changes: { bank: { chemistry: 'lifepo4', capacityAh: 600 } }, prices: TEST_PRICES } })).status).toBe(404);
    expect((await api('/api/proposals', { method: 'POST', session: owner, json: { forecastId, changes: { bank: { chemistry: 'lifepo4', capacityAh: 600 } }, prices: TEST_PRICES } })).status).toBe(403);

    proposal = await json<Proposal>(await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { bank: { chemistry: 'lifepo4', capacityAh: 600 } }, prices: TEST_PRICES } }), 201);
    expect(proposal).toMatchObject({ status: 'draft', version: 1, currency: 'USD', canEdit: true, canDecide: false });
    expect(proposal.after.plan.bank.capacityAh).toBe(600);
    expect(proposal.after.minSocPct).toBeGreaterThan(proposal.before.minSocPct);
    expect(proposal.after.forecast.hourly.length).toBe(proposal.before.forecast.hourly.length);
    // The old bank's removal is listed, at no extra price (it is part of the installation).
    expect(proposal.parts.map((p) => p.name)).toEqual(['600 Ah LiFePO4 bank', 'Bank installation', 'Removal of the old 200 Ah LiFePO4 bank (in the installation)']);
    expect(proposal.total).toBe(600 * 5 + 100);
    expect(proposal.cables[0]!.input.label).toMatch(/Main battery feed/);
    expect(proposal.cables[0]!.result.estimate).toBe(true);
    expect(proposal.cautions.join(' ')).toMatch(/18 cm \(7 in\)/);
    expect(proposal.cautions.join(' ')).toMatch(/Disconnect shore power/);
  });

  it('the crew does not see a draft', async () => {
    expect((await api(`/api/proposals/${proposal.id}`, { session: owner })).status).toBe(404);
    const list = await json<{ id: string }[]>(await api('/api/proposals', { session: owner }), 200);
    expect(list.map((p) => p.id)).not.toContain(proposal.id);
    const mine = await json<{ id: string; status: string }[]>(await api('/api/proposals', { session: installer }), 200);
    expect(mine.find((p) => p.id === proposal.id)?.status).toBe('draft');
  });

  it('edits a draft: parts and total, cable checks recomputed on the server, field-named 400s, 409 when stale', async () => {
    const url = `/api/proposals/${proposal.id}`;
    const edited = await json<Proposal>(
      await api(url, {
        method: 'PATCH',
        session: installer,
        json: {
          version: proposal.version,
          notes: 'Bank in the bed box; fuse at the positive post.',
          parts: [...proposal.parts.map(({ amount: _a, ...p }) => p), { name: 'Class T fuse and holder', quantity: 1, unit: '', unitPrice: 89.5 }],
          cables: [{ label: 'Main battery feed', source: { kind: 'current', amps: 150 }, oneWayM: 1.5, circuit: 'critical', chosenAwg: '4' }],
        },
      }),
      200,
    );
    expect(edited.version).toBe(2);
    expect(edited.total).toBe(3100 + 89.5);
    expect(edited.cables[0]!.result.fuseA).toBe(200);
    // 4 AWG carries 160 A in the 105 °C table: too little for a 200 A fuse.
    expect(edited.cables[0]!.result.chosen!.ok).toBe(false);
    expect(edited.cables[0]!.result.suggested!.awg).toBe('2');

    const bad = await api(url, { method: 'PATCH', session: installer, json: { version: 2, cables: [{ label: '', source: { kind: 'charger' }, oneWayM: -1, circuit: 'main', chosenAwg: '5' }] } });
    expect(bad.status).toBe(400);
    expect((await issuePaths(bad)).sort()).toEqual(['cables.0.chosenAwg', 'cables.0.circuit', 'cables.0.label', 'cables.0.oneWayM', 'cables.0.source.amps']);

    const stale = await api(url, { method: 'PATCH', session: installer, json: { version: 1, notes: 'old' } });
    expect(stale.status).toBe(409);
    expect(((await stale.json()) as { current: { version: number } }).current.version).toBe(2);
    proposal = edited;
  });

  it('sends it: the crew’s owner gets an e-mail with the link; a stale version is 409', async () => {
    const url = `/api/proposals/${proposal.id}/send`;
    expect((await api(url, { method: 'POST', session: installer, json: { version: 1 } })).status).toBe(409);
    expect((await api(url, { method: 'POST', session: owner, json: { version: proposal.version } })).status).toBe(404);
    proposal = await json<Proposal>(await api(url, { method: 'POST', session: installer, json: { version: proposal.version } }), 200);
    expect(proposal).toMatchObject({ status: 'sent', canEdit: false });
    const mail = await mailAbout(owner.email, /proposal/);
    // Names are the users' words: in the body, quoted; the subject is ours.
    expect(mail.subject).toBe('An installer sent your crew an upgrade proposal on Sunreckon');
    expect(mail.text_body).toContain('An installer who signs as “Wren Solar” sent you an upgrade proposal for your rig “Test van”.');
    expect(linkIn(mail, `${baseUrl()}/proposals/`)).toBe(`${baseUrl()}/proposals/${proposal.id}`);
    expect(mail.html_body).toContain('#FFFDF9');
    // Sent is final: no more edits, no second send, no delete.
    expect((await api(`/api/proposals/${proposal.id}`, { method: 'PATCH', session: installer, json: { version: proposal.version, notes: 'x' } })).status).toBe(409);
    expect((await api(url, { method: 'POST', session: installer, json: { version: proposal.version } })).status).toBe(409);
    expect((await api(`/api/proposals/${proposal.id}?version=${proposal.version}`, { method: 'DELETE', session: installer })).status).toBe(409);
  });

  it('the crew reads it; only the owner accepts, with a comment; the installer is told', async () => {
    const seen = await json<Proposal>(await api(`/api/proposals/${proposal.id}`, { session: editor }), 200);
    expect(seen.canDecide).toBe(false);
    const ownerView = await json<Proposal>(await api(`/api/proposals/${proposal.id}`, { session: owner }), 200);
    expect(ownerView.canDecide).toBe(true);
    const url = `/api/proposals/${proposal.id}/decision`;
    const answer = { decision: 'accepted', comment: 'Yes — before the October trip.', name: 'Inés Ortega', version: proposal.version };
    expect((await api(url, { method: 'POST', session: editor, json: answer })).status).toBe(403);
    expect((await api(url, { method: 'POST', session: installer, json: answer })).status).toBe(403);
    expect((await api(url, { method: 'POST', session: stranger, json: answer })).status).toBe(404);
    const bad = await api(url, { method: 'POST', session: owner, json: { ...answer, decision: 'maybe' } });
    expect(await issuePaths(bad)).toEqual(['decision']);
    expect((await api(url, { method: 'POST', session: owner, json: { ...answer, version: 1 } })).status).toBe(409);
    const done = await json<Proposal>(await api(url, { method: 'POST', session: owner, json: answer }), 200);
    expect(done).toMatchObject({ status: 'accepted', canDecide: false, decision: { comment: 'Yes — before the October trip.', by: 'Inés' } });
    const mail = await mailAbout(installer.email, /your proposal/);
    expect(mail.subject).toBe('A crew accepted your proposal on Sunreckon');
    expect(mail.text_body).toContain('A crew owner who signs as “Inés” accepted your proposal');
    expect(mail.text_body).toContain('Yes — before the October trip.');
    // Both sides see the status.
    const crewList = await json<{ id: string; status: string }[]>(await api('/api/proposals', { session: owner }), 200);
    expect(crewList.find((p) => p.id === proposal.id)?.status).toBe('accepted');
    const installerList = await json<{ id: string; status: string }[]>(await api('/api/proposals', { session: installer }), 200);
    expect(installerList.find((p) => p.id === proposal.id)?.status).toBe('accepted');
    // Answered once.
    expect((await api(url, { method: 'POST', session: owner, json: { ...answer, decision: 'declined', version: done.version } })).status).toBe(409);
  });

  it('a draft can be deleted by its installer; taking the grant away hides the installer’s proposals', async () => {
    const draft = await json<Proposal>(await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { panel: { watts: 400, mounting: 'flat' } }, prices: TEST_PRICES } }), 201);
    expect((await api(`/api/proposals/${draft.id}?version=${draft.version}`, { method: 'DELETE', session: installer })).status).toBe(204);
    expect((await api(`/api/proposals/${draft.id}`, { session: installer })).status).toBe(404);

    expect((await api(`/api/grants/${grantId}`, { method: 'DELETE', session: owner })).status).toBe(204);
    expect((await api(`/api/proposals/${proposal.id}`, { session: installer })).status).toBe(404);
    expect(await json<unknown[]>(await api('/api/proposals', { session: installer }), 200)).toEqual([]);
    // The crew keeps it.
    expect((await api(`/api/proposals/${proposal.id}`, { session: owner })).status).toBe(200);
  });
});
