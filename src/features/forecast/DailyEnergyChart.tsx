import { useMemo } from 'react';
import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast } from '../../engine';
import { COLORS, daysSummaryText } from './chart-data';
import { formatDay, formatWh } from '../../lib/format';
import { useWidth } from './useWidth';

const SERIES = [
  { key: 'load', name: 'Loads', color: COLORS.loads },
  { key: 'solar', name: 'Solar', color: COLORS.solar },
  { key: 'charge', name: 'Other charging', color: COLORS.charging },
] as const;

// A no-break space keeps "1.2 kWh" on one line (recharts wraps tick text at spaces).
function kwhTick(v: number): string {
  return v >= 1000 ? `${(v / 1000).toLocaleString('en-US', { maximumFractionDigits: 1 })}\u00a0kWh` : `${v}\u00a0Wh`;
}

/** A bar per day: loads against solar and other charging (alternator, shore, generator). */
export default function DailyEnergyChart({ forecast, height = 240 }: { forecast: Forecast; height?: number }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const data = useMemo(
    () => forecast.days.map((d) => ({ date: d.date, label: formatDay(d.date).split(' ').slice(0, 2).join(' '), load: d.loadWh, solar: d.solarWh, charge: d.chargeWh })),
    [forecast],
  );
  const summary = daysSummaryText(forecast);
  return (
    <figure className="m-0" data-testid="daily-chart">
      <div ref={ref} className="w-full">
        {width > 0 ? (
          <BarChart width={width} height={height} data={data} margin={{ top: 8, right: 8, bottom: 4, left: 0 }} title="Energy per day" desc={summary} barCategoryGap="18%">
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            <XAxis dataKey="label" tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} interval={data.length > 10 && width < 520 ? 'preserveStartEnd' : 0} />
            <YAxis tickFormatter={kwhTick} width={62} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <Tooltip
              formatter={(v, name) => [formatWh(Number(v)), String(name)]}
              labelFormatter={(_, p) => (p?.[0]?.payload ? formatDay((p[0].payload as { date: string }).date) : '')}
              contentStyle={{ borderRadius: 12, borderColor: COLORS.grid, fontSize: 13 }}
              cursor={{ fill: 'rgba(47,62,85,0.06)' }}
              isAnimationActive={false}
            />
            {SERIES.map((s) => (
              <Bar key={s.key} dataKey={s.key} name={s.name} fill={s.color} radius={[3, 3, 0, 0]} isAnimationActive={false} className={`bar-${s.key}`} />
            ))}
          </BarChart>
        ) : (
          <div className="animate-pulse rounded-lg bg-sand/70" style={{ height }} aria-hidden="true" />
        )}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-text sm:text-sm" aria-label="Chart key">
        {SERIES.map((s) => (
          <li key={s.key} className="flex items-center gap-1.5">
            <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: s.color }} />
            {s.name}
          </li>
        ))}
      </ul>
      <figcaption className="mt-1 text-sm text-slate-text">{summary} First and last days are partial.</figcaption>
    </figure>
  );
}
