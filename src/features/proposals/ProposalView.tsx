import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import { asNumber } from '../../components/ui/form';
import { formatDate, formatMoney, formatNumber } from '../../lib/format';
import { ApiError, isConflict, type ApiIssue } from '../../lib/query-client';
import { fromDisplayLength, lengthUnit, toDisplayLength, type Units } from '../../lib/units';
import { AMPACITY_TABLES, AMPACITY_TABLE_NAMES, AWG_SIZES, DROP_METHODS, DROP_METHOD_SHORT, METRIC_SIZES, type AmpacityTable, type DropMethod, type SizeSystem } from '../../domain/proposals/cable';
import { type ProposalDto, proposalPatchSchema, type CableRowInput } from '../../domain/proposals/proposals.schema';
import { lineAmount } from '../../domain/proposals/proposals';
import { documentTotals, wiringLines } from '../../domain/proposals/document';
import type { ProposalDocument } from '../../domain/proposals/document.schema';
import CompareView from '../forecast/CompareView';
import { Cautions, DocumentHead, PartsTable, quoteDate } from './ProposalTables';
import { decideProposal, deleteProposal, patchProposal, sendProposal } from './proposals.api';
import { proposalKeys, proposalQueries } from './proposals.queries';
import { STATUS_LOOK } from './status';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';


const outcome = (s: { minSocPct: number; firstCutoffAt: string | null; unmetWh: number }) =>
  s.firstCutoffAt ? `runs out, ${formatNumber(s.unmetWh)} Wh short` : `lowest ${formatNumber(s.minSocPct)} %, no cutoff`;

/** One proposal: before/after forecasts, parts, cables, cautions; the installer edits and sends a draft, the crew's owner answers. */
function ProposalView({ id, units, clock }: { id: string; units: Units; clock?: ZoneClock | null }) {
  const zone = useUserZone(clock);
  const q = useQuery(proposalQueries.detail(id));
  if (q.isPending) return <LoadingState label="Loading the proposal…" />;
  if (q.isError) return <ErrorState error={q.error} title="This proposal could not be loaded." onRetry={() => void q.refetch()} />;
  return <Loaded p={q.data} units={units} zone={zone} />;
}

function Loaded({ p, units, zone }: { p: ProposalDto; units: Units; zone: ZoneClock }) {
  const s = STATUS_LOOK[p.status];
  return (
    <article className="proposal-doc space-y-6" data-testid="proposal" data-status={p.status}>
      <header className="space-y-3">
        <p className="hidden text-sm font-bold uppercase tracking-wide text-ember-deep print:block">Upgrade proposal{p.document.quoteNumber ? ` · ${p.document.quoteNumber}` : ''}</p>
        <div className="flex flex-wrap items-start justify-between gap-3">
          <h1 className="text-2xl sm:text-3xl print:text-xl">{p.title}</h1>
          <span className={`rounded-full px-3 py-1 text-sm font-bold print:hidden ${s.cls}`} data-testid="proposal-status">{s.label}</span>
        </div>
        <DocumentHead p={p} />
        <div className="no-print flex flex-wrap gap-2">
          <button type="button" className="btn btn-quiet" onClick={() => window.print()}>Print</button>
          {p.mine && p.forecastId && p.tripId ? <a className="btn btn-quiet" href={`/trips/${encodeURIComponent(p.tripId)}/forecasts/${encodeURIComponent(p.forecastId)}`}>Open the saved forecast</a> : null}
        </div>
      </header>

      {p.decision ? (
        <section className={`rounded-[14px] border-l-[6px] p-4 ${p.status === 'accepted' ? 'border-moss bg-[#eef5ef]' : 'border-ember bg-[#fbebe2]'}`} data-testid="decision">
          <p className="font-extrabold">
            {p.status === 'accepted' ? `Accepted by ${p.decision.name ?? p.decision.by ?? 'the crew'}` : `Declined${p.decision.by ? ` by ${p.decision.by}` : ''}`} on {formatInstant(p.decision.at, zone, 'dayTimeYear')}
          </p>
          {p.status === 'accepted' && p.decision.by && p.decision.name && p.decision.name !== p.decision.by ? <p className="text-sm">Signed in as {p.decision.by}.</p> : null}
          {p.decision.comment ? <p className="mt-1 whitespace-pre-line">“{p.decision.comment}”</p> : null}
        </section>
      ) : null}
      {p.canDecide ? <DecisionForm p={p} /> : null}
      {p.status === 'sent' && !p.canDecide && !p.mine ? <p className="caution no-print">The crew’s owner accepts or declines this proposal.</p> : null}
      {p.status === 'sent' && p.mine ? <p className="caution no-print">Sent to the crew’s owners by e-mail; their answer shows here.</p> : null}

      <section aria-labelledby="what-heading" className="card p-4 sm:p-5 print:break-inside-avoid print:p-0 print:shadow-none print:border-0 print:bg-transparent">
        <h2 id="what-heading" className="text-xl">What changes</h2>
        <p className="mt-1 text-lg font-bold">{p.label}</p>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 text-sm" data-testid="before-after">
          <dt className="text-slate-text">Before</dt>
          <dd>{outcome(p.before)}</dd>
          <dt className="text-slate-text">After</dt>
          <dd className="font-bold">{outcome(p.after)}</dd>
        </dl>
        {p.notes ? <p className="mt-2 whitespace-pre-line" data-testid="notes">{p.notes}</p> : null}
      </section>

      <div className="print:hidden">
        <CompareView a={{ name: 'Before', forecast: p.before.forecast, plan: p.before.plan }} b={{ name: 'After', forecast: p.after.forecast, plan: p.after.plan }} reserveSocPct={p.reserveSocPct} />
      </div>

      {p.canEdit ? <DraftEditor p={p} units={units} /> : null}

      <section aria-labelledby="parts-heading" className="card p-4 sm:p-5 print:p-0 print:shadow-none print:border-0 print:bg-transparent">
        <h2 id="parts-heading" className="mb-2 text-xl">{p.canEdit ? 'The quote as last saved' : 'Quote'}</h2>
        <PartsTable p={p} units={units} />
      </section>
      {p.document.terms ? (
        <section aria-labelledby="terms-heading" className="print:break-inside-avoid">
          <h2 id="terms-heading" className="mb-1 text-xl">Terms</h2>
          <p className="whitespace-pre-line text-sm" data-testid="terms">{p.document.terms}</p>
        </section>
      ) : null}
      <Cautions items={p.cautions} units={units} />
      {p.status !== 'accepted' ? (
        <section className="hidden print:block print:break-inside-avoid" aria-label="Acceptance">
          <p className="text-sm">Accepted on behalf of {p.crewName}:</p>
          <p className="mt-6 grid grid-cols-2 gap-8 text-sm"><span className="border-t border-dusk pt-1">Name and signature</span><span className="border-t border-dusk pt-1">Date</span></p>
        </section>
      ) : null}
      <p className="hidden text-xs text-slate-text print:block">Prepared with Sunreckon by {p.document.company || p.installerName}, {formatDate(quoteDate(p))}. Figures are estimates from the forecast model; local codes and a qualified electrician decide.</p>
    </article>
  );
}

function DecisionForm({ p }: { p: ProposalDto }) {
  const qc = useQueryClient();
  const [comment, setComment] = useState('');
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string | null>(null);
  const decide = useMutation({
    mutationFn: (decision: 'accepted' | 'declined') => decideProposal(p.id, { decision, comment, name, version: p.version }),
    onSuccess: (dto) => {
      qc.setQueryData(proposalKeys.detail(p.id), dto);
      void qc.invalidateQueries({ queryKey: proposalKeys.list() });
    },
    onError: (e) => {
      if (isConflict(e)) void qc.invalidateQueries({ queryKey: proposalKeys.detail(p.id) });
    },
  });
  return (
    <form className="card no-print space-y-3 border-2 border-ember p-4 sm:p-5" aria-label="Your answer" onSubmit={(e) => e.preventDefault()}>
      <h2 className="text-xl">Your answer</h2>
      <p className="text-slate-text">Accepting tells {p.installerName} to go ahead; nothing is ordered until you two agree the details.</p>
      <div>
        <label htmlFor="decision-name" className="field-label">Your name, to accept</label>
        <input id="decision-name" className="field-input max-w-sm" maxLength={120} autoComplete="name" value={name} aria-invalid={nameError ? true : undefined} aria-describedby="decision-name-hint" onChange={(e) => { setName(e.target.value); setNameError(null); }} />
        <p id="decision-name-hint" className={nameError ? 'field-error' : 'field-hint mt-1'} role={nameError ? 'alert' : undefined}>{nameError ?? 'Recorded with the date and time as your acceptance.'}</p>
      </div>
      <div>
        <label htmlFor="decision-comment" className="field-label">Comment for {p.installerName} (optional)</label>
        <textarea id="decision-comment" className="field-input min-h-[5rem]" maxLength={2000} value={comment} onChange={(e) => setComment(e.target.value)} />
      </div>
      {decide.isError ? <p role="alert" className="field-error">{isConflict(decide.error) ? 'This proposal changed or was already answered; it is shown as it is now.' : decide.error.message}</p> : null}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn btn-primary" disabled={decide.isPending} onClick={() => { if (!name.trim()) { setNameError('Type your name to accept: it is recorded with the time, as a signature.'); return; } decide.mutate('accepted'); }}>{decide.isPending && decide.variables === 'accepted' ? 'Accepting…' : 'Accept the proposal'}</button>
        <button type="button" className="btn btn-quiet" disabled={decide.isPending} onClick={() => decide.mutate('declined')}>{decide.isPending && decide.variables === 'declined' ? 'Declining…' : 'Decline'}</button>
      </div>
    </form>
  );
}

interface PartDraft {
  name: string;
  quantity: string;
  unit: string;
  unitPrice: string;
}
interface CableDraft {
  label: string;
  kind: 'charger' | 'inverter' | 'current';
  amps: string;
  watts: string;
  efficiencyPct: string;
  lowestVolts: string;
  oneWay: string;
  circuit: 'critical' | 'non-critical';
  table: AmpacityTable;
  chosenAwg: string;
  method: DropMethod;
  sizes: SizeSystem;
  basis: string;
}
interface DocDraft {
  company: string;
  contactName: string;
  phone: string;
  email: string;
  address: string;
  licence: string;
  quoteNumber: string;
  validDays: string;
  taxRatePct: string;
  terms: string;
  labour: { name: string; hours: string; rate: string }[];
  removals: { name: string; kind: 'removal' | 'trade-in'; amount: string }[];
  wiring: { cablePerMm2M: string; fuse: string; busBars: string };
}

function docDraft(d: ProposalDocument): DocDraft {
  return {
    company: d.company,
    contactName: d.contactName,
    phone: d.phone,
    email: d.email,
    address: d.address,
    licence: d.licence,
    quoteNumber: d.quoteNumber,
    validDays: String(d.validDays),
    taxRatePct: String(d.taxRatePct),
    terms: d.terms,
    labour: d.labour.map((l) => ({ name: l.name, hours: String(l.hours), rate: String(l.rate) })),
    removals: d.removals.map((r) => ({ name: r.name, kind: r.kind, amount: String(r.amount) })),
    wiring: { cablePerMm2M: String(d.wiringPrices.cablePerMm2M), fuse: String(d.wiringPrices.fuse), busBars: String(d.wiringPrices.busBars) },
  };
}

function draftsOf(p: ProposalDto, units: Units) {
  return {
    title: p.title,
    notes: p.notes,
    parts: p.parts.map((x) => ({ name: x.name, quantity: String(x.quantity), unit: x.unit, unitPrice: String(x.unitPrice) })),
    cables: p.cables.map(({ input: c }): CableDraft => ({
      label: c.label,
      kind: c.source.kind,
      amps: 'amps' in c.source ? String(c.source.amps) : '',
      watts: c.source.kind === 'inverter' ? String(c.source.watts) : '',
      efficiencyPct: c.source.kind === 'inverter' ? String(c.source.efficiencyPct) : String(p.after.plan.inverter.efficiencyPct),
      lowestVolts: c.source.kind === 'inverter' ? String(c.source.lowestVolts) : '10.5',
      oneWay: String(toDisplayLength(c.oneWayM, units)),
      circuit: c.circuit,
      table: c.table ?? 'abyc-105c',
      chosenAwg: c.chosenAwg ?? '',
      method: c.method ?? 'nec-75c',
      sizes: c.sizes ?? 'awg',
      basis: c.basis ?? '',
    })),
    doc: docDraft(p.document),
  };
}

const n = (s: string) => asNumber(s) ?? NaN;

function toCableInput(c: CableDraft, units: Units): CableRowInput {
  const source = c.kind === 'inverter' ? { kind: 'inverter' as const, watts: n(c.watts), efficiencyPct: n(c.efficiencyPct), lowestVolts: n(c.lowestVolts) } : { kind: c.kind, amps: n(c.amps) };
  const len = n(c.oneWay);
  return { label: c.label, source, oneWayM: Number.isFinite(len) ? fromDisplayLength(len, units) : NaN, circuit: c.circuit, table: c.table, chosenAwg: c.chosenAwg || null, method: c.method, sizes: c.sizes, ...(c.basis ? { basis: c.basis } : {}) };
}

function toDocument(d: DocDraft, issuedOn: string | null) {
  return {
    company: d.company,
    contactName: d.contactName,
    phone: d.phone,
    email: d.email,
    address: d.address,
    licence: d.licence,
    quoteNumber: d.quoteNumber,
    issuedOn,
    validDays: n(d.validDays),
    taxRatePct: n(d.taxRatePct),
    terms: d.terms,
    labour: d.labour.map((l) => ({ name: l.name, hours: n(l.hours), rate: n(l.rate) })),
    removals: d.removals.map((r) => ({ name: r.name, kind: r.kind, amount: n(r.amount) })),
    wiringPrices: { cablePerMm2M: n(d.wiring.cablePerMm2M), fuse: n(d.wiring.fuse), busBars: n(d.wiring.busBars) },
  };
}

function DraftEditor({ p, units }: { p: ProposalDto; units: Units }) {
  const qc = useQueryClient();
  const [d, setD] = useState(() => draftsOf(p, units));
  const [issues, setIssues] = useState<ApiIssue[]>([]);
  const [conflictWith, setConflictWith] = useState<ProposalDto | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [dirty, setDirty] = useState(false);
  const edit = (next: typeof d) => {
    setD(next);
    setDirty(true);
    setStatus(null);
  };
  const body = (version: number) => ({
    version,
    title: d.title,
    notes: d.notes,
    parts: d.parts.map((x) => ({ name: x.name, quantity: n(x.quantity), unit: x.unit, unitPrice: n(x.unitPrice) })),
    cables: d.cables.map((c) => toCableInput(c, units)),
    document: toDocument(d.doc, p.document.issuedOn),
  });
  const apply = (dto: ProposalDto) => {
    qc.setQueryData(proposalKeys.detail(p.id), dto);
    void qc.invalidateQueries({ queryKey: proposalKeys.list() });
  };
  const save = useMutation({
    mutationFn: (version: number) => patchProposal(p.id, body(version)),
    onSuccess: (dto) => {
      apply(dto);
      setD(draftsOf(dto, units));
      setDirty(false);
      setIssues([]);
      setConflictWith(null);
      setStatus('Draft saved; the cable checks are updated.');
    },
    onError: (e) => {
      if (isConflict(e)) setConflictWith(e.current<ProposalDto>() ?? null);
      else if (e instanceof ApiError) setIssues(e.issues);
    },
  });
  const send = useMutation({ mutationFn: () => sendProposal(p.id, p.version), onSuccess: apply, onError: (e) => { if (isConflict(e)) void qc.invalidateQueries({ queryKey: proposalKeys.detail(p.id) }); } });
  const remove = useMutation({ mutationFn: () => deleteProposal(p.id, p.version), onSuccess: () => window.location.assign('/proposals') });

  const submit = () => {
    const parsed = proposalPatchSchema.safeParse(body(p.version));
    if (!parsed.success) {
      setIssues(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message })));
      return;
    }
    save.mutate(p.version);
  };
  const err = (path: string) => issues.find((i) => i.path === path || i.path.startsWith(path + '.'))?.message;
  const z = (x: string) => n(x) || 0;
  const liveWiring = wiringLines(p.cables, { cablePerMm2M: z(d.doc.wiring.cablePerMm2M), fuse: z(d.doc.wiring.fuse), busBars: z(d.doc.wiring.busBars) });
  const total = documentTotals(
    d.parts.map((x) => ({ quantity: z(x.quantity), unitPrice: z(x.unitPrice) })),
    liveWiring,
    { labour: d.doc.labour.map((l) => ({ name: l.name, hours: z(l.hours), rate: z(l.rate) })), removals: d.doc.removals.map((r) => ({ name: r.name, kind: r.kind, amount: z(r.amount) })), taxRatePct: z(d.doc.taxRatePct) },
  ).total;
  const setDoc = (patch: Partial<DocDraft>) => edit({ ...d, doc: { ...d.doc, ...patch } });
  const nothingToSend = p.parts.length + p.document.labour.length + p.document.removals.length === 0;
  const money = (x: number) => formatMoney(x, p.currency);
  const setPart = (i: number, k: keyof PartDraft, v: string) => edit({ ...d, parts: d.parts.map((x, j) => (j === i ? { ...x, [k]: v } : x)) });
  const setCable = (i: number, k: keyof CableDraft, v: string) => edit({ ...d, cables: d.cables.map((x, j) => (j === i ? { ...x, [k]: v } : x)) });

  return (
    <section aria-labelledby="edit-heading" className="card no-print space-y-5 border-2 border-sand-dark p-4 sm:p-5" data-testid="draft-editor">
      <div>
        <h2 id="edit-heading" className="text-xl">Your draft</h2>
        <p className="text-slate-text">The crew sees it once you send it. Cable checks are worked out again on the server when you save.</p>
      </div>
      {conflictWith ? (
        <ConflictNotice
          what="proposal"
          theirs={{ version: conflictWith.version, updatedAt: conflictWith.updatedAt }}
          busy={save.isPending}
          onKeepMine={() => save.mutate(conflictWith.version)}
          onTakeTheirs={() => {
            apply(conflictWith);
            setD(draftsOf(conflictWith, units));
            setDirty(false);
            setConflictWith(null);
          }}
        />
      ) : null}
      <div>
        <label htmlFor="edit-title" className="field-label">Title</label>
        <input id="edit-title" className="field-input" maxLength={120} value={d.title} aria-invalid={err('title') ? true : undefined} onChange={(e) => edit({ ...d, title: e.target.value })} />
        {err('title') ? <p className="field-error" role="alert">{err('title')}</p> : null}
      </div>
      <div>
        <label htmlFor="edit-notes" className="field-label">Notes for the crew</label>
        <textarea id="edit-notes" className="field-input min-h-[6rem]" maxLength={5000} value={d.notes} placeholder="Where the parts go, what stays, when you could fit them…" onChange={(e) => edit({ ...d, notes: e.target.value })} />
      </div>

      <fieldset className="grid gap-2 sm:grid-cols-2" data-testid="document-fields">
        <legend className="mb-1 text-lg font-extrabold">Your details on the quote</legend>
        <Text id="doc-company" label="Company" value={d.doc.company} error={err('document.company')} onChange={(v) => setDoc({ company: v })} />
        <Text id="doc-contactName" label="Contact name" value={d.doc.contactName} error={err('document.contactName')} onChange={(v) => setDoc({ contactName: v })} />
        <Text id="doc-phone" label="Phone" value={d.doc.phone} error={err('document.phone')} onChange={(v) => setDoc({ phone: v })} />
        <Text id="doc-email" label="E-mail" value={d.doc.email} error={err('document.email')} onChange={(v) => setDoc({ email: v })} />
        <Text id="doc-address" label="Address" value={d.doc.address} error={err('document.address')} onChange={(v) => setDoc({ address: v })} />
        <Text id="doc-licence" label="Licence or registration no. (optional)" value={d.doc.licence} error={err('document.licence')} onChange={(v) => setDoc({ licence: v })} />
        <Text id="doc-quoteNumber" label="Quote no." value={d.doc.quoteNumber} error={err('document.quoteNumber')} onChange={(v) => setDoc({ quoteNumber: v })} />
        <Text id="doc-validDays" label="Valid for (days)" value={d.doc.validDays} error={err('document.validDays')} onChange={(v) => setDoc({ validDays: v })} numeric />
        <p className="field-hint sm:col-span-2">Kept for your next proposal, so you type them once.</p>
      </fieldset>

      <fieldset>
        <legend className="text-lg font-extrabold">Parts ({p.currency})</legend>
        <ul className="mt-2 space-y-3">
          {d.parts.map((x, i) => (
            <li key={i} className="grid grid-cols-2 gap-2 rounded-xl border border-sand-dark bg-white p-3 sm:grid-cols-[1fr_6rem_5rem_8rem_auto] sm:items-end">
              <div className="col-span-2 sm:col-span-1">
                <label htmlFor={`edit-parts-${i}-name`} className="field-label">Part</label>
                <input id={`edit-parts-${i}-name`} className="field-input" value={x.name} aria-invalid={err(`parts.${i}.name`) ? true : undefined} onChange={(e) => setPart(i, 'name', e.target.value)} />
              </div>
              <div>
                <label htmlFor={`edit-parts-${i}-quantity`} className="field-label">Qty</label>
                <input id={`edit-parts-${i}-quantity`} inputMode="decimal" className="field-input tabular-nums" value={x.quantity} aria-invalid={err(`parts.${i}.quantity`) ? true : undefined} onChange={(e) => setPart(i, 'quantity', e.target.value)} />
              </div>
              <div>
                <label htmlFor={`edit-parts-${i}-unit`} className="field-label">Unit</label>
                <input id={`edit-parts-${i}-unit`} className="field-input" maxLength={20} value={x.unit} onChange={(e) => setPart(i, 'unit', e.target.value)} />
              </div>
              <div>
                <label htmlFor={`edit-parts-${i}-unitPrice`} className="field-label">Unit price</label>
                <input id={`edit-parts-${i}-unitPrice`} inputMode="decimal" className="field-input tabular-nums" value={x.unitPrice} aria-invalid={err(`parts.${i}.unitPrice`) ? true : undefined} onChange={(e) => setPart(i, 'unitPrice', e.target.value)} />
              </div>
              <div className="flex items-center justify-between gap-2 sm:flex-col sm:items-end">
                <span className="font-bold tabular-nums">{money(lineAmount({ quantity: n(x.quantity) || 0, unitPrice: n(x.unitPrice) || 0 }))}</span>
                <button type="button" className="btn btn-quiet text-sm" aria-label={`Remove part ${x.name || i + 1}`} onClick={() => edit({ ...d, parts: d.parts.filter((_, j) => j !== i) })}>Remove</button>
              </div>
              {err(`parts.${i}`) ? <p className="field-error col-span-2 sm:col-span-5" role="alert">{issues.filter((m) => m.path.startsWith(`parts.${i}.`)).map((m) => m.message).join(' ')}</p> : null}
            </li>
          ))}
        </ul>
        <div className="mt-2 flex flex-wrap items-center justify-between gap-2">
          <button type="button" className="btn btn-quiet text-sm" onClick={() => edit({ ...d, parts: [...d.parts, { name: '', quantity: '1', unit: '', unitPrice: '0' }] })}>+ Add a part</button>
          <p className="text-lg font-extrabold tabular-nums">Total with tax {money(total)}</p>
        </div>
      </fieldset>

      <fieldset data-testid="labour-fields">
        <legend className="text-lg font-extrabold">Labour</legend>
        <ul className="mt-2 space-y-2">
          {d.doc.labour.map((l, i) => (
            <li key={i} className="grid grid-cols-2 gap-2 rounded-xl border border-sand-dark bg-white p-3 sm:grid-cols-[1fr_6rem_8rem_auto] sm:items-end">
              <div className="col-span-2 sm:col-span-1"><Text id={`edit-labour-${i}-name`} label="Work" value={l.name} onChange={(v) => setDoc({ labour: d.doc.labour.map((x, j) => (j === i ? { ...x, name: v } : x)) })} /></div>
              <Text id={`edit-labour-${i}-hours`} label="Hours" value={l.hours} numeric onChange={(v) => setDoc({ labour: d.doc.labour.map((x, j) => (j === i ? { ...x, hours: v } : x)) })} />
              <Text id={`edit-labour-${i}-rate`} label="Rate per hour" value={l.rate} numeric onChange={(v) => setDoc({ labour: d.doc.labour.map((x, j) => (j === i ? { ...x, rate: v } : x)) })} />
              <button type="button" className="btn btn-quiet text-sm" aria-label={`Remove labour ${l.name || i + 1}`} onClick={() => setDoc({ labour: d.doc.labour.filter((_, j) => j !== i) })}>Remove</button>
              {err(`document.labour.${i}`) ? <p className="field-error col-span-2 sm:col-span-4" role="alert">{issues.filter((m) => m.path.startsWith(`document.labour.${i}.`)).map((m) => m.message).join(' ')}</p> : null}
            </li>
          ))}
        </ul>
        <button type="button" className="btn btn-quiet mt-2 text-sm" onClick={() => setDoc({ labour: [...d.doc.labour, { name: '', hours: '1', rate: '0' }] })}>+ Add labour</button>
      </fieldset>

      <fieldset data-testid="removal-fields">
        <legend className="text-lg font-extrabold">Old parts: removal or trade-in</legend>
        <ul className="mt-2 space-y-2">
          {d.doc.removals.map((r, i) => (
            <li key={i} className="grid grid-cols-2 gap-2 rounded-xl border border-sand-dark bg-white p-3 sm:grid-cols-[1fr_13rem_8rem_auto] sm:items-end">
              <div className="col-span-2 sm:col-span-1"><Text id={`edit-removals-${i}-name`} label="Old part" value={r.name} onChange={(v) => setDoc({ removals: d.doc.removals.map((x, j) => (j === i ? { ...x, name: v } : x)) })} /></div>
              <div>
                <label htmlFor={`edit-removals-${i}-kind`} className="field-label">Counts as</label>
                <select id={`edit-removals-${i}-kind`} className="field-input" value={r.kind} onChange={(e) => setDoc({ removals: d.doc.removals.map((x, j) => (j === i ? { ...x, kind: e.target.value as 'removal' | 'trade-in' } : x)) })}>
                  <option value="removal">Removal (charge)</option>
                  <option value="trade-in">Trade-in (credit)</option>
                </select>
              </div>
              <Text id={`edit-removals-${i}-amount`} label="Amount" value={r.amount} numeric onChange={(v) => setDoc({ removals: d.doc.removals.map((x, j) => (j === i ? { ...x, amount: v } : x)) })} />
              <button type="button" className="btn btn-quiet text-sm" aria-label={`Remove old part ${r.name || i + 1}`} onClick={() => setDoc({ removals: d.doc.removals.filter((_, j) => j !== i) })}>Remove</button>
              {err(`document.removals.${i}`) ? <p className="field-error col-span-2 sm:col-span-4" role="alert">{issues.filter((m) => m.path.startsWith(`document.removals.${i}.`)).map((m) => m.message).join(' ')}</p> : null}
            </li>
          ))}
        </ul>
        <button type="button" className="btn btn-quiet mt-2 text-sm" onClick={() => setDoc({ removals: [...d.doc.removals, { name: '', kind: 'removal', amount: '0' }] })}>+ Add an old part</button>
      </fieldset>

      <fieldset className="grid gap-2 sm:grid-cols-3" data-testid="wiring-price-fields">
        <legend className="mb-1 text-lg font-extrabold">Wiring prices for this quote ({p.currency})</legend>
        <Text id="doc-wiring-cable" label="Cable, per metre and mm²" value={d.doc.wiring.cablePerMm2M} numeric error={err('document.wiringPrices.cablePerMm2M')} onChange={(v) => setDoc({ wiring: { ...d.doc.wiring, cablePerMm2M: v } })} />
        <Text id="doc-wiring-fuse" label="Fuse or breaker with holder" value={d.doc.wiring.fuse} numeric error={err('document.wiringPrices.fuse')} onChange={(v) => setDoc({ wiring: { ...d.doc.wiring, fuse: v } })} />
        <Text id="doc-wiring-busBars" label="Bus bars, a pair" value={d.doc.wiring.busBars} numeric error={err('document.wiringPrices.busBars')} onChange={(v) => setDoc({ wiring: { ...d.doc.wiring, busBars: v } })} />
      </fieldset>

      <fieldset className="grid gap-2 sm:grid-cols-[10rem_1fr]" data-testid="terms-fields">
        <legend className="mb-1 text-lg font-extrabold">Tax and terms</legend>
        <Text id="doc-taxRatePct" label="Tax rate (%)" value={d.doc.taxRatePct} numeric error={err('document.taxRatePct')} onChange={(v) => setDoc({ taxRatePct: v })} />
        <div>
          <label htmlFor="doc-terms" className="field-label">Terms</label>
          <textarea id="doc-terms" className="field-input min-h-[4rem]" maxLength={3000} value={d.doc.terms} placeholder="Payment, warranty, what the price includes…" onChange={(e) => setDoc({ terms: e.target.value })} />
        </div>
        <p className="text-lg font-extrabold tabular-nums sm:col-span-2">Total with tax {money(total)}</p>
      </fieldset>

      <fieldset>
        <legend className="text-lg font-extrabold">Cable runs to check</legend>
        <ul className="mt-2 space-y-3">
          {d.cables.map((c, i) => {
            const result = p.cables[i]?.result;
            return (
              <li key={i} className="space-y-2 rounded-xl border border-sand-dark bg-white p-3">
                <div className="grid gap-2 sm:grid-cols-[1fr_12rem]">
                  <div>
                    <label htmlFor={`edit-cables-${i}-label`} className="field-label">Run</label>
                    <input id={`edit-cables-${i}-label`} className="field-input" value={c.label} onChange={(e) => setCable(i, 'label', e.target.value)} />
                  </div>
                  <div>
                    <label htmlFor={`edit-cables-${i}-kind`} className="field-label">Current from</label>
                    <select id={`edit-cables-${i}-kind`} className="field-input" value={c.kind} onChange={(e) => setCable(i, 'kind', e.target.value)}>
                      <option value="charger">A charger’s amps</option>
                      <option value="inverter">An inverter’s watts</option>
                      <option value="current">A known current</option>
                    </select>
                  </div>
                </div>
                <div className="grid grid-cols-2 gap-2 sm:grid-cols-4">
                  {c.kind === 'inverter' ? (
                    <>
                      <Small id={`edit-cables-${i}-watts`} label="Inverter W" value={c.watts} onChange={(v) => setCable(i, 'watts', v)} />
                      <Small id={`edit-cables-${i}-efficiencyPct`} label="Efficiency %" value={c.efficiencyPct} onChange={(v) => setCable(i, 'efficiencyPct', v)} />
                      <Small id={`edit-cables-${i}-lowestVolts`} label="Lowest bank V" value={c.lowestVolts} onChange={(v) => setCable(i, 'lowestVolts', v)} />
                    </>
                  ) : (
                    <Small id={`edit-cables-${i}-amps`} label="Amps" value={c.amps} onChange={(v) => setCable(i, 'amps', v)} />
                  )}
                  <Small id={`edit-cables-${i}-oneWay`} label={`One way (${lengthUnit(units)})`} value={c.oneWay} onChange={(v) => setCable(i, 'oneWay', v)} />
                </div>
                <div className="grid gap-2 sm:grid-cols-3">
                  <div>
                    <label htmlFor={`edit-cables-${i}-circuit`} className="field-label">Circuit</label>
                    <select id={`edit-cables-${i}-circuit`} className="field-input" value={c.circuit} onChange={(e) => setCable(i, 'circuit', e.target.value)}>
                      <option value="critical">Critical: charging, main feed (3 %)</option>
                      <option value="non-critical">Not critical: lights and the like (10 %)</option>
                    </select>
                  </div>
                  <div>
                    <label htmlFor={`edit-cables-${i}-table`} className="field-label">Ampacity table</label>
                    <select id={`edit-cables-${i}-table`} className="field-input" value={c.table} title={AMPACITY_TABLE_NAMES[c.table]} onChange={(e) => setCable(i, 'table', e.target.value)}>
                      {AMPACITY_TABLES.map((t) => <option key={t} value={t}>{t === 'abyc-105c' ? '105 °C cable, outside engine spaces' : t === 'abyc-105c-engine' ? '105 °C cable, engine space' : 'NEC 310.16, 75 °C'}</option>)}
                    </select>
                  </div>
                  <div>
                    <label htmlFor={`edit-cables-${i}-chosenAwg`} className="field-label">Cable you plan</label>
                    <select id={`edit-cables-${i}-chosenAwg`} className="field-input" value={c.chosenAwg} onChange={(e) => setCable(i, 'chosenAwg', e.target.value)}>
                      <option value="">Use the suggestion</option>
                      {(c.sizes === 'metric' ? METRIC_SIZES : AWG_SIZES).map((a) => <option key={a} value={a}>{c.sizes === 'metric' ? a : `${a} AWG`}</option>)}
                    </select>
                  </div>
                </div>
                <div className="grid gap-2 sm:grid-cols-2">
                  <div>
                    <label htmlFor={`edit-cables-${i}-method`} className="field-label">Voltage drop worked out by</label>
                    <select id={`edit-cables-${i}-method`} className="field-input" value={c.method} onChange={(e) => setCable(i, 'method', e.target.value)}>
                      {DROP_METHODS.map((m) => <option key={m} value={m}>{m === 'abyc-20c' ? 'Circular-mil formula, copper at 20 °C (ABYC-style)' : 'NEC Chapter 9 Table 8, copper at 75 °C'}</option>)}
                    </select>
                  </div>
                  <div>
                    <label htmlFor={`edit-cables-${i}-sizes`} className="field-label">Sizes to suggest from</label>
                    <select id={`edit-cables-${i}-sizes`} className="field-input" value={c.sizes} onChange={(e) => edit({ ...d, cables: d.cables.map((x, j) => (j === i ? { ...x, sizes: e.target.value as SizeSystem, chosenAwg: '' } : x)) })}>
                      <option value="awg">AWG (American wire gauge)</option>
                      <option value="metric">Metric, mm² (IEC 60228)</option>
                    </select>
                  </div>
                </div>
                {err(`cables.${i}`) ? <p className="field-error" role="alert">{issues.filter((m) => m.path.startsWith(`cables.${i}.`)).map((m) => m.message).join(' ')}</p> : null}
                {result && !dirty ? (
                  <p className="text-sm" data-testid="cable-result">
                    {result.suggested ? `Suggested ${result.suggested.label}, drop ${formatNumber(result.suggested.dropPct ?? 0, 2)} % (${DROP_METHOD_SHORT[result.method ?? 'nec-75c']})` : 'No single cable passes'} · fuse {result.fuseA ?? '—'} A
                    {result.chosen ? ` · your ${result.chosen.label ?? result.chosen.awg} ${result.chosen.ok ? 'passes' : 'does not pass'}` : ''} (estimate)
                  </p>
                ) : null}
                <button type="button" className="btn btn-quiet text-sm" aria-label={`Remove cable run ${c.label || i + 1}`} onClick={() => edit({ ...d, cables: d.cables.filter((_, j) => j !== i) })}>Remove run</button>
              </li>
            );
          })}
        </ul>
        <button
          type="button"
          className="btn btn-quiet mt-2 text-sm"
          onClick={() => edit({ ...d, cables: [...d.cables, { label: '', kind: 'current', amps: '', watts: '', efficiencyPct: String(p.after.plan.inverter.efficiencyPct), lowestVolts: '10.5', oneWay: '', circuit: 'critical', table: 'abyc-105c', chosenAwg: '', method: 'abyc-20c', sizes: d.cables[0]?.sizes ?? 'awg', basis: '' }] })}
        >
          + Add a cable run
        </button>
      </fieldset>

      {issues.some((i) => !/^(title|parts|cables|document)/.test(i.path)) ? <p role="alert" className="field-error">{issues.filter((i) => !/^(title|parts|cables|document)/.test(i.path)).map((i) => i.message).join(' ')}</p> : null}
      {save.isError && !(save.error instanceof ApiError && (save.error.status === 400 || save.error.status === 409)) ? <ErrorState error={save.error} title="The draft could not be saved." /> : null}
      <div className="flex flex-wrap items-center gap-2">
        <button type="button" className="btn btn-primary" disabled={save.isPending || !dirty} onClick={submit}>{save.isPending ? 'Saving…' : 'Save draft'}</button>
        <button type="button" className="btn btn-primary" disabled={send.isPending || dirty || nothingToSend} onClick={() => send.mutate()} aria-describedby={nothingToSend ? 'send-needs' : undefined} title={dirty ? 'Save your changes first' : undefined}>
          {send.isPending ? 'Sending…' : 'Send to the crew'}
        </button>
        <AskFirst label="Delete draft" question="Delete this draft?" confirmLabel="Delete" onConfirm={() => remove.mutate()} busy={remove.isPending} />
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">{dirty ? 'Unsaved changes.' : status ?? ''}</p>
      </div>
      {nothingToSend ? <p id="send-needs" className="field-hint">Add at least one part or labour line, and save, before sending: an empty proposal is not sent.</p> : null}
      {send.isError ? <ErrorState error={send.error} title="The proposal could not be sent." /> : null}
      {remove.isError ? <ErrorState error={remove.error} title="The draft could not be deleted." /> : null}
    </section>
  );
}

function Small({ id, label, value, onChange }: { id: string; label: string; value: string; onChange: (v: string) => void }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">{label}</label>
      <input id={id} inputMode="decimal" className="field-input tabular-nums" value={value} onChange={(e) => onChange(e.target.value)} />
    </div>
  );
}

function Text({ id, label, value, onChange, error, numeric = false }: { id: string; label: string; value: string; onChange: (v: string) => void; error?: string; numeric?: boolean }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">{label}</label>
      <input id={id} className={`field-input ${numeric ? 'tabular-nums' : ''}`} inputMode={numeric ? 'decimal' : undefined} value={value} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} onChange={(e) => onChange(e.target.value)} />
      {error ? <p id={`${id}-error`} className="field-error" role="alert">{error}</p> : null}
    </div>
  );
}

export default withQueryClient(ProposalView, { fallback: <LoadingState label="Loading the proposal…" /> });
