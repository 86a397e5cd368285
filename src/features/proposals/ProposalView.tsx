import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { asNumber } from '../../components/ui/form';
import { formatDate, formatMoney } from '../../lib/format';
import { ApiError, isConflict, type ApiIssue } from '../../lib/query-client';
import { fromDisplayLength, lengthUnit, toDisplayLength, type Units } from '../../lib/units';
import { AMPACITY_TABLES, AMPACITY_TABLE_NAMES, AWG_SIZES, type AmpacityTable } from '../../domain/proposals/cable';
import { type ProposalDto, proposalPatchSchema, type CableRowInput } from '../../domain/proposals/proposals.schema';
import { lineAmount, partsTotal } from '../../domain/proposals/proposals';
import CompareView from '../forecast/CompareView';
import { CableList, Cautions, PartsTable } from './ProposalTables';
import { decideProposal, deleteProposal, patchProposal, sendProposal } from './proposals.api';
import { proposalKeys, proposalQueries } from './proposals.queries';
import { STATUS_LOOK } from './status';


const day = (iso: string | null) => (iso ? formatDate(iso.slice(0, 10)) : '');

/** One proposal: before/after forecasts, parts, cables, cautions; the installer edits and sends a draft, the crew's owner answers. */
function ProposalView({ id, units }: { id: string; units: Units }) {
  const q = useQuery(proposalQueries.detail(id));
  if (q.isPending) return <LoadingState label="Loading the proposal…" />;
  if (q.isError) return <ErrorState error={q.error} title="This proposal could not be loaded." onRetry={() => void q.refetch()} />;
  return <Loaded p={q.data} units={units} />;
}

function Loaded({ p, units }: { p: ProposalDto; units: Units }) {
  const s = STATUS_LOOK[p.status];
  return (
    <article className="space-y-6" data-testid="proposal" data-status={p.status}>
      <header className="space-y-2">
        <p className="hidden text-sm font-bold uppercase tracking-wide text-ember-deep print:block">Sunreckon · Upgrade proposal</p>
        <div className="flex flex-wrap items-start justify-between gap-3">
          <h1 className="text-2xl sm:text-3xl">{p.title}</h1>
          <span className={`rounded-full px-3 py-1 text-sm font-bold ${s.cls}`} data-testid="proposal-status">{s.label}</span>
        </div>
        <p className="text-slate-text">
          For the rig <strong className="text-dusk">{p.rigName}</strong> of {p.crewName}
          {p.tripName ? <> · trip “{p.tripName}”</> : null} · from <strong className="text-dusk" data-testid="installer-name">{p.installerName}</strong>
          {p.sentAt ? ` · sent ${day(p.sentAt)}` : ` · drafted ${day(p.createdAt)}`}
        </p>
        <div className="no-print flex flex-wrap gap-2">
          <button type="button" className="btn btn-quiet" onClick={() => window.print()}>Print</button>
          {p.mine && p.forecastId && p.tripId ? <a className="btn btn-quiet" href={`/trips/${encodeURIComponent(p.tripId)}/forecasts/${encodeURIComponent(p.forecastId)}`}>Open the saved forecast</a> : null}
        </div>
      </header>

      {p.decision ? (
        <section className={`rounded-[14px] border-l-[6px] p-4 ${p.status === 'accepted' ? 'border-moss bg-[#eef5ef]' : 'border-ember bg-[#fbebe2]'}`} data-testid="decision">
          <p className="font-extrabold">{p.status === 'accepted' ? 'Accepted' : 'Declined'}{p.decision.by ? ` by ${p.decision.by}` : ''} on {day(p.decision.at)}</p>
          {p.decision.comment ? <p className="mt-1 whitespace-pre-line">“{p.decision.comment}”</p> : null}
        </section>
      ) : null}
      {p.canDecide ? <DecisionForm p={p} /> : null}
      {p.status === 'sent' && !p.canDecide && !p.mine ? <p className="caution no-print">The crew’s owner accepts or declines this proposal.</p> : null}
      {p.status === 'sent' && p.mine ? <p className="caution no-print">Sent to the crew’s owners by e-mail; their answer shows here.</p> : null}

      <section aria-labelledby="what-heading" className="card p-4 sm:p-5">
        <h2 id="what-heading" className="text-xl">What changes</h2>
        <p className="mt-1 text-lg font-bold">{p.label}</p>
        {p.notes ? <p className="mt-2 whitespace-pre-line" data-testid="notes">{p.notes}</p> : null}
      </section>

      <CompareView a={{ name: 'Before', forecast: p.before.forecast, plan: p.before.plan }} b={{ name: 'After', forecast: p.after.forecast, plan: p.after.plan }} reserveSocPct={p.reserveSocPct} />

      {p.canEdit ? <DraftEditor p={p} units={units} /> : null}

      <section aria-labelledby="parts-heading" className={`card p-4 sm:p-5 print:block print:break-inside-avoid ${p.canEdit ? 'hidden' : ''}`}>
        <h2 id="parts-heading" className="mb-2 text-xl">Parts and cost</h2>
        <PartsTable p={p} />
      </section>
      <section aria-labelledby="cables-heading" className="card p-4 sm:p-5">
        <h2 id="cables-heading" className="mb-2 text-xl">Cables and fuses <span className="text-base font-semibold text-slate-text">(estimates{p.canEdit ? ', as last saved' : ''})</span></h2>
        <CableList cables={p.cables} units={units} />
      </section>
      <Cautions items={p.cautions} />
      <p className="hidden text-sm text-slate-text print:block">Prepared with Sunreckon by {p.installerName}. Figures are estimates from the forecast model; local codes and a qualified electrician decide.</p>
    </article>
  );
}

function DecisionForm({ p }: { p: ProposalDto }) {
  const qc = useQueryClient();
  const [comment, setComment] = useState('');
  const decide = useMutation({
    mutationFn: (decision: 'accepted' | 'declined') => decideProposal(p.id, { decision, comment, version: p.version }),
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
        <label htmlFor="decision-comment" className="field-label">Comment for {p.installerName} (optional)</label>
        <textarea id="decision-comment" className="field-input min-h-[5rem]" maxLength={2000} value={comment} onChange={(e) => setComment(e.target.value)} />
      </div>
      {decide.isError ? <p role="alert" className="field-error">{isConflict(decide.error) ? 'This proposal changed or was already answered; it is shown as it is now.' : decide.error.message}</p> : null}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn btn-primary" disabled={decide.isPending} onClick={() => decide.mutate('accepted')}>{decide.isPending && decide.variables === 'accepted' ? 'Accepting…' : 'Accept the proposal'}</button>
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
    })),
  };
}

const n = (s: string) => asNumber(s) ?? NaN;

function toCableInput(c: CableDraft, units: Units): CableRowInput {
  const source = c.kind === 'inverter' ? { kind: 'inverter' as const, watts: n(c.watts), efficiencyPct: n(c.efficiencyPct), lowestVolts: n(c.lowestVolts) } : { kind: c.kind, amps: n(c.amps) };
  const len = n(c.oneWay);
  return { label: c.label, source, oneWayM: Number.isFinite(len) ? fromDisplayLength(len, units) : NaN, circuit: c.circuit, table: c.table, chosenAwg: c.chosenAwg || null };
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
  const total = partsTotal(d.parts.map((x) => ({ quantity: n(x.quantity) || 0, unitPrice: n(x.unitPrice) || 0 })));
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
        {err('title') ? <p className="field-error" role="alert">Title {err('title')}</p> : null}
      </div>
      <div>
        <label htmlFor="edit-notes" className="field-label">Notes for the crew</label>
        <textarea id="edit-notes" className="field-input min-h-[6rem]" maxLength={5000} value={d.notes} placeholder="Where the parts go, what stays, when you could fit them…" onChange={(e) => edit({ ...d, notes: e.target.value })} />
      </div>

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
              {err(`parts.${i}`) ? <p className="field-error col-span-2 sm:col-span-5" role="alert">{issues.filter((m) => m.path.startsWith(`parts.${i}.`)).map((m) => `${m.path.split('.').pop()}: ${m.message}`).join('; ')}</p> : null}
            </li>
          ))}
        </ul>
        <div className="mt-2 flex flex-wrap items-center justify-between gap-2">
          <button type="button" className="btn btn-quiet text-sm" onClick={() => edit({ ...d, parts: [...d.parts, { name: '', quantity: '1', unit: '', unitPrice: '0' }] })}>+ Add a part</button>
          <p className="text-lg font-extrabold tabular-nums">Total {money(total)}</p>
        </div>
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
                      {AWG_SIZES.map((a) => <option key={a} value={a}>{a} AWG</option>)}
                    </select>
                  </div>
                </div>
                {err(`cables.${i}`) ? <p className="field-error" role="alert">{issues.filter((m) => m.path.startsWith(`cables.${i}.`)).map((m) => `${m.path.split('.').slice(2).join(' ')}: ${m.message}`).join('; ')}</p> : null}
                {result && !dirty ? (
                  <p className="text-sm" data-testid="cable-result">
                    {result.suggested ? `Suggested ${result.suggested.awg} AWG` : 'No single cable up to 4/0 AWG passes'} · fuse {result.fuseA ?? '—'} A
                    {result.chosen ? ` · your ${result.chosen.awg} AWG ${result.chosen.ok ? 'passes' : 'does not pass'}` : ''} (estimate)
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
          onClick={() => edit({ ...d, cables: [...d.cables, { label: '', kind: 'current', amps: '', watts: '', efficiencyPct: String(p.after.plan.inverter.efficiencyPct), lowestVolts: '10.5', oneWay: '', circuit: 'critical', table: 'abyc-105c', chosenAwg: '' }] })}
        >
          + Add a cable run
        </button>
      </fieldset>

      {issues.length && !issues.some((i) => /^(title|parts|cables)/.test(i.path)) ? <p role="alert" className="field-error">{issues.map((i) => `${i.path}: ${i.message}`).join('; ')}</p> : null}
      {save.isError && !(save.error instanceof ApiError && (save.error.status === 400 || save.error.status === 409)) ? <ErrorState error={save.error} title="The draft could not be saved." /> : null}
      <div className="flex flex-wrap items-center gap-2">
        <button type="button" className="btn btn-primary" disabled={save.isPending || !dirty} onClick={submit}>{save.isPending ? 'Saving…' : 'Save draft'}</button>
        <button type="button" className="btn btn-primary" disabled={send.isPending || dirty} onClick={() => send.mutate()} title={dirty ? 'Save your changes first' : undefined}>
          {send.isPending ? 'Sending…' : 'Send to the crew'}
        </button>
        <button type="button" className="btn btn-quiet" disabled={remove.isPending} onClick={() => { if (confirm('Delete this draft?')) remove.mutate(); }}>Delete draft</button>
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">{dirty ? 'Unsaved changes.' : status ?? ''}</p>
      </div>
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

export default withQueryClient(ProposalView, { fallback: <LoadingState label="Loading the proposal…" /> });
