import type { Kysely } from 'kysely';
import type { DB, ProposalRow } from '../../db/schema';
import type { Forecast, ForecastSummary, ResolvedPlan } from '../engine';
import type { ProposalDto, ProposalListItem, CableRow, Changes, Part, PriceList, ProposalPatchInput, StoredChanges } from '../domain/proposals/proposals.schema';
import { handProposal } from '../domain/proposals/hand-proposal';
import { handPlanApplied, type HandPlan } from '../domain/proposals/sweep-edit';
import { forecast as runEngine } from '../engine';
import { checkCables, defaultCables, lineAmount, proposalCautions, type CheckedCable } from '../domain/proposals/proposals';
import { preferredSizes } from '../domain/proposals/cable';
import { documentTotals, quoteNumber, readDocument, startingDocument, wiringLines } from '../domain/proposals/document';
import type { ProposalDocument } from '../domain/proposals/document.schema';
import { formatMoney } from '../lib/format';
import type { SweepRequestValues } from '../domain/proposals/proposals.schema';
import { forecastAfter, labelOf, oneOffItems, type CostItem } from '../domain/proposals/sweep';
import { installerOnly, tripAccess, type Actor, type RigGrant } from './access';
import { HttpError, type Issue } from './errors';
import { forecastTripId, getForecast, packHourly, unpackHourly, type ForecastDto } from './forecasts';
import { renderMail, type MailContent } from './mail';
import { savedPricesOrThrow } from './price-lists';
import { enqueueMail, kickOutbox } from './outbox';
import { conflict, nowIso } from './versions';
import { oneAtATime } from './workers/per-user';
import { sweepInPool } from './workers/pool';

// Proposals: an installer turns a saved forecast and one sweep option into a priced upgrade with
// its before/after forecasts, parts, cable and fuse checks and cautions; sends it to the crew's
// owners by e-mail; an owner accepts or declines it. Access is decided in access.ts.

/** A saved forecast an installer with a grant may sweep or propose on: 404 when not theirs to see, 403 for the crew. */
export async function forecastForInstaller(db: Kysely<DB>, user: Actor, forecastId: string, field?: string): Promise<{ forecast: ForecastDto & { crewId: string }; access: Awaited<ReturnType<typeof tripAccess>> }> {
  const issues: Issue[] = field ? [{ path: field, message: 'not a saved forecast of a rig shared with you' }] : [];
  const missing = () => new HttpError('not_found', "There is no saved forecast with this id among the rigs shared with you.", issues);
  const tripId = await forecastTripId(db, forecastId);
  if (!tripId) throw missing();
  const access = await tripAccess(db, user, tripId, 'read').catch((e: unknown) => {
    throw e instanceof HttpError && e.code === 'not_found' ? missing() : e;
  });
  installerOnly(access, 'Upgrade sweeps and proposals');
  const forecast = await getForecast(db, forecastId);
  if (!forecast) throw missing();
  return { forecast, access };
}

function packForecast(f: Forecast): string {
  const { hourly, ...rest } = f;
  return JSON.stringify({ ...rest, hourly: packHourly(hourly) });
}

function unpackForecast(s: string): Forecast {
  const stored = JSON.parse(s) as Omit<Forecast, 'hourly'> & { hourly: Parameters<typeof unpackHourly>[0] };
  return { ...stored, hourly: unpackHourly(stored.hourly) };
}

type Brief = Pick<ForecastSummary, 'minSocPct' | 'firstCutoffAt' | 'unmetWh'>;
const brief = (s: ForecastSummary): Brief => ({ minSocPct: s.minSocPct, firstCutoffAt: s.firstCutoffAt, unmetWh: s.unmetWh });

function runningLines(after: Forecast, prices: PriceList): CostItem[] {
  const h = after.summary.generatorHours;
  if (!(h > 0) || !(prices.generatorPerHour > 0)) return [];
  return [{ name: 'Generator running on this trip (fuel and wear, estimate)', quantity: h, unit: 'h', unitPrice: prices.generatorPerHour, amount: h * prices.generatorPerHour, kind: 'running' }];
}

/** A 400 whose message is also the named field's. */
const refusal = (path: string, message: string) => new HttpError('invalid_request', message, [{ path, message }]);

/** A priced line as a draft's part. */
const partOf = (i: CostItem): Part => ({ name: i.name, quantity: i.quantity, unit: i.unit, unitPrice: i.unitPrice });

/** The after-plan's forecast; a change the engine refuses (a bank out of its limits) is the request's fault: name the field. */
function forecastOrRefuse<T>(field: string, run: () => T): T {
  try {
    return run();
  } catch (e) {
    const envelope = (e as { envelope?: { issues?: Issue[]; error?: { message?: string } } }).envelope;
    if (envelope) throw new HttpError('invalid_request', `This option cannot be forecast: ${envelope.error?.message ?? 'invalid change'}`, (envelope.issues ?? []).map((i) => ({ path: `${field}.${i.path}`, message: i.message })));
    throw e;
  }
}

/**
 * Creates a draft from a saved forecast and one sweep option, or an after-plan the installer edited
 * by hand: the after plan is forecast in full, parts priced from the list.
 */
export async function createProposal(
  db: Kysely<DB>,
  p: { forecast: ForecastDto & { crewId: string }; access: RigGrant; installer: { id: string; name: string; units?: unknown }; changes?: Changes; handPlan?: HandPlan; prices: PriceList; title?: string },
): Promise<ProposalDto> {
  const before = p.forecast;
  let after: { plan: ResolvedPlan; forecast: Forecast };
  let changes: StoredChanges;
  let parts: Part[];
  let label: string;
  if (p.handPlan) {
    const edit = p.handPlan;
    const plan = forecastOrRefuse('handPlan', () => handPlanApplied(before.plan, edit, before.reserveSocPct).plan);
    const hand = handProposal(before.plan, edit, plan, p.prices);
    if (!hand.changed) throw refusal('handPlan', 'This plan is the rig as it is: change something in it before proposing it.');
    after = { plan, forecast: forecastOrRefuse('handPlan', () => runEngine(plan)) };
    changes = { ...hand.changes, hand: { label: hand.label, edit } };
    parts = hand.items.map(partOf);
    label = hand.label;
  } else if (p.changes) {
    const c = p.changes;
    after = forecastOrRefuse('changes', () => forecastAfter(before.plan, c, before.reserveSocPct));
    changes = c;
    parts = oneOffItems(before.plan, c, p.prices).map(partOf);
    label = labelOf(c, before.plan);
  } else {
    throw refusal('changes', 'Choose an option from the sweep, or run a plan edited by hand, to propose.');
  }
  const units = p.installer.units === 'metric' || p.installer.units === 'imperial' ? p.installer.units : null;
  const cables = checkCables(defaultCables(after.plan, changes, preferredSizes(p.prices.currency, units)), after.plan);
  const id = crypto.randomUUID();
  const now = nowIso();
  // The installer types company, contact and terms once: a new draft starts from their last document, with the next quote number.
  const mine = await db.selectFrom('proposals').select(['document', 'created_at']).where('installer_id', '=', p.installer.id).orderBy('created_at', 'desc').orderBy('id').execute();
  const year = Number(now.slice(0, 4));
  const sequence = mine.filter((r) => r.created_at.startsWith(String(year))).length + 1;
  const document = startingDocument({ previous: mine[0] ? readDocument(mine[0].document) : {}, quote: quoteNumber(year, sequence), wiringPrices: p.prices.wiring });
  await db
    .insertInto('proposals')
    .values({
      id,
      crew_id: p.access.rig.crew_id,
      rig_id: p.access.rig.id,
      trip_id: before.tripId,
      forecast_id: before.id,
      installer_id: p.installer.id,
      installer_name: p.installer.name,
      title: p.title?.trim() || `Upgrade for ${p.access.rig.name}: ${label}`,
      changes: JSON.stringify(changes),
      currency: p.prices.currency,
      parts: JSON.stringify(parts),
      running: JSON.stringify(runningLines(after.forecast, p.prices)),
      cables: JSON.stringify(cables),
      cautions: JSON.stringify(proposalCautions(after.plan, changes)),
      document: JSON.stringify(document),
      reserve_soc_pct: before.reserveSocPct,
      summary: JSON.stringify({ before: brief(before.forecast.summary), after: brief(after.forecast.summary) }),
      before_plan: JSON.stringify(before.plan),
      before_result: packForecast(before.forecast),
      after_plan: JSON.stringify(after.plan),
      after_result: packForecast(after.forecast),
      created_at: now,
      updated_at: now,
    })
    .execute();
  const row = await db.selectFrom('proposals').selectAll().where('id', '=', id).executeTakeFirstOrThrow();
  return toDto(db, row, { ...p.access, role: 'installer' }, p.installer.id);
}

/** A proposal's name for what it changes: a hand-edited plan keeps the one made when it was drafted. */
function labelFromStored(c: StoredChanges, plan: ResolvedPlan): string {
  return c.hand?.label ?? labelOf(c, plan);
}

function listQuery(db: Kysely<DB>) {
  return db
    .selectFrom('proposals')
    .innerJoin('rigs', 'rigs.id', 'proposals.rig_id')
    .innerJoin('crews', 'crews.id', 'proposals.crew_id')
    .leftJoin('trips', 'trips.id', 'proposals.trip_id')
    .select([
      'proposals.id',
      'proposals.title',
      'proposals.status',
      'proposals.version',
      'proposals.rig_id',
      'proposals.trip_id',
      'proposals.installer_name',
      'proposals.currency',
      'proposals.parts',
      'proposals.cables',
      'proposals.document',
      'proposals.changes',
      'proposals.summary',
      'proposals.before_plan',
      'proposals.created_at',
      'proposals.updated_at',
      'proposals.sent_at',
      'proposals.decided_at',
      'rigs.name as rig_name',
      'crews.name as crew_name',
      'trips.name as trip_name',
    ]);
}

type ListRow = Pick<ProposalRow, 'id' | 'title' | 'status' | 'version' | 'rig_id' | 'trip_id' | 'installer_name' | 'currency' | 'parts' | 'cables' | 'document' | 'changes' | 'summary' | 'before_plan' | 'created_at' | 'updated_at' | 'sent_at' | 'decided_at'> & {
  rig_name: string;
  crew_name: string;
  trip_name: string | null;
};

/** The document's sums: parts, the cable check's wiring at the document's prices, labour, removals and tax. */
function totalsOf(r: Pick<ProposalRow, 'parts' | 'cables' | 'document'>) {
  const doc = readDocument(r.document);
  const wiring = wiringLines(JSON.parse(r.cables) as CheckedCable[], doc.wiringPrices);
  return { doc, wiring, totals: documentTotals(JSON.parse(r.parts) as Part[], wiring, doc) };
}

function toListItem(r: ListRow): ProposalListItem {
  const summary = JSON.parse(r.summary) as { before: Brief; after: Brief };
  const plan = JSON.parse(r.before_plan) as ResolvedPlan;
  return {
    id: r.id,
    title: r.title,
    status: r.status,
    version: r.version,
    rigId: r.rig_id,
    rigName: r.rig_name,
    crewName: r.crew_name,
    tripId: r.trip_id,
    tripName: r.trip_name,
    installerName: r.installer_name,
    currency: r.currency,
    total: totalsOf(r).totals.total,
    label: labelFromStored(JSON.parse(r.changes) as StoredChanges, plan),
    before: summary.before,
    after: summary.after,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    sentAt: r.sent_at,
    decidedAt: r.decided_at,
  };
}

/**
 * The proposals a user sees, newest first: an installer, their own on rigs still shared with them;
 * a crew member, those sent to the crews they are in.
 */
export async function listProposals(db: Kysely<DB>, user: Actor & { kind?: string }): Promise<ProposalListItem[]> {
  let q = listQuery(db);
  if (user.kind === 'installer') {
    q = q
      .innerJoin('rig_grants', (j) => j.onRef('rig_grants.rig_id', '=', 'proposals.rig_id').on('rig_grants.installer_id', '=', user.id))
      .where('proposals.installer_id', '=', user.id);
  } else {
    q = q
      .innerJoin('crew_members', (j) => j.onRef('crew_members.crew_id', '=', 'rigs.crew_id').on('crew_members.user_id', '=', user.id))
      .where('proposals.status', '!=', 'draft');
  }
  // Proposals on a deleted rig are hidden with it (and come back when it is restored).
  const rows = await q.where('rigs.deleted_at', 'is', null).orderBy('proposals.created_at', 'desc').orderBy('proposals.id').execute();
  return rows.map(toListItem);
}

/** The whole proposal as the caller may see it. */
export async function toDto(db: Kysely<DB>, row: ProposalRow, access: Pick<RigGrant, 'role'>, userId: string): Promise<ProposalDto> {
  const item = await listQuery(db).where('proposals.id', '=', row.id).executeTakeFirstOrThrow();
  const decider = row.decided_by ? await db.selectFrom('user').select('name').where('id', '=', row.decided_by).executeTakeFirst() : undefined;
  const list = toListItem(item);
  const parts = (JSON.parse(row.parts) as Part[]).map((p) => ({ ...p, amount: lineAmount(p) }));
  const { doc, wiring, totals } = totalsOf(row);
  return {
    ...list,
    forecastId: row.forecast_id,
    notes: row.notes,
    changes: JSON.parse(row.changes) as StoredChanges,
    parts,
    document: doc,
    wiring,
    totals,
    running: JSON.parse(row.running) as CostItem[],
    cables: JSON.parse(row.cables) as CheckedCable[],
    cautions: JSON.parse(row.cautions) as string[],
    reserveSocPct: row.reserve_soc_pct,
    before: { ...list.before, plan: JSON.parse(row.before_plan) as ResolvedPlan, forecast: unpackForecast(row.before_result) },
    after: { ...list.after, plan: JSON.parse(row.after_plan) as ResolvedPlan, forecast: unpackForecast(row.after_result) },
    decision: row.decided_at ? { comment: row.decision_comment ?? '', by: decider?.name ?? null, at: row.decided_at, name: row.accepted_name } : null,
    canEdit: access.role === 'installer' && row.installer_id === userId && row.status === 'draft',
    canDecide: access.role === 'owner' && row.status === 'sent',
    mine: access.role === 'installer',
  };
}

async function reread(db: Kysely<DB>, id: string): Promise<ProposalRow> {
  return db.selectFrom('proposals').selectAll().where('id', '=', id).executeTakeFirstOrThrow();
}

async function staleOr(db: Kysely<DB>, id: string, access: Pick<RigGrant, 'role'>, userId: string): Promise<never> {
  const now = await db.selectFrom('proposals').selectAll().where('id', '=', id).executeTakeFirst();
  if (!now) throw new HttpError('not_found', 'This proposal was deleted meanwhile.');
  throw conflict('proposal', await toDto(db, now, access, userId));
}

/** Edits a draft's title, notes, currency, parts or cable runs (checks rerun here, never trusted from the client). */
export async function patchProposal(db: Kysely<DB>, row: ProposalRow, access: RigGrant, userId: string, input: ProposalPatchInput & { parts?: Part[]; cables?: CableRow[]; document?: ProposalDocument }): Promise<ProposalDto> {
  if (row.status !== 'draft') {
    throw new HttpError('conflict', 'This proposal was sent to the crew, so it can no longer be changed.', [], { current: await toDto(db, row, access, userId) });
  }
  const after = JSON.parse(row.after_plan) as ResolvedPlan;
  const res = await db
    .updateTable('proposals')
    .set({
      ...(input.title !== undefined ? { title: input.title } : {}),
      ...(input.notes !== undefined ? { notes: input.notes } : {}),
      ...(input.currency !== undefined ? { currency: input.currency } : {}),
      ...(input.parts !== undefined ? { parts: JSON.stringify(input.parts) } : {}),
      ...(input.cables !== undefined ? { cables: JSON.stringify(checkCables(input.cables, after)) } : {}),
      ...(input.document !== undefined ? { document: JSON.stringify(input.document) } : {}),
      version: row.version + 1,
      updated_at: nowIso(),
    })
    .where('id', '=', row.id)
    .where('version', '=', input.version)
    .where('status', '=', 'draft')
    .executeTakeFirst();
  if (res.numUpdatedRows !== 1n) await staleOr(db, row.id, access, userId);
  return toDto(db, await reread(db, row.id), access, userId);
}

/** The e-mail to a crew owner: who proposes what for which rig, the total, and the link. */
export function proposalMail(p: { ownerName: string; installerName: string; rigName: string; title: string; total: string; url: string }): MailContent {
  // Names and titles are the users' own words: never in the subject (one could pose as a notice
  // from us), only in the body, quoted, where renderMail escapes them.
  return renderMail({
    subject: 'An installer sent your crew an upgrade proposal on Sunreckon',
    greeting: 'Hello,',
    intro: [
      `An installer who signs as “${p.installerName}” sent you an upgrade proposal for your rig “${p.rigName}”. Its title, in the installer’s words: “${p.title}”.`,
      `It shows your saved forecast before and after the change, the quote (${p.total} in all, tax included): parts, cables and fuses, labour, and the cautions that go with them. Figures are estimates.`,
      'Open it in Sunreckon to accept or decline it, with a comment for your installer.',
    ],
    action: { label: 'Open the proposal', url: p.url },
    outro: ['Nothing is ordered or changed on your rig until you and your installer agree.'],
  });
}

/** The e-mail to the installer when the crew answers. */
export function decisionMail(p: { installerName: string; ownerName: string; rigName: string; title: string; decision: 'accepted' | 'declined'; comment: string; url: string }): MailContent {
  return renderMail({
    subject: `A crew ${p.decision} your proposal on Sunreckon`,
    greeting: 'Hello,',
    intro: [
      `A crew owner who signs as “${p.ownerName}” ${p.decision} your proposal “${p.title}” for the rig “${p.rigName}”.`,
      ...(p.comment ? [`Their comment, in their words: “${p.comment}”`] : []),
    ],
    action: { label: 'Open the proposal', url: p.url },
  });
}

/**
 * Why a draft cannot be sent yet, or null: it needs at least one part, labour line or old part to
 * take out — an empty proposal would reach the crew with nothing to do and a total of 0.
 */
export function sendProblem(row: Pick<ProposalRow, 'parts' | 'document'>): string | null {
  const parts = JSON.parse(row.parts) as Part[];
  const doc = readDocument(row.document);
  if (parts.length + doc.labour.length + doc.removals.length === 0) {
    return 'Add at least one part or labour line before sending: the crew would get a proposal with nothing to do and a total of 0.';
  }
  return null;
}

/** Sends a draft to the crew: status sent, and an e-mail to each owner through the outbox in the same transaction. */
export async function sendProposal(db: Kysely<DB>, row: ProposalRow, access: RigGrant, userId: string, version: number, origin: string): Promise<ProposalDto> {
  if (row.status !== 'draft') {
    throw new HttpError('conflict', 'This proposal was already sent.', [], { current: await toDto(db, row, access, userId) });
  }
  const problem = sendProblem(row);
  if (problem) throw new HttpError('invalid_request', problem, [{ path: 'parts', message: problem }]);
  let stale = false;
  await db.transaction().execute(async (trx) => {
    const now = nowIso();
    const res = await trx
      .updateTable('proposals')
      .set({ status: 'sent', sent_at: now, version: row.version + 1, updated_at: now })
      .where('id', '=', row.id)
      .where('version', '=', version)
      .where('status', '=', 'draft')
      .executeTakeFirst();
    if (res.numUpdatedRows !== 1n) {
      stale = true;
      return;
    }
    const owners = await trx
      .selectFrom('crew_members')
      .innerJoin('user', 'user.id', 'crew_members.user_id')
      .select(['user.name', 'user.email'])
      .where('crew_members.crew_id', '=', row.crew_id)
      .where('crew_members.role', '=', 'owner')
      .execute();
    const rig = await trx.selectFrom('rigs').select('name').where('id', '=', row.rig_id).executeTakeFirstOrThrow();
    const total = formatMoney(totalsOf(row).totals.total, row.currency);
    for (const o of owners) {
      await enqueueMail(trx, 'proposal', o.email, proposalMail({ ownerName: o.name, installerName: row.installer_name, rigName: rig.name, title: row.title, total, url: `${origin}/proposals/${row.id}` }));
    }
  });
  if (stale) await staleOr(db, row.id, access, userId);
  kickOutbox();
  return toDto(db, await reread(db, row.id), access, userId);
}

/** The owner's answer: accepted or declined with a comment; the installer hears of it by e-mail. */
export async function decideProposal(
  db: Kysely<DB>,
  row: ProposalRow,
  access: RigGrant,
  user: Actor & { name: string },
  input: { version: number; decision: 'accepted' | 'declined'; comment: string; name: string },
  origin: string,
): Promise<ProposalDto> {
  if (row.status !== 'sent') {
    throw new HttpError('conflict', `This proposal was already ${row.status}.`, [], { current: await toDto(db, row, access, user.id) });
  }
  let stale = false;
  await db.transaction().execute(async (trx) => {
    const now = nowIso();
    const res = await trx
      .updateTable('proposals')
      .set({ status: input.decision, decision_comment: input.comment, accepted_name: input.decision === 'accepted' ? input.name : null, decided_by: user.id, decided_at: now, version: row.version + 1, updated_at: now })
      .where('id', '=', row.id)
      .where('version', '=', input.version)
      .where('status', '=', 'sent')
      .executeTakeFirst();
    if (res.numUpdatedRows !== 1n) {
      stale = true;
      return;
    }
    const installer = row.installer_id ? await trx.selectFrom('user').select(['name', 'email']).where('id', '=', row.installer_id).executeTakeFirst() : undefined;
    if (installer) {
      const rig = await trx.selectFrom('rigs').select('name').where('id', '=', row.rig_id).executeTakeFirstOrThrow();
      await enqueueMail(
        trx,
        'proposal-decision',
        installer.email,
        decisionMail({ installerName: installer.name, ownerName: user.name, rigName: rig.name, title: row.title, decision: input.decision, comment: input.comment, url: `${origin}/proposals/${row.id}` }),
      );
    }
  });
  if (stale) await staleOr(db, row.id, access, user.id);
  kickOutbox();
  return toDto(db, await reread(db, row.id), access, user.id);
}

/** Deletes a draft (a sent proposal stays: the crew has it). */
export async function deleteProposal(db: Kysely<DB>, row: ProposalRow, access: RigGrant, userId: string, version: number): Promise<void> {
  if (row.status !== 'draft') {
    throw new HttpError('conflict', 'A sent proposal cannot be deleted: the crew has it.', [], { current: await toDto(db, row, access, userId) });
  }
  const res = await db.deleteFrom('proposals').where('id', '=', row.id).where('version', '=', version).where('status', '=', 'draft').executeTakeFirst();
  if (res.numDeletedRows !== 1n) await staleOr(db, row.id, access, userId);
}

/**
 * Upgrade sweep on a saved forecast: every combination of the candidates rerun with the engine,
 * priced from the sent prices or the installer's saved list; `ms` is how long the runs took.
 * Returns the answer's JSON text.
 */
export async function sweepForecast(db: Kysely<DB>, installerId: string, forecast: ForecastDto, body: SweepRequestValues): Promise<string> {
  const prices = body.prices ?? (await savedPricesOrThrow(db, installerId));
  // In the worker pool, at most SWEEPS_PER_USER at once per installer: the request thread stays free.
  // The answer comes back as its JSON text (SweepResult & { forecastId, ms }).
  return oneAtATime(installerId, () => sweepInPool({ forecastId: forecast.id, plan: forecast.plan, reserveSocPct: forecast.reserveSocPct, candidates: body.candidates, prices }));
}
