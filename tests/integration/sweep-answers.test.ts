import { beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { api, signUp, type Session } from '../helpers/api';
import { activeCrew } from '../helpers/crew';
import { TEST_PRICES } from '../helpers/routes';

// The upgrade sweep on the built server (issue #19 items 1–4, 7): the demo van, which already makes
// its trip, and an AGM trailer that runs out — rigs, loads and trips made through the API as a
// crew would, a saved forecast shared with an installer, the sweep run in the worker pool.

type Rule = { linePct: number; marginPts: number; strandedPts: number; startSocPct: number; stopSocPct: number };
type Option = {
  key: string;
  label: string;
  total: number;
  passes: boolean;
  reservePct: number;
  minUsablePct: number;
  unmetWh: number;
  hoursShort: number;
  marginPts: number;
  generatorHours: number;
  changesNothing: boolean;
  noBetterThan: string | null;
  generator: Rule | null;
  weight: { kg: number; addedKg: number; flagged: boolean; note: string } | null;
  changes: { bank: { chemistry: string; capacityAh: number } | null; dcdcAmps: number | null; generatorHours: number | null };
  items: { name: string; amount: number }[];
};
type Sweep = {
  ranking: 'margin' | 'cost' | 'closeness';
  options: Option[];
  cheapestPassing: string | null;
  cheapestMoreMargin: string | null;
  skipped: { what: string; why: string }[];
  generatorRule: Rule;
  base: { passes: boolean; marginPts: number; minUsablePct: number; unmetWh: number; firstCutoffAt: string | null };
};

const json = async <T>(res: Response, status: number): Promise<T> => {
  const text = await res.text();
  expect(res.status, text.slice(0, 400)).toBe(status);
  return JSON.parse(text) as T;
};
const tier = (o: Option) => (o.changesNothing ? 2 : o.noBetterThan ? 1 : 0);

/** A rig with its loads and one trip on the demo's late-October loop, a saved forecast of it, shared with the installer. */
async function savedForecast(
  owner: Session,
  installer: Session,
  rig: Record<string, unknown>,
  loads: Record<string, unknown>[],
  reserveSocPct: number,
): Promise<string> {
  const crewId = (await activeCrew(owner)).id;
  const r = await json<{ id: string }>(await api('/api/rigs', { method: 'POST', session: owner, json: { ...rig, crewId } }), 201);
  for (const l of loads) await json(await api(`/api/rigs/${r.id}/loads`, { method: 'POST', session: owner, json: l }), 201);
  const plan = demoPlan();
  const trip = await json<{ id: string }>(
    await api('/api/trips', {
      method: 'POST',
      session: owner,
      json: { rigId: r.id, name: 'High desert loop', stops: plan.stops, drives: plan.drives, reserveSocPct },
    }),
    201,
  );
  const f = await json<{ id: string }>(await api(`/api/trips/${trip.id}/forecasts`, { method: 'POST', session: owner, json: {} }), 201);
  await json(await api(`/api/rigs/${r.id}/grants`, { method: 'POST', session: owner, json: { email: installer.email } }), 202);
  return f.id;
}

const sweep = async (installer: Session, forecastId: string, candidates: unknown) =>
  json<Sweep>(
    await api(`/api/forecasts/${forecastId}/sweep`, { method: 'POST', session: installer, json: { candidates, prices: TEST_PRICES } }),
    200,
  );

/** The AGM trailer's after-plan as an installer edits it: 200 Ah LiFePO4, a 400 W flat roof array beside the portable panel, a 30 A generator 4 h a day. */
const TRAILER_EDIT = {
  bank: { chemistry: 'lifepo4', capacityAh: 200, floorSocPct: 10 },
  arrays: [
    { name: 'Portable panel (100 W)', ratedWatts: 100, tiltDeg: 45, azimuthDeg: 180, aim: 'follow', controller: 'pwm' },
    { name: 'Roof', ratedWatts: 400, tiltDeg: 0, azimuthDeg: 180, aim: 'fixed', controller: 'mppt' },
  ],
  dcdcAmps: 0,
  shoreAmps: 0,
  generator: { amps: 30, startHour: 8, hoursPerDay: 4, marginPts: 10, stopPct: 90 },
};

describe('the sweep on the built server', () => {
  let installer: Session;
  let vanForecast: string;
  let trailerForecast: string;

  beforeAll(async () => {
    installer = await signUp({ kind: 'installer', name: 'Kestrel Power' });
    const owner = await signUp({ name: 'Ana' });
    const d = demoPlan();
    vanForecast = await savedForecast(
      owner,
      installer,
      { name: 'Camper van (6.1 m)', bank: d.bank, arrays: d.arrays, chargers: d.chargers, inverter: d.inverter },
      d.loads ?? [],
      20,
    );
    trailerForecast = await savedForecast(
      owner,
      installer,
      {
        name: 'AGM trailer',
        bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 200, initialSocPct: 100 },
        arrays: [{ name: 'Portable panel (100 W)', ratedWatts: 100, tiltDeg: 45, aim: 'follow', controller: 'pwm', controllerMaxAmps: 10 }],
        chargers: [],
      },
      [
        { name: 'Absorption fridge control board', watts: 6 },
        {
          name: 'LED lights',
          watts: 1.2,
          quantity: 8,
          windows: [
            [6, 8],
            [18, 23],
          ],
        },
        {
          name: 'Water pump',
          watts: 55,
          windows: [
            [7, 9],
            [18, 21],
          ],
          dutyPct: 8,
        },
        { name: 'Furnace blower', watts: 60, windows: [[0, 24]], response: 'heating', setpointC: 17 },
        { name: 'Phones', watts: 10, quantity: 2, windows: [[19, 21]] },
        { name: 'Radio', watts: 15, windows: [[17, 22]] },
        { name: 'Parasitic draw', watts: 14, standby: true },
      ],
      50,
    );
  });

  it('the demo van already makes it: said first with its margin, the options ranked by the margin they buy', async () => {
    const r = await sweep(installer, vanForecast, {
      banks: [
        { chemistry: 'lifepo4', capacityAh: 300 },
        { chemistry: 'lifepo4', capacityAh: 400 },
      ],
      panels: [{ watts: 200, mounting: 'flat' }],
      dcdcAmps: [30, 40],
      generatorHours: [2],
    });
    expect(r.base.passes).toBe(true);
    expect(r.base.marginPts).toBeGreaterThan(0);
    expect(r.ranking).toBe('margin');
    expect(r.cheapestPassing).toBeNull();
    const more = r.options.find((o) => o.key === r.cheapestMoreMargin)!;
    expect(more.marginPts).toBeGreaterThanOrEqual(r.base.marginPts + 1);
    expect(more.total).toBe(Math.min(...r.options.filter((o) => tier(o) === 0 && o.marginPts >= r.base.marginPts + 1).map((o) => o.total)));
    // Never what the van has: its 300 Ah bank and its 30 A DC-DC charger are skipped, with why.
    expect(r.skipped.map((s) => s.what)).toEqual(['300 Ah LiFePO4 bank', '30 A DC-DC charger']);
    expect(r.options.some((o) => o.changes.dcdcAmps === 30 || o.changes.bank?.capacityAh === 300)).toBe(false);
    const dcdc = r.options.find((o) => o.key === 'b0.p0.d1.g0')!;
    expect(dcdc.items.map((i) => i.name)).toContain('Removal of the old 30 A DC-DC charger (in the installation)');
    // A generator that buys nothing: "changes nothing", after every other option, never named.
    const gen = r.options.find((o) => o.key === 'b0.p0.d0.g1')!;
    expect(gen.changesNothing).toBe(true);
    expect(gen.generator).toMatchObject({ linePct: 20, marginPts: 10, stopSocPct: 90 });
    const first = r.options.findIndex((o) => o.changesNothing);
    expect(r.options.slice(first).every((o) => o.changesNothing)).toBe(true);
  });

  it('the AGM trailer runs out: LiFePO4 is judged at its own floor, generators run, the cheapest that makes it is named', async () => {
    const r = await sweep(installer, trailerForecast, {
      banks: [
        { chemistry: 'agm', capacityAh: 400 },
        { chemistry: 'lifepo4', capacityAh: 200 },
        { chemistry: 'agm', capacityAh: 800 },
      ],
      panels: [{ watts: 400, mounting: 'flat' }],
      generatorHours: [2],
      payloadKg: 160,
    });
    expect(r.base.passes).toBe(false);
    expect(r.base.firstCutoffAt).not.toBeNull();
    expect(r.ranking).toBe('cost');
    const lfp = r.options.find((o) => o.key === 'b2.p1.d0.g0')!;
    expect(lfp.reservePct).toBe(10);
    expect(lfp.unmetWh).toBe(0);
    expect(lfp.passes).toBe(true);
    expect(lfp.minUsablePct).toBeLessThan(50);
    const gen = r.options.find((o) => o.key === 'b0.p0.d0.g1')!;
    expect(gen.generator!.startSocPct).toBeGreaterThan(60);
    expect(gen.generatorHours).toBeGreaterThan(0);
    expect(gen.unmetWh).toBeLessThan(r.base.unmetWh - 1);
    expect(gen.changesNothing).toBe(false);
    const named = r.options.find((o) => o.key === r.cheapestPassing)!;
    expect(named.total).toBe(Math.min(...r.options.filter((o) => o.passes && tier(o) === 0).map((o) => o.total)));
    // 800 Ah of AGM: 9.6 kWh × 25 kg/kWh (common practice) = 240 kg; less the 200 Ah
    // bank’s 60 kg = 180 kg more, over the stated 160 kg payload.
    const heavy = r.options.find((o) => o.key === 'b3.p0.d0.g0')!;
    expect(heavy.weight).toMatchObject({ kg: 240, addedKg: 180, flagged: true });
  });

  it('when nothing makes it, ranks by closeness and shows the generator’s start level', async () => {
    const r = await sweep(installer, trailerForecast, {
      panels: [
        { watts: 100, mounting: 'flat' },
        { watts: 200, mounting: 'portable' },
      ],
      generatorHours: [1, 2],
    });
    expect(r.options.some((o) => o.passes)).toBe(false);
    expect(r.ranking).toBe('closeness');
    expect(r.generatorRule.linePct).toBe(50);
    expect(r.generatorRule.startSocPct).toBeGreaterThan(60);
    const useful = r.options.filter((o) => tier(o) === 0);
    for (let i = 1; i < useful.length; i++) expect(useful[i]!.unmetWh).toBeGreaterThanOrEqual(useful[i - 1]!.unmetWh);
  });

  it('runs an after-plan edited by hand, judged as an option; bad fields are named', async () => {
    const url = `/api/forecasts/${trailerForecast}/after-plan`;
    const edit = { ...TRAILER_EDIT, payloadKg: 160 };
    const r = await json<{
      base: { passes: boolean };
      after: { passes: boolean; reservePct: number; unmetWh: number };
      changesNothing: boolean;
      generator: Rule;
      weight: { kg: number };
    }>(await api(url, { method: 'POST', session: installer, json: edit }), 200);
    expect(r.base.passes).toBe(false);
    expect(r.after.reservePct).toBe(10);
    expect(r.after.unmetWh).toBe(0);
    expect(r.after.passes).toBe(true);
    expect(r.changesNothing).toBe(false);
    expect(r.generator.linePct).toBe(10);
    // 200 Ah × 12.8 V = 2.56 kWh × 10 kg/kWh (common practice) = 25.6 kg.
    expect(r.weight.kg).toBe(25.6);
    const bad = await api(url, { method: 'POST', session: installer, json: { ...edit, bank: { ...edit.bank, capacityAh: 'abc' } } });
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { issues: { path: string; message: string }[] };
    expect(body.issues).toContainEqual({ path: 'bank.capacityAh', message: 'The bank’s capacity must be a number from 1 to 20000 Ah.' });
  });

  it('turns an after-plan edited by hand into a draft proposal: its parts priced from the list, its forecast the plan as run', async () => {
    const edit = TRAILER_EDIT;
    const ran = await json<{ after: { minSocPct: number; unmetWh: number; generatorHours: number } }>(
      await api(`/api/forecasts/${trailerForecast}/after-plan`, { method: 'POST', session: installer, json: edit }),
      200,
    );
    type Dto = {
      id: string;
      label: string;
      title: string;
      parts: { name: string; quantity: number; unitPrice: number; amount: number }[];
      cables: { input: { label: string } }[];
      cautions: string[];
      after: { minSocPct: number; unmetWh: number; plan: { bank: { chemistry: string; capacityAh: number }; arrays: { name: string }[] }; forecast: { summary: { generatorHours: number } } };
    };
    const p = await json<Dto>(
      await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId: trailerForecast, handPlan: edit, prices: TEST_PRICES } }),
      201,
    );
    // The trailer had a 200 Ah AGM bank, one 100 W portable panel and no generator.
    expect(p.label).toBe('200 Ah LiFePO4 · a generator, up to 4 h a day from 08:00 · new array “Roof” 400 W');
    expect(p.title).toBe(`Upgrade for AGM trailer: ${p.label}`);
    // Priced from TEST_PRICES by hand: 200 Ah × 5 = 1,000; installation 100; the old bank's removal 0;
    // generator 900; 400 W × 1 = 400; the flat mounting with its controller 200.
    expect(p.parts.map((x) => [x.name, x.amount])).toEqual([
      ['200 Ah LiFePO4 bank', 1000],
      ['Bank installation', 100],
      ['Removal of the old 200 Ah AGM bank (in the installation)', 0],
      ['Generator with a 30 A converter/charger', 900],
      ['Panels for “Roof”, 400 W', 400],
      ['Mounting, MPPT controller and wiring for “Roof” (flat on the roof)', 200],
    ]);
    expect(p.parts.reduce((t, x) => t + x.amount, 0)).toBe(2600);
    // Its after-forecast is the plan the installer ran: the same lowest charge, unmet energy and generator hours.
    expect(p.after.plan.bank).toMatchObject({ chemistry: 'lifepo4', capacityAh: 200 });
    expect(p.after.plan.arrays.map((a) => a.name)).toEqual(['Portable panel (100 W)', 'Roof']);
    // (the forecast gives its lowest charge to 0.1 %; the run, unrounded)
    expect(p.after.minSocPct).toBeCloseTo(ran.after.minSocPct, 1);
    expect(p.after.unmetWh).toBe(ran.after.unmetWh);
    expect(p.after.forecast.summary.generatorHours).toBe(ran.after.generatorHours);
    // Cable runs for what it adds: the new bank's feed, the new array's controller, the generator's charger.
    expect(p.cables.map((c) => c.input.label)).toEqual([
      expect.stringMatching(/^Main battery feed/),
      'Added panels: MPPT controller to bank (400 W)',
      'Converter/charger to bank (30 A)',
    ]);
    expect(p.cautions.some((c) => /generator/i.test(c))).toBe(true);
    // The list keeps its name.
    const list = await json<{ id: string; label: string }[]>(await api('/api/proposals', { session: installer }), 200);
    expect(list.find((x) => x.id === p.id)?.label).toBe(p.label);
  });

  it('refuses a hand-edited plan that is the rig as it is, and a request with both or neither kind of change', async () => {
    const asIs = {
      bank: { chemistry: 'agm', capacityAh: 200, floorSocPct: 50 },
      arrays: [{ name: 'Portable panel (100 W)', ratedWatts: 100, tiltDeg: 45, azimuthDeg: 180, aim: 'follow', controller: 'pwm' }],
      dcdcAmps: 0,
      shoreAmps: 0,
      generator: null,
    };
    const post = (body: Record<string, unknown>) => api('/api/proposals', { method: 'POST', session: installer, json: { forecastId: trailerForecast, prices: TEST_PRICES, ...body } });
    const issues = async (res: Response) => ((await json<{ issues: { path: string; message: string }[] }>(res, 400)).issues);
    expect(await issues(await post({ handPlan: asIs }))).toContainEqual({ path: 'handPlan', message: 'This plan is the rig as it is: change something in it before proposing it.' });
    // The same plan with the azimuth of the panel that follows the sun typed otherwise is still the rig as it is.
    expect((await issues(await post({ handPlan: { ...asIs, arrays: [{ ...asIs.arrays[0], azimuthDeg: 90 }] } })))[0]?.path).toBe('handPlan');
    expect(await issues(await post({}))).toContainEqual({ path: 'changes', message: 'Choose an option from the sweep, or run a plan edited by hand, to propose.' });
    expect(await issues(await post({ changes: { dcdcAmps: 30 }, handPlan: { ...asIs, dcdcAmps: 30 } }))).toContainEqual({
      path: 'handPlan',
      message: 'Propose one thing: a sweep option or a plan edited by hand, not both.',
    });
    // Without prices in the request the saved list is used; this installer has none yet, and is told where to save it.
    const unpriced = await api('/api/proposals', { method: 'POST', session: installer, json: { forecastId: trailerForecast, handPlan: { ...asIs, shoreAmps: 40 } } });
    const why = await json<{ error: { message: string }; issues: { path: string; message: string }[] }>(unpriced, 400);
    expect(why.error.message).toBe('Save your price list first (“First, your price list” on this page): sweeps and proposals are priced from it.');
    expect(why.issues).toEqual([{ path: 'prices', message: 'There is no saved price list yet: save yours, or send prices with this request.' }]);
    // A shore charger alone is a change: a part with no price on the list, for the installer to price.
    const shore = await json<{ label: string; parts: { name: string; amount: number }[] }>(await post({ handPlan: { ...asIs, shoreAmps: 40 } }), 201);
    expect(shore.label).toBe('40 A shore charger');
    expect(shore.parts).toEqual([expect.objectContaining({ name: 'Converter/charger on shore power, 40 A (price to enter)', amount: 0 })]);
  });
});

describe('a rig’s stated payload and battery room (migration 0014)', () => {
  it('are saved, read back, cleared, and refused in plain words when they are not numbers', async () => {
    const owner = await signUp({ name: 'Bo' });
    const crewId = (await activeCrew(owner)).id;
    const bank = { chemistry: 'agm', nominalVolts: 12, capacityAh: 100 };
    const rig = await json<{ id: string; version: number; payloadKg: number | null; batterySpaceL: number | null }>(
      await api('/api/rigs', {
        method: 'POST',
        session: owner,
        json: { name: 'Teardrop', bank, crewId, payloadKg: 160, batterySpaceL: 60 },
      }),
      201,
    );
    expect(rig).toMatchObject({ payloadKg: 160, batterySpaceL: 60 });
    expect(await json(await api(`/api/rigs/${rig.id}`, { session: owner }), 200)).toMatchObject({ payloadKg: 160, batterySpaceL: 60 });
    // A patch that does not send them keeps them; null clears one.
    const renamed = await json<{ version: number }>(
      await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: rig.version, name: 'Teardrop 2' } }),
      200,
    );
    expect(renamed).toMatchObject({ payloadKg: 160, batterySpaceL: 60 });
    const cleared = await json(
      await api(`/api/rigs/${rig.id}`, { method: 'PATCH', session: owner, json: { version: renamed.version, batterySpaceL: null } }),
      200,
    );
    expect(cleared).toMatchObject({ payloadKg: 160, batterySpaceL: null });
    const bad = await api('/api/rigs', {
      method: 'POST',
      session: owner,
      json: { name: 'Bad', bank, crewId, payloadKg: 'abc', batterySpaceL: 0 },
    });
    expect(bad.status).toBe(400);
    const issues = ((await bad.json()) as { issues: { path: string; message: string }[] }).issues;
    expect(issues).toContainEqual({ path: 'payloadKg', message: 'The payload must be a number of kilograms, such as 250.' });
    expect(issues).toContainEqual({ path: 'batterySpaceL', message: 'The battery room must be more than 0 L.' });
    // A rig made without them states neither.
    const plain = await json(await api('/api/rigs', { method: 'POST', session: owner, json: { name: 'Plain', bank, crewId } }), 201);
    expect(plain).toMatchObject({ payloadKg: null, batterySpaceL: null });
  });
});
