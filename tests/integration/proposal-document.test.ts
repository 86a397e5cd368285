import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew, makeLoad, makeRig, makeTrip } from '../helpers/crew';
import { TEST_PRICES } from '../helpers/routes';
import { waitForMail } from '../helpers/mail';

// A proposal as a business document over HTTP: refused when empty, quote number and dates,
// labour, removals and trade-ins, tax and totals, the cable check's parts at the list's prices,
// the owner's acceptance with a typed name and the time, and messages in plain words.

type Doc = {
  company: string;
  contactName: string;
  licence: string;
  quoteNumber: string;
  validDays: number;
  taxRatePct: number;
  terms: string;
  labour: { name: string; hours: number; rate: number }[];
  removals: { name: string; kind: 'removal' | 'trade-in'; amount: number }[];
  wiringPrices: { cablePerMm2M: number; fuse: number; busBars: number };
};
type Proposal = {
  id: string;
  version: number;
  status: string;
  total: number;
  parts: { name: string; quantity: number; unit: string; unitPrice: number }[];
  document: Doc;
  wiring: { kind: string; name: string; quantity: number; unitPrice: number; amount: number }[];
  totals: { parts: number; wiring: number; labour: number; removals: number; subtotal: number; tax: number; total: number };
  cables: { result: { suggested: { awg: string } | null; fuseA: number | null; method: string } }[];
  decision: { name: string | null; at: string } | null;
};

const json = async <T>(res: Response, status: number): Promise<T> => {
  const text = await res.text();
  expect(res.status, text.slice(0, 400)).toBe(status);
  return (text ? JSON.parse(text) : undefined) as T;
};
type Envelope = { error: { message: string }; issues: { path: string; message: string }[] };

// Wiring prices (invented for the test): 0.50 per metre per mm², 20 a fuse, 45 a pair of bus bars.
const PRICES = { ...TEST_PRICES, wiring: { cablePerMm2M: 0.5, fuse: 20, busBars: 45 } };

describe('a proposal as a business document', () => {
  let owner: Session;
  let installer: Session;
  let forecastId: string;
  let p: Proposal;

  beforeAll(async () => {
    owner = await signUp({ name: 'Adaeze' });
    const crewId = (await activeCrew(owner)).id;
    const rigId = (await makeRig(owner, crewId)).id;
    await makeLoad(owner, rigId);
    const trip = await makeTrip(owner, rigId);
    forecastId = (await json<{ id: string }>(await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: {} }), 201)).id;
    installer = await signUp({ kind: 'installer', name: 'Corrie Bright' });
    await json(await api(`/api/rigs/${rigId}/grants`, { method: 'POST', session: owner, json: { email: installer.email } }), 202);
    await json(await api('/api/installer/rigs', { session: installer }), 200);
  });

  it('starts a draft with a quote number, empty labour and removal lines, and the list’s wiring prices', async () => {
    p = await json<Proposal>(await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { bank: { chemistry: 'lifepo4', capacityAh: 400 } }, prices: PRICES } }), 201);
    const year = new Date().getUTCFullYear();
    expect(p.document.quoteNumber).toBe(`Q-${year}-001`);
    expect(p.document).toMatchObject({ labour: [], removals: [], validDays: 30, taxRatePct: 0 });
    expect(p.document.wiringPrices).toEqual(PRICES.wiring);
    // The main feed's cable, its fuse and the bus bars are parts.
    expect(p.wiring.map((w) => w.kind)).toEqual(['cable', 'fuse', 'bus-bars']);
  });

  it('refuses to send a proposal with no part, labour line or old part, in plain words', async () => {
    const empty = await json<Proposal>(
      await api(`/api/proposals/${p.id}`, { method: 'PATCH', session: installer, json: { version: p.version, parts: [], document: { ...p.document, removals: [], labour: [] } } }),
      200,
    );
    const res = await api(`/api/proposals/${p.id}/send`, { method: 'POST', session: installer, json: { version: empty.version } });
    expect(res.status).toBe(400);
    const body = (await res.json()) as Envelope;
    expect(body.error.message).toBe('Add at least one part or labour line before sending: the crew would get a proposal with nothing to do and a total of 0.');
    // Still a draft.
    expect((await json<Proposal>(await api(`/api/proposals/${p.id}`, { session: installer }), 200)).status).toBe('draft');
    p = empty;
  });

  it('adds labour, a removal and a trade-in, tax, terms; totals are worked out on the server', async () => {
    const document: Doc = {
      ...p.document,
      company: 'Bright Mobile Power',
      contactName: 'Corrie Bright',
      licence: 'EL-40721',
      validDays: 21,
      taxRatePct: 8.25,
      terms: 'Half on acceptance, half on handover. Parts carry their makers’ warranties.',
      labour: [{ name: 'Fit the new bank and main feed', hours: 4, rate: 85 }],
      removals: [
        { name: 'Take out and recycle the old 200 Ah LiFePO4 bank', kind: 'removal', amount: 40 },
        { name: 'Old 20 A charger, traded in', kind: 'trade-in', amount: 25 },
      ],
    };
    const parts = [{ name: '400 Ah LiFePO4 bank', quantity: 1, unit: '', unitPrice: 2000 }, { name: 'Bank installation', quantity: 1, unit: '', unitPrice: 100 }];
    // One run we can work out by hand: a 40 A charger, 3 m one way, metric sizes, ABYC-style at 20 °C.
    const cables = [{ label: 'DC-DC charger to bank', source: { kind: 'charger', amps: 40 }, oneWayM: 3, circuit: 'critical', method: 'abyc-20c', sizes: 'metric' }];
    p = await json<Proposal>(await api(`/api/proposals/${p.id}`, { method: 'PATCH', session: installer, json: { version: p.version, parts, cables, document } }), 200);
    expect(p.cables[0]!.result).toMatchObject({ suggested: { awg: '16 mm²' }, fuseA: 50, method: 'abyc-20c' });
    // By hand: cable 2 × 3 m = 6 m at 0.50 × 16 = 8.00 → 48.00; fuse 20.00; bus bars 45.00 → wiring 113.00.
    expect(p.wiring).toEqual([
      { kind: 'cable', run: 0, name: 'Cable 16 mm², DC-DC charger to bank (out and back)', quantity: 6, unit: 'm', unitPrice: 8, amount: 48 },
      { kind: 'fuse', run: 0, name: 'Fuse or breaker 50 A with holder, DC-DC charger to bank', quantity: 1, unit: 'pcs', unitPrice: 20, amount: 20 },
      { kind: 'bus-bars', run: null, name: 'Bus bars, positive and negative', quantity: 1, unit: 'pair', unitPrice: 45, amount: 45 },
    ]);
    // Parts 2,100; wiring 113; labour 4 × 85 = 340; removals 40 − 25 = 15; subtotal 2,568;
    // tax 8.25 % = 211.86; total 2,779.86.
    expect(p.totals).toMatchObject({ parts: 2100, wiring: 113, labour: 340, removals: 15, subtotal: 2568, tax: 211.86, total: 2779.86 });
    expect(p.total).toBe(2779.86);
    expect(p.document).toMatchObject({ company: 'Bright Mobile Power', licence: 'EL-40721', validDays: 21 });
  });

  it('records the owner’s acceptance with the name typed and the time; no name, no acceptance', async () => {
    const sent = await json<Proposal>(await api(`/api/proposals/${p.id}/send`, { method: 'POST', session: installer, json: { version: p.version } }), 200);
    // The crew's e-mail states the quote's total, tax included.
    const [mail] = await waitForMail(owner.email);
    expect(mail!.text_body).toContain('the quote ($2,779.86 in all, tax included)');
    const url = `/api/proposals/${p.id}/decision`;
    const noName = await api(url, { method: 'POST', session: owner, json: { version: sent.version, decision: 'accepted' } });
    expect(noName.status).toBe(400);
    const env = (await noName.json()) as Envelope;
    expect(env.issues).toEqual([{ path: 'name', message: 'Type your name to accept: it is recorded with the time, as a signature.' }]);
    const before = Date.now();
    const done = await json<Proposal>(await api(url, { method: 'POST', session: owner, json: { version: sent.version, decision: 'accepted', name: 'Adaeze Okafor' } }), 200);
    expect(done.status).toBe('accepted');
    expect(done.decision!.name).toBe('Adaeze Okafor');
    expect(Date.parse(done.decision!.at)).toBeGreaterThanOrEqual(before - 1000);
  });

  it('the next draft takes the company, contact, licence, tax and terms from the last one, with the next quote number', async () => {
    const next = await json<Proposal>(await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { panel: { watts: 200, mounting: 'flat' } }, prices: PRICES } }), 201);
    expect(next.document).toMatchObject({ company: 'Bright Mobile Power', contactName: 'Corrie Bright', licence: 'EL-40721', taxRatePct: 8.25, validDays: 21, labour: [], removals: [] });
    expect(next.document.quoteNumber).toBe(`Q-${new Date().getUTCFullYear()}-002`);
  });

  it('says what is wrong in plain words, never a field path', async () => {
    const draft = await json<Proposal>(await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId, changes: { dcdcAmps: 30 }, prices: PRICES } }), 201);
    const res = await api(`/api/proposals/${draft.id}`, {
      method: 'PATCH',
      session: installer,
      json: { version: draft.version, parts: [{ name: '', quantity: 0, unit: '', unitPrice: -1 }], document: { ...draft.document, taxRatePct: -2, labour: [{ name: 'Fit it', hours: 'two', rate: 80 }] } },
    });
    expect(res.status).toBe(400);
    const issues = ((await res.json()) as Envelope).issues;
    const at = (path: string) => issues.find((i) => i.path === path)?.message;
    expect(at('parts.0.unitPrice')).toBe("A price can't be negative.");
    expect(at('parts.0.name')).toBe('Name the part.');
    expect(at('parts.0.quantity')).toBe('A quantity must be more than 0.');
    expect(at('document.taxRatePct')).toBe("The tax rate can't be negative.");
    expect(at('document.labour.0.hours')).toBe('Hours must be a number, such as 2.5.');
    for (const i of issues) expect(i.message).not.toMatch(/unitPrice|taxRatePct|must be at least|^must /);

    // The sweep's DC-DC sizes: a word instead of amps, and too many sizes, each said plainly.
    const sweep = await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json: { candidates: { dcdcAmps: ['abc'] }, prices: PRICES } });
    expect(sweep.status).toBe(400);
    expect(((await sweep.json()) as Envelope).issues).toEqual([{ path: 'candidates.dcdcAmps.0', message: 'Each DC-DC charger size must be a number from 1 to 200 A (numbers such as 30, 50).' }]);
    const many = await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json: { candidates: { dcdcAmps: [10, 20, 30, 40, 50, 60, 70] }, prices: PRICES } });
    expect(((await many.json()) as Envelope).issues).toEqual([{ path: 'candidates.dcdcAmps', message: 'Try at most 6 DC-DC charger sizes in one sweep.' }]);
  });
});
