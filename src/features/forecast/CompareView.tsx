import type { Forecast, ResolvedPlan } from '../../engine';
import { PRINT_CHARTS } from './ForecastView';
import SocChart from './SocChart';
import { formatRowTime, formatWh, pct } from '../../lib/format';
import { verdict } from '../../domain/forecasts/verdict';
import type { ForecastWithWeather } from '../../domain/weather/band';
import { BandChart } from './WeatherPanel';

/** One side of a comparison. */
export interface CompareSide {
  name: string;
  forecast: Forecast;
  plan: ResolvedPlan;
}

export interface CompareViewProps {
  a: CompareSide;
  b: CompareSide;
  reserveSocPct?: number | null;
}

const rows = (reserve: number | null): { label: string; value: (s: CompareSide) => string }[] => [
  { label: 'Verdict', value: (s) => verdict(s.forecast, s.plan, reserve).headline },
  { label: 'Lowest state of charge', value: (s) => `${pct(s.forecast.summary.minSocPct)} · ${formatRowTime(s.forecast.summary.minSocAt)}` },
  { label: 'First cutoff', value: (s) => (s.forecast.summary.firstCutoffAt ? formatRowTime(s.forecast.summary.firstCutoffAt) : 'Never') },
  { label: 'Unmet energy', value: (s) => formatWh(s.forecast.summary.unmetWh) },
  { label: 'Solar harvested', value: (s) => formatWh(s.forecast.summary.solarWh) },
  { label: 'Solar curtailed', value: (s) => formatWh(s.forecast.summary.curtailedWh) },
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
export default function CompareView({ a, b, reserveSocPct = null }: CompareViewProps) {
  return (
    <div className={`space-y-5 ${PRINT_CHARTS}`} data-testid="compare-view">
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
