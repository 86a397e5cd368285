import type { Forecast, ResolvedPlan } from '../../engine';
import { PRINT_CHARTS } from './ForecastView';
import SocChart from './SocChart';
import { formatRowTime, formatWh, pct } from '../../lib/format';
import { verdict } from '../../domain/forecasts/verdict';
import type { ForecastWithWeather } from '../../domain/weather/band';
import { BandChart } from './WeatherPanel';
import { unusedSolarShort } from './hour-marks';
import { snapshotDiff, type SnapshotSection } from '../../domain/forecasts/snapshot-diff';
import { distinctNames, snapshotClock, snapshotLabel } from '../../domain/forecasts/snapshot-name';
import type { Units } from '../../lib/units';

/** One side of a comparison. */
export interface CompareSide {
  name: string;
  forecast: Forecast;
  plan: ResolvedPlan;
  /** When a saved forecast was made (ISO instant): with it, the page names it in the first stop's local time and lists what changed. */
  createdAt?: string;
  /** The engine revision that made a saved forecast. */
  engineRevision?: number;
}

export interface CompareViewProps {
  a: CompareSide;
  b: CompareSide;
  reserveSocPct?: number | null;
  /** The reader's units setting (temperatures in the list of changes). */
  units?: Units;
}

/** Changes shown at once per section; the rest fold away (a month of re-fetched weather is many lines). */
const SHOWN = 6;
const KIND_WORDS = { added: 'Added', removed: 'Removed', changed: 'Changed' } as const;

function ChangeList({ changes, testId }: { changes: SnapshotSection['changes']; testId?: string }) {
  return (
    <ul className="mt-1 space-y-1 text-sm" data-testid={testId}>
      {changes.map((c, i) => (
        <li key={i} className="break-words">
          <span className={`mr-1.5 inline-block rounded px-1.5 text-xs font-bold ${c.kind === 'added' ? 'bg-moss/15 text-moss-deep' : c.kind === 'removed' ? 'bg-ember/15 text-alert' : 'bg-sand-dark/60 text-dusk'}`}>
            {KIND_WORDS[c.kind]}
          </span>
          <strong>{c.what}</strong>
          {c.detail ? `: ${c.detail}` : ''}
        </li>
      ))}
    </ul>
  );
}

/** What changed from the earlier saved forecast to the later one, above the overlay. */
function Changes({ a, b, units }: { a: CompareSide; b: CompareSide; units: Units }) {
  if (!a.createdAt || !b.createdAt) return null;
  const [older, newer] = Date.parse(a.createdAt) <= Date.parse(b.createdAt) ? [a, b] : [b, a];
  const inputs = (s: CompareSide) => ({ plan: s.plan, engineRevision: s.engineRevision ?? s.forecast.engineRevision, weatherSources: (s.forecast as ForecastWithWeather).weatherSources });
  const sections: SnapshotSection[] = snapshotDiff(inputs(older), inputs(newer), units);
  return (
    <section aria-labelledby="compare-changes" className="card p-3 sm:p-5" data-testid="compare-changes">
      <h2 id="compare-changes" className="mb-1 text-xl">What changed</h2>
      <p className="mb-2 text-sm text-slate-text" data-testid="compare-changes-from">
        {(() => {
          const o = snapshotClock(older.createdAt!, older.plan);
          const n = snapshotClock(newer.createdAt!, newer.plan);
          return o.where === n.where ? (
            <>
              From <strong>{older.name}</strong>, made {o.time}, to <strong>{newer.name}</strong>, made {n.time} ({n.where}).
            </>
          ) : (
            <>
              From <strong>{older.name}</strong>, made {o.time} ({o.where}), to <strong>{newer.name}</strong>, made {n.time} ({n.where}).
            </>
          );
        })()}
      </p>
      {sections.length === 0 ? (
        <p data-testid="compare-no-changes">Nothing in the rig, the loads, the trip or its weather changed between the two: the same inputs gave both.</p>
      ) : (
        <div className="grid gap-x-6 gap-y-3 md:grid-cols-2">
          {sections.map((s) => (
            <div key={s.title} className="min-w-0">
              <h3 className="text-base font-bold">{s.title}</h3>
              <ChangeList changes={s.changes.slice(0, SHOWN)} testId={`changes-${s.title.toLowerCase()}`} />
              {s.changes.length > SHOWN ? (
                <details className="mt-1">
                  <summary className="cursor-pointer text-sm font-bold">{s.changes.length - SHOWN} more</summary>
                  <ChangeList changes={s.changes.slice(SHOWN)} />
                </details>
              ) : null}
            </div>
          ))}
        </div>
      )}
    </section>
  );
}

/** A side named for the page: a saved forecast's old UTC default name becomes the first stop's local time. */
function named(s: CompareSide): CompareSide {
  return s.createdAt ? { ...s, name: snapshotLabel(s.name, s.createdAt, s.plan) } : s;
}

/** Both sides with names a reader can tell apart in the key, the headings and the table. */
function distinct(a: CompareSide, b: CompareSide): [CompareSide, CompareSide] {
  const [na, nb] = distinctNames(a.name, b.name);
  return [{ ...a, name: na }, { ...b, name: nb }];
}

const rows = (reserve: number | null): { label: string; value: (s: CompareSide) => string }[] => [
  { label: 'Verdict', value: (s) => verdict(s.forecast, s.plan, reserve).headline },
  { label: 'Lowest state of charge', value: (s) => `${pct(s.forecast.summary.minSocPct)} · ${formatRowTime(s.forecast.summary.minSocAt)}` },
  { label: 'First cutoff', value: (s) => (s.forecast.summary.firstCutoffAt ? formatRowTime(s.forecast.summary.firstCutoffAt) : 'Never') },
  { label: 'Unmet energy', value: (s) => formatWh(s.forecast.summary.unmetWh) },
  { label: 'Solar harvested', value: (s) => formatWh(s.forecast.summary.solarWh) },
  { label: 'Solar left unused', value: (s) => unusedSolarShort(s.forecast) },
  { label: 'Generator', value: (s) => `${s.forecast.summary.generatorHours} h · ${s.forecast.summary.generatorLitres} L` },
  { label: 'At the end', value: (s) => pct(s.forecast.summary.endSocPct) },
  { label: 'How sure is this?', value: (s) => (s.forecast as ForecastWithWeather).band?.sentence ?? 'No band saved' },
];

/** Each side's band ("how sure is this?"), when either has one. */
function Bands({ a, b }: { a: CompareSide; b: CompareSide }) {
  const sides = [a, b].filter((s) => (s.forecast as ForecastWithWeather).band);
  if (sides.length === 0) return null;
  return (
    <section aria-labelledby="compare-bands" className="card p-3 sm:p-5" data-testid="compare-bands">
      <h2 id="compare-bands" className="mb-2 text-xl">How sure is each?</h2>
      <div className="grid gap-4 lg:grid-cols-2">
        {sides.map((s) => {
          const band = (s.forecast as ForecastWithWeather).band!;
          return (
            <div key={s.name}>
              <h3 className="text-lg">{s.name}</h3>
              <p className="mb-1 text-sm">{band.sentence}</p>
              <BandChart band={band} forecast={s.forecast} floorPct={s.forecast.summary.floorSocPct ?? s.plan.bank.floorSocPct} />
            </div>
          );
        })}
      </div>
    </section>
  );
}

/** Two forecasts: SOC lines overlaid (the second ember dashed) and their summaries side by side. */
export default function CompareView({ a: sideA, b: sideB, reserveSocPct = null, units = 'metric' }: CompareViewProps) {
  const [a, b] = distinct(named(sideA), named(sideB));
  return (
    <div className={`space-y-5 ${PRINT_CHARTS}`} data-testid="compare-view">
      <Changes a={a} b={b} units={units} />
      <section aria-labelledby="compare-soc" className="card p-3 sm:p-5">
        <h2 id="compare-soc" className="mb-1 text-xl">State of charge: {a.name} and {b.name}</h2>
        <SocChart forecast={a.forecast} plan={a.plan} name={a.name} compare={b} reserveSocPct={reserveSocPct} />
      </section>
      <section aria-labelledby="compare-summary" className="card overflow-x-auto p-3 sm:p-5">
        <h2 id="compare-summary" className="mb-2 text-xl">Side by side <span className="text-base font-semibold text-slate-text">(estimates)</span></h2>
        <table className="w-full border-collapse text-sm tabular-nums sm:text-base" data-testid="compare-table">
          <thead>
            <tr className="text-left">
              <td className="py-1.5 pr-2" />
              <th scope="col" className="py-1.5 pr-2">
                <span className="mr-1.5 inline-block h-0.5 w-5 bg-dusk align-middle" aria-hidden="true" />
                {a.name}
              </th>
              <th scope="col" className="py-1.5">
                <span className="mr-1.5 inline-block w-5 border-t-2 border-dashed border-ember align-middle" aria-hidden="true" />
                {b.name}
              </th>
            </tr>
          </thead>
          <tbody>
            {rows(reserveSocPct).map((r) => (
              <tr key={r.label} className="border-t border-sand-dark align-top">
                <th scope="row" className="py-1.5 pr-2 text-left font-bold">{r.label}</th>
                <td className="py-1.5 pr-2">{r.value(a)}</td>
                <td className="py-1.5">{r.value(b)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <Bands a={a} b={b} />
    </div>
  );
}
