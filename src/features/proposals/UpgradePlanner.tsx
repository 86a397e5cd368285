import { useMemo, useState } from 'react';
import { useMutation, useQuery } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { asNumber } from '../../components/ui/form';
import { CHEMISTRIES, type Chemistry, type ResolvedPlan } from '../../engine';
import { CHEMISTRY_LABELS, formatMoney, formatNumber } from '../../lib/format';
import { ApiError, type ApiIssue } from '../../lib/query-client';
import { candidatesSchema, countCombinations, MAX_COMBINATIONS, MOUNTINGS, type CandidatesInput, type Mounting } from '../../domain/proposals/proposals.schema';
import type { SweepOption } from '../../domain/proposals/sweep';
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
}
interface PanelRow {
  watts: string;
  mounting: Mounting;
}

const MOUNT_LABEL: Record<Mounting, string> = { flat: 'Flat on the roof', tilted: 'Tilted 30°, to the equator', portable: 'Portable, sun-aimed' };
const round50 = (x: number) => Math.max(50, Math.round(x / 50) * 50);

/** Starting candidates from the plan: bigger banks of the same chemistry (and LiFePO4 for a lead-acid bank), panels, a DC-DC charger when the trip drives. */
function presets(plan: ResolvedPlan) {
  const c = plan.bank.capacityAh;
  const banks: BankRow[] = [1.5, 2, 3].map((k) => ({ chemistry: plan.bank.chemistry, capacityAh: String(round50(c * k)) }));
  if (plan.bank.chemistry !== 'lifepo4') banks.push(...[0.6, 1, 1.5].map((k) => ({ chemistry: 'lifepo4' as const, capacityAh: String(round50(c * k)) })));
  const panels: PanelRow[] = [
    { watts: '200', mounting: 'flat' },
    { watts: '400', mounting: 'flat' },
    { watts: '200', mounting: 'portable' },
  ];
  return { banks, panels, dcdc: plan.drives.length > 0 ? '30, 50' : '', gens: '', start: '8' };
}

const list = (s: string) =>
  s
    .split(/[,;\s]+/)
    .map((x) => x.trim())
    .filter(Boolean)
    .map((x) => asNumber(x) ?? NaN);

/** The upgrade planner: candidates for a saved forecast, the sweep with its progress, ranked options, and "propose this". */
function UpgradePlanner({ forecastId }: { forecastId: string }) {
  const f = useQuery(forecastQueries.detail(forecastId));
  const prices = useQuery(proposalQueries.priceList());
  if (f.isPending || prices.isPending) return <LoadingState label="Loading the saved forecast…" />;
  if (f.isError) return <ErrorState error={f.error} title="This saved forecast could not be loaded." />;
  if (prices.isError) return <ErrorState error={prices.error} title="Your price list could not be loaded." onRetry={() => void prices.refetch()} />;
  return <Planner forecastId={forecastId} plan={f.data.plan} saved={f.data} pricesSaved={prices.data.saved} currency={prices.data.currency} />;
}

function Planner({ forecastId, plan, saved, pricesSaved, currency }: { forecastId: string; plan: ResolvedPlan; saved: { name: string; forecast: Parameters<typeof VerdictBanner>[0]['forecast']; reserveSocPct: number | null }; pricesSaved: boolean; currency: string }) {
  const initial = useMemo(() => presets(plan), [plan]);
  const [banks, setBanks] = useState<BankRow[]>(initial.banks);
  const [panels, setPanels] = useState<PanelRow[]>(initial.panels);
  const [dcdc, setDcdc] = useState(initial.dcdc);
  const [gens, setGens] = useState(initial.gens);
  const [start, setStart] = useState(initial.start);
  const [issues, setIssues] = useState<ApiIssue[]>([]);
  const [onlyPassing, setOnlyPassing] = useState(false);
  const [showAll, setShowAll] = useState(false);

  const input: CandidatesInput = {
    banks: banks.map((b) => ({ chemistry: b.chemistry, capacityAh: asNumber(b.capacityAh) ?? NaN })),
    panels: panels.map((p) => ({ watts: asNumber(p.watts) ?? NaN, mounting: p.mounting })),
    dcdcAmps: list(dcdc),
    generatorHours: list(gens),
    generatorStartHour: asNumber(start) ?? NaN,
  };
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
          Options are judged against {saved.reserveSocPct !== null ? `the trip’s ${saved.reserveSocPct} % reserve` : 'each bank’s floor'}: the whole trip at or above it, with no cutoff.
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
          <legend className="field-label text-base">Banks instead of the rig’s (chemistry defaults apply)</legend>
          <ul className="space-y-2">
            {banks.map((b, i) => (
              <li key={i} className="grid grid-cols-[minmax(0,1fr)_6.5rem_2.75rem] items-start gap-2 sm:grid-cols-[12rem_8rem_auto] sm:justify-start">
                <label className="sr-only" htmlFor={`cand-banks-${i}-chemistry`}>Bank {i + 1} chemistry</label>
                <select id={`cand-banks-${i}-chemistry`} className="field-input" value={b.chemistry} onChange={(e) => setBanks(banks.map((x, j) => (j === i ? { ...x, chemistry: e.target.value as Chemistry } : x)))}>
                  {CHEMISTRIES.map((c) => <option key={c} value={c}>{CHEMISTRY_LABELS[c]}</option>)}
                </select>
                <div className="relative">
                  <label className="sr-only" htmlFor={`cand-banks-${i}-capacityAh`}>Bank {i + 1} capacity (Ah)</label>
                  <input id={`cand-banks-${i}-capacityAh`} inputMode="decimal" className="field-input pr-10 tabular-nums" value={b.capacityAh} aria-invalid={issueAt(`banks.${i}.capacityAh`) ? true : undefined} aria-describedby={issueAt(`banks.${i}.capacityAh`) ? `cand-banks-${i}-capacityAh-error` : undefined} onChange={(e) => setBanks(banks.map((x, j) => (j === i ? { ...x, capacityAh: e.target.value } : x)))} />
                  <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">Ah</span>
                </div>
                <button type="button" className="btn btn-quiet px-0 text-sm" aria-label={`Remove bank ${i + 1}`} title="Remove" onClick={() => setBanks(banks.filter((_, j) => j !== i))}><span aria-hidden="true">✕</span></button>
                {issueAt(`banks.${i}.capacityAh`) ? <p id={`cand-banks-${i}-capacityAh-error`} className="field-error col-span-3" role="alert">Capacity {issueAt(`banks.${i}.capacityAh`)}</p> : null}
              </li>
            ))}
          </ul>
          <button type="button" className="btn btn-quiet mt-2 text-sm" disabled={banks.length >= 12} onClick={() => setBanks([...banks, { chemistry: 'lifepo4', capacityAh: '' }])}>+ Add a bank</button>
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
            <p id="cand-dcdcAmps-hint" className="field-hint mt-1">{issues.find((i) => i.path.startsWith('dcdcAmps'))?.message ?? (plan.drives.length ? 'Replaces the alternator charging on drive days.' : 'This trip has no drives, so a DC-DC charger adds nothing.')}</p>
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
          onlyPassing={onlyPassing}
          setOnlyPassing={setOnlyPassing}
          showAll={showAll}
          setShowAll={setShowAll}
          onPropose={(o) => propose.mutate(o)}
          proposing={propose.isPending ? propose.variables?.key ?? null : null}
        />
      ) : null}
      {propose.isError ? <ErrorState error={propose.error} title="The proposal could not be drafted." /> : null}
    </div>
  );
}

function Results({ r, onlyPassing, setOnlyPassing, showAll, setShowAll, onPropose, proposing }: { r: SweepResponse; onlyPassing: boolean; setOnlyPassing: (v: boolean) => void; showAll: boolean; setShowAll: (v: boolean) => void; onPropose: (o: SweepOption) => void; proposing: string | null }) {
  const cheapest = r.options.find((o) => o.key === r.cheapestPassing) ?? null;
  const shown = r.options.filter((o) => !onlyPassing || o.passes);
  const visible = showAll ? shown : shown.slice(0, 12);
  const money = (x: number) => formatMoney(x, r.currency);
  return (
    <section aria-labelledby="results-heading" className="space-y-4" data-testid="sweep-results">
      <h2 id="results-heading" className="text-xl">
        {r.combinations} options, ranked by cost <span className="text-base font-semibold text-slate-text">(estimates · {r.ms} ms on the server)</span>
      </h2>
      {cheapest ? (
        <div className="rounded-[14px] border-l-[6px] border-moss bg-[#eef5ef] p-4" data-testid="cheapest-passing">
          <p className="text-sm font-bold uppercase tracking-wide text-moss-deep">Cheapest that makes it</p>
          <p className="mt-1 text-lg font-extrabold">{cheapest.label} — {money(cheapest.total)}</p>
          <p className="text-sm">{outcomeLine(cheapest)}</p>
          <button type="button" className="btn btn-primary mt-3" onClick={() => onPropose(cheapest)} disabled={proposing !== null}>
            {proposing === cheapest.key ? 'Drafting…' : 'Propose this'}
          </button>
        </div>
      ) : (
        <p className="caution" role="status">None of these options keeps the whole trip at or above the reserve without a cutoff. Try bigger banks, more panels or generator hours.</p>
      )}
      <label className="flex items-center gap-2 font-semibold">
        <input type="checkbox" className="h-5 w-5 accent-ember" checked={onlyPassing} onChange={(e) => setOnlyPassing(e.target.checked)} /> Only options that make it
      </label>
      <ol className="space-y-2" aria-label="Options by cost">
        {visible.map((o) => (
          <li key={o.key} className={`card flex flex-col gap-2 p-3 sm:flex-row sm:items-center ${o.key === r.cheapestPassing ? 'ring-2 ring-moss' : ''}`} data-option={o.key}>
            <div className="min-w-0 flex-1">
              <p className="font-bold">{o.label}</p>
              <p className="text-sm text-slate-text">{outcomeLine(o)}</p>
            </div>
            <span className={`self-start rounded-full px-3 py-1 text-sm font-bold sm:self-center ${o.passes ? 'bg-moss-deep text-white' : 'bg-sand-dark text-dusk'}`}>{o.passes ? 'Makes it' : o.firstCutoffAt ? 'Runs out' : 'Below reserve'}</span>
            <span className="text-lg font-extrabold tabular-nums sm:w-32 sm:text-right">{money(o.total)}</span>
            <button type="button" className="btn btn-quiet text-sm" onClick={() => onPropose(o)} disabled={proposing !== null} aria-label={`Propose ${o.label}`}>
              {proposing === o.key ? 'Drafting…' : 'Propose'}
            </button>
          </li>
        ))}
      </ol>
      {shown.length > visible.length ? (
        <button type="button" className="btn btn-quiet" onClick={() => setShowAll(true)}>Show all {shown.length} options</button>
      ) : null}
    </section>
  );
}

function outcomeLine(o: SweepOption): string {
  const low = `lowest ${Math.round(o.minSocPct)} % on ${formatRowTime(o.minSocAt)}`;
  const cut = o.firstCutoffAt ? `runs out ${formatRowTime(o.firstCutoffAt)}, ${formatNumber(Math.round(o.unmetWh))} Wh unmet` : 'no cutoff';
  const harvest = Math.abs(o.extraHarvestWh) >= 1 ? ` · ${o.extraHarvestWh > 0 ? '+' : '−'}${formatNumber(Math.round(Math.abs(o.extraHarvestWh)))} Wh charging` : '';
  const run = o.running > 0 ? ` · generator ${o.generatorHours} h` : '';
  return `${low} · ${cut}${harvest}${run}`;
}

export default withQueryClient(UpgradePlanner, { fallback: <LoadingState label="Loading the saved forecast…" /> });
