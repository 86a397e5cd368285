import type { Forecast } from '../../engine';
import { formatLitres, formatRowTime, formatWh, pct } from '../../lib/format';
import { unusedSolarSentence } from './hour-marks';


function hoursShort(f: Forecast): number {
  return f.hourly.reduce((n, r) => n + (r.unmetWatts > 0 ? 1 : 0), 0);
}

/** The whole-trip figures as small cards: lowest SOC, first cutoff, unmet energy, solar, generator, end. */
export default function SummaryCards({ forecast }: { forecast: Forecast }) {
  const s = forecast.summary;
  const short = hoursShort(forecast);
  const cards: { label: string; value: string; sub: string; tone?: 'alert' | 'good' }[] = [
    { label: 'Lowest state of charge', value: pct(s.minSocPct), sub: formatRowTime(s.minSocAt) },
    s.firstCutoffAt
      ? { label: 'First cutoff', value: formatRowTime(s.firstCutoffAt), sub: `The bank disconnects at its ${pct(s.floorSocPct)} floor or cutoff volts`, tone: 'alert' }
      : { label: 'First cutoff', value: 'Never', sub: `Stays above the ${pct(s.floorSocPct)} floor`, tone: 'good' },
    { label: 'Unmet energy', value: formatWh(s.unmetWh), sub: short > 0 ? `Over ${short} ${short === 1 ? 'hour' : 'hours'} without power` : 'Every load is served', tone: s.unmetWh > 0 ? 'alert' : undefined },
    { label: 'Solar harvested', value: formatWh(s.solarWh), sub: unusedSolarSentence(forecast) },
    {
      label: 'Generator',
      value: `${s.generatorHours} h`,
      sub: s.generatorHours > 0 ? `About ${formatLitres(s.generatorLitres)} of fuel` : 'Not run',
    },
    { label: 'At the end', value: pct(s.endSocPct), sub: s.chargeWh > 0 ? `After ${formatWh(s.chargeWh)} from other charging` : 'State of charge when the trip ends' },
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 lg:grid-cols-3" data-testid="summary-cards">
      {cards.map((c) => (
        <div key={c.label} className="card flex flex-col p-3 sm:p-4">
          <dt className="order-1 text-xs font-bold uppercase tracking-wide text-slate-text">{c.label}</dt>
          <dd className={`order-2 text-lg font-extrabold tabular-nums sm:text-xl ${c.tone === 'alert' ? 'text-alert' : c.tone === 'good' ? 'text-moss-deep' : 'text-dusk'}`}>{c.value}</dd>
          <dd className="order-3 text-xs text-slate-text sm:text-sm">{c.sub}</dd>
        </div>
      ))}
    </dl>
  );
}
