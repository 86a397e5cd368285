import { useMemo, useState } from 'react';
import { useMutation, useQuery } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { asNumber } from '../../components/ui/form';
import { CHEMISTRIES, CHEMISTRY_DEFAULTS, type Chemistry, type ResolvedPlan } from '../../engine';
import { CHEMISTRY_LABELS, formatMoney, formatNumber } from '../../lib/format';
import { ApiError, type ApiIssue } from '../../lib/query-client';
import { candidatesSchema, countCombinations, MAX_COMBINATIONS, MOUNTINGS, type CandidatesInput, type Mounting } from '../../domain/proposals/proposals.schema';
import type { SweepOption } from '../../domain/proposals/sweep';
import { handPlanFromOption, handPlanOf } from '../../domain/proposals/sweep-edit';
import { DEFAULT_GENERATOR_MARGIN_PTS, DEFAULT_GENERATOR_STOP_PCT, type GeneratorRule } from '../../domain/advice/generator-rule';
import AfterPlanEditor, { editorStateOf, type EditorState } from './AfterPlanEditor';
import { CAUTIONS, coldCaution } from '../../domain/advice/cautions';
import type { Units } from '../../lib/units';
import { forecastQueries } from '../forecast/forecast.queries';
import { formatRowTime } from '../../lib/format';
import { useDelayed } from '../forecast/useWidth';
import VerdictBanner from '../forecast/VerdictBanner';
import PriceListForm from './PriceListForm';
import { createProposal, runSweep, type SweepResponse } from './proposals.api';
import { proposalQueries } from './proposals.queries';

interface BankRow {
  chemistry: Chemistry;
  capacityAh: string;
  /** Empty: the chemistry's own floor. */
  floorSocPct: string;
}
interface PanelRow {
  watts: string;
  mounting: Mounting;
}

const MOUNT_LABEL: Record<Mounting, string> = { flat: 'Flat on the roof', tilted: 'Tilted 30°, to the equator', portable: 'Portable, sun-aimed' };
const round50 = (x: number) => Math.max(50, Math.round(x / 50) * 50);

/** Common DC-DC charger sizes, A (trade notes: 10 / 20 / 30 / 40 / 60 A common). */
const DCDC_SIZES = [10, 20, 30, 40, 60];

/**
 * Starting candidates from the plan: bigger banks of the same chemistry (and LiFePO4 for a
 * lead-acid bank), panels, and — when the trip drives — the next two DC-DC sizes above the rig's own
 * (never the size it has).
 */
function presets(plan: ResolvedPlan) {
  const c = plan.bank.capacityAh;
  const banks: BankRow[] = [1.5, 2, 3].map((k) => ({ chemistry: plan.bank.chemistry, capacityAh: String(round50(c * k)), floorSocPct: '' }));
  if (plan.bank.chemistry !== 'lifepo4') banks.push(...[0.6, 1, 1.5].map((k) => ({ chemistry: 'lifepo4' as const, capacityAh: String(round50(c * k)), floorSocPct: '' })));
  const panels: PanelRow[] = [
    { watts: '200', mounting: 'flat' },
    { watts: '400', mounting: 'flat' },
    { watts: '200', mounting: 'portable' },
  ];
  const now = plan.chargers.filter((x) => x.kind === 'alternator').reduce((t, x) => t + x.amps, 0);
  const dcdc = plan.drives.length > 0 ? (now > 0 ? DCDC_SIZES.filter((a) => a > now).slice(0, 2) : [20, 40]).join(', ') : '';
  return { banks, panels, dcdc, gens: '', start: '8' };
}

/** "starts below 60 % (the 50 % floor + 10 points), stops at 90 %" with the cold's share when there is one. */
function ruleText(r: GeneratorRule, lineName: string): string {
  const cold = r.strandedPts > 0 ? ` + ${formatNumber(r.strandedPts, 1)} points the cold strands` : '';
  return `start below ${formatNumber(r.startSocPct, 1)} % (the ${formatNumber(r.linePct, 1)} % ${lineName} + ${formatNumber(r.marginPts, 1)} points${cold}) and stop at ${formatNumber(r.stopSocPct, 1)} %`;
}

const list = (s: string) =>
  s
    .split(/[,;\s]+/)
    .map((x) => x.trim())
    .filter(Boolean)
    .map((x) => asNumber(x) ?? NaN);

/** The upgrade planner: candidates for a saved forecast, the sweep with its progress, ranked options, and "propose this". */
/** The rig's stated payload and battery room (migration 0014), when the crew gave them. */
interface RigLimits {
  payloadKg: number | null;
  batterySpaceL: number | null;
}

function UpgradePlanner({ forecastId, limits = { payloadKg: null, batterySpaceL: null }, units = 'metric' }: { forecastId: string; limits?: RigLimits; units?: Units }) {
  const f = useQuery(forecastQueries.detail(forecastId));
  const prices = useQuery(proposalQueries.priceList());
  if (f.isPending || prices.isPending) return <LoadingState label="Loading the saved forecast…" />;
  if (f.isError) return <ErrorState error={f.error} title="This saved forecast could not be loaded." />;
  if (prices.isError) return <ErrorState error={prices.error} title="Your price list could not be loaded." onRetry={() => void prices.refetch()} />;
  return <Planner forecastId={forecastId} plan={f.data.plan} saved={f.data} pricesSaved={prices.data.saved} currency={prices.data.currency} limits={limits} units={units} />;
}

function Planner({ forecastId, plan, saved, pricesSaved, currency, limits, units }: { units: Units; forecastId: string; plan: ResolvedPlan; saved: { name: string; forecast: Parameters<typeof VerdictBanner>[0]['forecast']; reserveSocPct: number | null }; pricesSaved: boolean; currency: string; limits: RigLimits }) {
  const initial = useMemo(() => presets(plan), [plan]);
  const [banks, setBanks] = useState<BankRow[]>(initial.banks);
  const [panels, setPanels] = useState<PanelRow[]>(initial.panels);
  const [dcdc, setDcdc] = useState(initial.dcdc);
  const [gens, setGens] = useState(initial.gens);
  const [start, setStart] = useState(initial.start);
  const [margin, setMargin] = useState(String(DEFAULT_GENERATOR_MARGIN_PTS));
  const [stop, setStop] = useState(String(DEFAULT_GENERATOR_STOP_PCT));
  const [payload, setPayload] = useState(limits.payloadKg === null ? '' : String(limits.payloadKg));
  const [space, setSpace] = useState(limits.batterySpaceL === null ? '' : String(limits.batterySpaceL));
  const [issues, setIssues] = useState<ApiIssue[]>([]);
  const [onlyPassing, setOnlyPassing] = useState(false);
  const [showAll, setShowAll] = useState(false);
  const asIs = useMemo(() => editorStateOf({ ...handPlanOf(plan), ...limits }), [plan, limits]);
  const [hand, setHand] = useState<EditorState>(asIs);
  const optional = (x: string) => (x.trim() === '' ? null : (asNumber(x) ?? NaN));

  const input: CandidatesInput = {
    banks: banks.map((b) => ({ chemistry: b.chemistry, capacityAh: asNumber(b.capacityAh) ?? NaN, ...(b.floorSocPct.trim() ? { floorSocPct: asNumber(b.floorSocPct) ?? NaN } : {}) })),
    panels: panels.map((p) => ({ watts: asNumber(p.watts) ?? NaN, mounting: p.mounting })),
    dcdcAmps: list(dcdc),
    generatorHours: list(gens),
    generatorStartHour: asNumber(start) ?? NaN,
    generatorMarginPts: asNumber(margin) ?? NaN,
    generatorStopPct: asNumber(stop) ?? NaN,
    payloadKg: optional(payload),
    batterySpaceL: optional(space),
  };
  // The line generator options start from, for the hint: the trip's reserve, else the bank's floor.
  const line = saved.reserveSocPct !== null && saved.reserveSocPct > plan.bank.floorSocPct ? saved.reserveSocPct : plan.bank.floorSocPct;
  const lineName = saved.reserveSocPct !== null && saved.reserveSocPct > plan.bank.floorSocPct ? 'reserve' : 'floor';
  const combos = countCombinations({ banks: input.banks!, panels: input.panels!, dcdcAmps: input.dcdcAmps!, generatorHours: input.generatorHours! });

  const sweep = useMutation({ mutationFn: (c: CandidatesInput) => runSweep(forecastId, c) });
  const propose = useMutation({
    mutationFn: (o: SweepOption) => createProposal(forecastId, o.changes),
    onSuccess: (p) => window.location.assign(`/proposals/${encodeURIComponent(p.id)}`),
  });
  const slow = useDelayed(sweep.isPending, 300);

  const issueAt = (path: string) => issues.find((i) => i.path === path)?.message;
  const run = () => {
    const parsed = candidatesSchema.safeParse(input);
    if (!parsed.success) {
      setIssues(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(candidates)', message: i.message })));
      return;
    }
    setIssues([]);
    setShowAll(false);
    sweep.mutate(input, {
      onError: (e) => {
        if (e instanceof ApiError) setIssues(e.issues.map((i) => ({ path: i.path.replace(/^candidates\.?/, '') || '(candidates)', message: i.message })));
      },
    });
  };

  return (
    <div className="space-y-6">
      <section aria-labelledby="saved-heading" className="space-y-3">
        <h2 id="saved-heading" className="text-xl">The saved forecast: {saved.name}</h2>
        <VerdictBanner forecast={saved.forecast} plan={plan} reserveSocPct={saved.reserveSocPct} as="h3" />
        <p className="text-sm text-slate-text">
          Now: {formatNumber(plan.bank.capacityAh)} Ah {CHEMISTRY_LABELS[plan.bank.chemistry]} at {plan.bank.nominalVolts} V ·{' '}
          {plan.arrays.length ? `${formatNumber(plan.arrays.reduce((t, a) => t + a.ratedWatts, 0))} W of panels` : 'no panels'} ·{' '}
          {plan.chargers.length ? plan.chargers.map((c) => `${c.amps} A ${c.kind === 'alternator' ? 'DC-DC/alternator' : c.kind}`).join(', ') : 'no chargers'}.{' '}
          Options are judged on usable charge against {saved.reserveSocPct !== null && saved.reserveSocPct > plan.bank.floorSocPct ? `the trip’s ${saved.reserveSocPct} % reserve (or a new bank’s floor, if higher)` : 'each bank’s own floor (its chemistry’s, unless you set one)'}: the whole trip at or above it, with no cutoff.
        </p>
      </section>

      <details className="card p-4 sm:p-5" open={!pricesSaved}>
        <summary className="cursor-pointer text-lg font-extrabold">{pricesSaved ? `Your price list (${currency})` : 'First, your price list'}</summary>
        <div className="mt-4">
          <PriceListForm />
        </div>
      </details>

      <form
        aria-label="Upgrade options to try"
        className="card space-y-5 p-4 sm:p-5"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          run();
        }}
      >
        <h2 className="text-xl">What to try</h2>
        <fieldset>
          <legend className="field-label text-base">Banks instead of the rig’s: capacity and floor (empty: the chemistry’s own floor)</legend>
          <ul className="space-y-2">
            {banks.map((b, i) => (
              <li key={i} className="grid grid-cols-[minmax(0,1fr)_minmax(0,1fr)_2.75rem] items-start gap-2 sm:grid-cols-[12rem_8rem_7rem_auto] sm:justify-start">
                <label className="sr-only" htmlFor={`cand-banks-${i}-chemistry`}>Bank {i + 1} chemistry</label>
                <select id={`cand-banks-${i}-chemistry`} className="field-input col-span-3 sm:col-span-1" value={b.chemistry} onChange={(e) => setBanks(banks.map((x, j) => (j === i ? { ...x, chemistry: e.target.value as Chemistry } : x)))}>
                  {CHEMISTRIES.map((c) => <option key={c} value={c}>{CHEMISTRY_LABELS[c]}</option>)}
                </select>
                <div className="relative">
                  <label className="sr-only" htmlFor={`cand-banks-${i}-capacityAh`}>Bank {i + 1} capacity (Ah)</label>
                  <input id={`cand-banks-${i}-capacityAh`} inputMode="decimal" className="field-input pr-10 tabular-nums" value={b.capacityAh} aria-invalid={issueAt(`banks.${i}.capacityAh`) ? true : undefined} aria-describedby={issueAt(`banks.${i}.capacityAh`) ? `cand-banks-${i}-capacityAh-error` : undefined} onChange={(e) => setBanks(banks.map((x, j) => (j === i ? { ...x, capacityAh: e.target.value } : x)))} />
                  <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">Ah</span>
                </div>
                <div className="relative">
                  <label className="sr-only" htmlFor={`cand-banks-${i}-floorSocPct`}>Bank {i + 1} floor (%), empty for the chemistry’s own</label>
                  <input id={`cand-banks-${i}-floorSocPct`} inputMode="decimal" className="field-input pr-8 tabular-nums" placeholder={String(CHEMISTRY_DEFAULTS[b.chemistry].floorSocPct)} title="Floor: the lowest charge this bank may be run to" value={b.floorSocPct} aria-invalid={issueAt(`banks.${i}.floorSocPct`) ? true : undefined} onChange={(e) => setBanks(banks.map((x, j) => (j === i ? { ...x, floorSocPct: e.target.value } : x)))} />
                  <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">%</span>
                </div>
                <button type="button" className="btn btn-quiet px-0 text-sm" aria-label={`Remove bank ${i + 1}`} title="Remove" onClick={() => setBanks(banks.filter((_, j) => j !== i))}><span aria-hidden="true">✕</span></button>
                {issueAt(`banks.${i}.capacityAh`) ? <p id={`cand-banks-${i}-capacityAh-error`} className="field-error col-span-full" role="alert">Capacity {issueAt(`banks.${i}.capacityAh`)}</p> : null}
                {issueAt(`banks.${i}.floorSocPct`) ? <p className="field-error col-span-full" role="alert">Floor {issueAt(`banks.${i}.floorSocPct`)}</p> : null}
              </li>
            ))}
          </ul>
          <button type="button" className="btn btn-quiet mt-2 text-sm" disabled={banks.length >= 12} onClick={() => setBanks([...banks, { chemistry: 'lifepo4', capacityAh: '', floorSocPct: '' }])}>+ Add a bank</button>
        </fieldset>

        <fieldset>
          <legend className="field-label text-base">Panels to add, as a new array with its own MPPT controller</legend>
          <ul className="space-y-2">
            {panels.map((p, i) => (
              <li key={i} className="grid grid-cols-[6.5rem_minmax(0,1fr)_2.75rem] items-start gap-2 sm:grid-cols-[8rem_18rem_auto] sm:justify-start">
                <div className="relative">
                  <label className="sr-only" htmlFor={`cand-panels-${i}-watts`}>Panel option {i + 1} watts</label>
                  <input id={`cand-panels-${i}-watts`} inputMode="decimal" className="field-input pr-9 tabular-nums" value={p.watts} aria-invalid={issueAt(`panels.${i}.watts`) ? true : undefined} onChange={(e) => setPanels(panels.map((x, j) => (j === i ? { ...x, watts: e.target.value } : x)))} />
                  <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">W</span>
                </div>
                <label className="sr-only" htmlFor={`cand-panels-${i}-mounting`}>Panel option {i + 1} mounting</label>
                <select id={`cand-panels-${i}-mounting`} className="field-input" value={p.mounting} onChange={(e) => setPanels(panels.map((x, j) => (j === i ? { ...x, mounting: e.target.value as Mounting } : x)))}>
                  {MOUNTINGS.map((m) => <option key={m} value={m}>{MOUNT_LABEL[m]}</option>)}
                </select>
                <button type="button" className="btn btn-quiet px-0 text-sm" aria-label={`Remove panel option ${i + 1}`} title="Remove" onClick={() => setPanels(panels.filter((_, j) => j !== i))}><span aria-hidden="true">✕</span></button>
                {issueAt(`panels.${i}.watts`) ? <p className="field-error col-span-3" role="alert">Watts {issueAt(`panels.${i}.watts`)}</p> : null}
              </li>
            ))}
          </ul>
          <button type="button" className="btn btn-quiet mt-2 text-sm" disabled={panels.length >= 10} onClick={() => setPanels([...panels, { watts: '', mounting: 'flat' }])}>+ Add panels</button>
        </fieldset>

        <div className="grid gap-4 sm:grid-cols-3">
          <div>
            <label htmlFor="cand-dcdcAmps" className="field-label">DC-DC charger sizes (A)</label>
            <input id="cand-dcdcAmps" className="field-input" placeholder="e.g. 30, 50" value={dcdc} onChange={(e) => setDcdc(e.target.value)} aria-describedby="cand-dcdcAmps-hint" />
            <p id="cand-dcdcAmps-hint" className="field-hint mt-1">{issues.find((i) => i.path.startsWith('dcdcAmps'))?.message ?? (plan.drives.length ? (plan.chargers.some((c) => c.kind === 'alternator') ? 'Larger than the rig’s own; it replaces it (the old one comes out).' : 'Charges from the alternator on drive days.') : 'This trip has no drives, so a DC-DC charger adds nothing.')}</p>
          </div>
          <div>
            <label htmlFor="cand-generatorHours" className="field-label">Generator hours a day</label>
            <input id="cand-generatorHours" className="field-input" placeholder="e.g. 2, 4" value={gens} onChange={(e) => setGens(e.target.value)} aria-describedby="cand-generatorHours-hint" />
            <p id="cand-generatorHours-hint" className={issues.find((i) => i.path.startsWith('generatorHours')) ? 'field-error' : 'field-hint mt-1'}>
              {issues.find((i) => i.path.startsWith('generatorHours'))?.message ?? (plan.chargers.some((c) => c.kind === 'generator') ? 'Allowed window at every camp without hookup.' : 'Adds a generator with a 30 A converter/charger.')}
            </p>
          </div>
          <div>
            <label htmlFor="cand-generatorStartHour" className="field-label">Generator from (hour)</label>
            <input id="cand-generatorStartHour" inputMode="numeric" className="field-input tabular-nums" value={start} onChange={(e) => setStart(e.target.value)} />
          </div>
        </div>
        <div className="grid gap-4 sm:grid-cols-3">
          <div>
            <label htmlFor="cand-generatorMarginPts" className="field-label">Generator starts above the line by</label>
            <div className="relative">
              <input id="cand-generatorMarginPts" inputMode="decimal" className="field-input pr-12 tabular-nums" value={margin} onChange={(e) => setMargin(e.target.value)} aria-describedby="cand-generator-rule" aria-invalid={issueAt('generatorMarginPts') ? true : undefined} />
              <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">pts</span>
            </div>
            {issueAt('generatorMarginPts') ? <p className="field-error" role="alert">The margin {issueAt('generatorMarginPts')}</p> : null}
          </div>
          <div>
            <label htmlFor="cand-generatorStopPct" className="field-label">Generator stops at</label>
            <div className="relative">
              <input id="cand-generatorStopPct" inputMode="decimal" className="field-input pr-8 tabular-nums" value={stop} onChange={(e) => setStop(e.target.value)} aria-describedby="cand-generator-rule" aria-invalid={issueAt('generatorStopPct') ? true : undefined} />
              <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">%</span>
            </div>
            {issueAt('generatorStopPct') ? <p className="field-error" role="alert">The stop level {issueAt('generatorStopPct')}</p> : null}
          </div>
          <p id="cand-generator-rule" className="field-hint self-end">
            With the rig’s bank a generator starts below {formatNumber(line + (asNumber(margin) ?? 0), 1)} % — the {formatNumber(line, 1)} % {lineName} + {margin || 0} points, more when the cold strands charge — and stops at {stop || '?'} %. Each bank option starts from its own floor.
          </p>
        </div>
        <fieldset className="grid gap-4 sm:grid-cols-3">
          <legend className="field-label text-base">The rig’s limits for the weight and space check (optional{limits.payloadKg !== null || limits.batterySpaceL !== null ? '; as the crew stated them on the rig' : ''})</legend>
          <div>
            <label htmlFor="cand-payloadKg" className="field-label">Payload it may still carry</label>
            <div className="relative">
              <input id="cand-payloadKg" inputMode="decimal" className="field-input pr-10 tabular-nums" value={payload} onChange={(e) => setPayload(e.target.value)} aria-invalid={issueAt('payloadKg') ? true : undefined} />
              <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">kg</span>
            </div>
            {issueAt('payloadKg') ? <p className="field-error" role="alert">The payload {issueAt('payloadKg')}</p> : null}
          </div>
          <div>
            <label htmlFor="cand-batterySpaceL" className="field-label">Room for batteries</label>
            <div className="relative">
              <input id="cand-batterySpaceL" inputMode="decimal" className="field-input pr-8 tabular-nums" value={space} onChange={(e) => setSpace(e.target.value)} aria-invalid={issueAt('batterySpaceL') ? true : undefined} />
              <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">L</span>
            </div>
            {issueAt('batterySpaceL') ? <p className="field-error" role="alert">The battery space {issueAt('batterySpaceL')}</p> : null}
          </div>
        </fieldset>

        {issues.filter((i) => i.path === '(candidates)' || i.path === '').map((i) => <p key={i.message} role="alert" className="caution font-semibold text-alert">{i.message}</p>)}
        {issues.filter((i) => i.path === 'prices').map((i) => <p key={i.message} role="alert" className="caution font-semibold text-alert">Save your price list first: {i.message}</p>)}

        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" className="btn btn-primary" disabled={sweep.isPending || !pricesSaved}>
            {sweep.isPending ? 'Sweeping…' : 'Run the sweep'}
          </button>
          <p className="text-sm text-slate-text" aria-live="polite">
            {Number.isFinite(combos) && combos > 0 ? `${combos} combination${combos === 1 ? '' : 's'}${combos > MAX_COMBINATIONS ? ` — at most ${MAX_COMBINATIONS}` : ''}` : 'Add an option to try.'}
            {!pricesSaved ? ' · Save your price list to run it.' : ''}
          </p>
        </div>
        {sweep.isPending && slow ? (
          <div role="status" aria-live="polite" className="space-y-2" data-testid="sweep-progress">
            <p className="font-semibold">Running {combos} combinations through the engine, hour by hour…</p>
            <div className="h-2.5 overflow-hidden rounded-full bg-sand-dark" role="progressbar" aria-label="Sweep in progress" aria-busy="true">
              <div className="sweep-bar h-full w-1/3 rounded-full bg-ember" />
            </div>
            <style>{'.sweep-bar { animation: sweep-bar 1.1s ease-in-out infinite; } @keyframes sweep-bar { 0% { transform: translateX(-100%); } 100% { transform: translateX(300%); } } @media (prefers-reduced-motion: reduce) { .sweep-bar { animation: none; width: 100%; opacity: .5; } }'}</style>
          </div>
        ) : null}
        {sweep.isError && !(sweep.error instanceof ApiError && sweep.error.status === 400) ? <ErrorState error={sweep.error} title="The sweep could not run." /> : null}
      </form>

      {sweep.data ? (
        <Results
          r={sweep.data}
          units={units}
          onEdit={(o) => {
            setHand(editorStateOf(handPlanFromOption(plan, o.changes, { payloadKg: input.payloadKg ?? null, batterySpaceL: input.batterySpaceL ?? null })));
            document.getElementById('hand-heading')?.scrollIntoView({ behavior: 'smooth', block: 'start' });
          }}
          onlyPassing={onlyPassing}
          setOnlyPassing={setOnlyPassing}
          showAll={showAll}
          setShowAll={setShowAll}
          onPropose={(o) => propose.mutate(o)}
          proposing={propose.isPending ? propose.variables?.key ?? null : null}
        />
      ) : null}
      {propose.isError ? <ErrorState error={propose.error} title="The proposal could not be drafted." /> : null}
      <AfterPlanEditor forecastId={forecastId} state={hand} setState={setHand} fallback={asIs} />
    </div>
  );
}

const RANKING_TITLE = { margin: 'ranked by cost, with the margin each buys', cost: 'ranked by cost', closeness: 'closest first: least unmet energy, then fewest hours short' } as const;

function Results({ r, units, onlyPassing, setOnlyPassing, showAll, setShowAll, onPropose, onEdit, proposing }: { r: SweepResponse; units: Units; onlyPassing: boolean; setOnlyPassing: (v: boolean) => void; showAll: boolean; setShowAll: (v: boolean) => void; onPropose: (o: SweepOption) => void; onEdit: (o: SweepOption) => void; proposing: string | null }) {
  const cheapest = r.options.find((o) => o.key === r.cheapestPassing) ?? null;
  const more = r.options.find((o) => o.key === r.cheapestMoreMargin) ?? null;
  const shown = r.options.filter((o) => !onlyPassing || (o.passes && !o.changesNothing && o.noBetterThan === null));
  const visible = showAll ? shown : shown.slice(0, 12);
  const money = (x: number) => formatMoney(x, r.currency);
  const labelOf = (key: string | null) => r.options.find((o) => o.key === key)?.label ?? '';
  const lineName = r.base.reservePct > 0 ? 'line' : 'floor';
  return (
    <section aria-labelledby="results-heading" className="space-y-4" data-testid="sweep-results">
      <h2 id="results-heading" className="text-xl">
        {r.combinations} options, {RANKING_TITLE[r.ranking]} <span className="text-base font-semibold text-slate-text">(estimates · {r.ms} ms on the server)</span>
      </h2>
      {r.ranking === 'margin' ? (
        <div className="rounded-[14px] border-l-[6px] border-moss bg-[#eef5ef] p-4" data-testid="already-makes-it">
          <p className="text-sm font-bold uppercase tracking-wide text-moss-deep">Already makes the trip</p>
          <p className="mt-1 text-lg font-extrabold">
            As it is, the rig keeps the whole trip above the {formatNumber(r.base.reservePct, 1)} % {lineName} — lowest usable charge {formatNumber(r.base.minUsablePct, 1)} %, a margin of {formatNumber(r.base.marginPts, 1)} points.
          </p>
          <p className="text-sm">No upgrade is needed for this trip. What follows is what buys more margin{more ? `; the cheapest that adds a point or more: ${more.label} — ${money(more.total)} (+${formatNumber(more.marginPts - r.base.marginPts, 1)} points)` : ''}.</p>
          {more ? (
            <button type="button" className="btn btn-quiet mt-3" onClick={() => onPropose(more)} disabled={proposing !== null}>
              {proposing === more.key ? 'Drafting…' : 'Propose this for more margin'}
            </button>
          ) : null}
        </div>
      ) : cheapest ? (
        <div className="rounded-[14px] border-l-[6px] border-moss bg-[#eef5ef] p-4" data-testid="cheapest-passing">
          <p className="text-sm font-bold uppercase tracking-wide text-moss-deep">Cheapest that makes it</p>
          <p className="mt-1 text-lg font-extrabold">{cheapest.label} — {money(cheapest.total)}</p>
          <p className="text-sm">{outcomeLine(cheapest)}</p>
          <button type="button" className="btn btn-primary mt-3" onClick={() => onPropose(cheapest)} disabled={proposing !== null}>
            {proposing === cheapest.key ? 'Drafting…' : 'Propose this'}
          </button>
        </div>
      ) : (
        <p className="caution" role="status" data-testid="none-passes">
          None of these options keeps the whole trip above the line without a cutoff. They are listed closest first: the least energy left unmet, then the fewest hours short. Try bigger banks, more panels, a larger generator margin — or edit the after-plan by hand below.
        </p>
      )}
      <p className="text-sm" data-testid="generator-rule">
        <span className="font-bold">Generator options</span> {ruleText(r.generatorRule, r.base.reservePct > 0 ? 'line' : 'floor')} with the rig’s bank; a bank option starts from its own line. Change the margin and stop level above.
      </p>
      <ul className="caution space-y-1 text-sm" data-testid="sweep-cautions" aria-label="Cautions">
        <li>{CAUTIONS.wiring}</li>
        {r.options.some((o) => o.generator) ? <li>{CAUTIONS.generator}</li> : null}
        {r.options.some((o) => o.changes.bank?.chemistry === 'lifepo4') ? <li>{coldCaution(units)}</li> : null}
        <li>{CAUTIONS.estimate} Weights and sizes are common-practice figures per kWh: check the batteries’ own data sheets.</li>
      </ul>
      {r.skipped.length ? (
        <div className="text-sm" data-testid="sweep-skipped">
          <p className="font-bold">Not tried:</p>
          <ul className="list-disc pl-5">
            {r.skipped.map((x) => <li key={x.what}>{x.what} — {x.why}.</li>)}
          </ul>
        </div>
      ) : null}
      <label className="flex items-center gap-2 font-semibold">
        <input type="checkbox" className="h-5 w-5 accent-ember" checked={onlyPassing} onChange={(e) => setOnlyPassing(e.target.checked)} /> Only options that make it and change something
      </label>
      <ol className="space-y-2" aria-label={`Options, ${RANKING_TITLE[r.ranking]}`}>
        {visible.map((o) => (
          <li key={o.key} className={`card flex flex-col gap-2 p-3 sm:flex-row sm:items-center ${o.key === r.cheapestPassing || o.key === r.cheapestMoreMargin ? 'ring-2 ring-moss' : ''} ${o.changesNothing || o.noBetterThan ? 'border-dashed' : ''}`} data-option={o.key}>
            <div className="min-w-0 flex-1">
              <p className="font-bold">{o.label}</p>
              <p className="text-sm text-slate-text">{outcomeLine(o)}</p>
              {r.ranking === 'margin' && !o.changesNothing ? <p className="text-sm text-slate-text">Margin {formatNumber(o.marginPts, 1)} points ({o.marginPts - r.base.marginPts >= 0 ? '+' : '−'}{formatNumber(Math.abs(o.marginPts - r.base.marginPts), 1)} against now)</p> : null}
              {o.generator ? <p className="text-sm text-slate-text">Generator: {ruleText(o.generator, 'line')}.</p> : null}
              {o.weight ? (
                <p className={`text-sm ${o.weight.flagged ? 'font-bold text-alert' : 'text-slate-text'}`} data-testid="bank-weight">
                  Bank about {formatNumber(o.weight.kg, 1)} kg, {formatNumber(o.weight.litres)} L (common practice per kWh) — {o.weight.addedKg >= 0 ? `${formatNumber(o.weight.addedKg, 1)} kg more` : `${formatNumber(-o.weight.addedKg, 1)} kg less`} than now.{o.weight.note ? ` ${o.weight.note}` : ''}
                </p>
              ) : null}
              {o.noBetterThan ? <p className="text-sm text-slate-text">No better than “{labelOf(o.noBetterThan)}”, which costs no more.</p> : null}
            </div>
            <span className={`self-start rounded-full px-3 py-1 text-sm font-bold sm:self-center ${chipClass(o)}`}>{chipText(o)}</span>
            <span className="text-lg font-extrabold tabular-nums sm:w-32 sm:text-right">{money(o.total)}</span>
            <div className="flex gap-1 sm:flex-col">
              <button type="button" className="btn btn-quiet text-sm" onClick={() => onPropose(o)} disabled={proposing !== null || o.changesNothing} aria-label={`Propose ${o.label}`}>
                {proposing === o.key ? 'Drafting…' : 'Propose'}
              </button>
              <button type="button" className="btn btn-quiet text-sm" onClick={() => onEdit(o)} aria-label={`Edit ${o.label} by hand`}>
                Edit by hand
              </button>
            </div>
          </li>
        ))}
      </ol>
      {shown.length > visible.length ? (
        <button type="button" className="btn btn-quiet" onClick={() => setShowAll(true)}>Show all {shown.length} options</button>
      ) : null}
    </section>
  );
}

function chipText(o: SweepOption): string {
  if (o.changesNothing) return 'Changes nothing';
  if (o.noBetterThan) return 'Adds nothing';
  return o.passes ? 'Makes it' : o.firstCutoffAt ? 'Runs out' : 'Below the line';
}

function chipClass(o: SweepOption): string {
  if (o.changesNothing || o.noBetterThan) return 'border border-slate-text/40 bg-white text-slate-text';
  return o.passes ? 'bg-moss-deep text-white' : 'bg-sand-dark text-dusk';
}

function outcomeLine(o: SweepOption): string {
  const low = `lowest usable ${formatNumber(o.minUsablePct, 1)} % on ${formatRowTime(o.minSocAt)} (line ${formatNumber(o.reservePct, 1)} %)`;
  const cut = o.firstCutoffAt ? `runs out ${formatRowTime(o.firstCutoffAt)}, ${formatNumber(Math.round(o.unmetWh))} Wh unmet over ${o.hoursShort} h` : 'no cutoff';
  const harvest = Math.abs(o.extraHarvestWh) >= 1 ? ` · ${o.extraHarvestWh > 0 ? '+' : '−'}${formatNumber(Math.round(Math.abs(o.extraHarvestWh)))} Wh charging` : '';
  const run = o.generatorHours > 0 ? ` · generator ${o.generatorHours} h` : '';
  return `${low} · ${cut}${harvest}${run}`;
}

export default withQueryClient(UpgradePlanner, { fallback: <LoadingState label="Loading the saved forecast…" /> });
