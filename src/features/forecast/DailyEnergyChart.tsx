import { useId, useMemo } from 'react';
import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast } from '../../engine';
import { COLORS, daysSummaryText } from './chart-data';
import { dayEnergy, unmetDays } from './day-energy';
import { formatDay, formatWh } from '../../lib/format';
import { useWidth } from './useWidth';

/** Unmet load: ember stripes on a pale ember ground, so it reads as missing energy even in grey print. */
const UNMET_STRIPE = COLORS.cutoff;
const UNMET_GROUND = '#F7D9C8';

// A no-break space keeps "1.2 kWh" on one line (recharts wraps tick text at spaces).
function kwhTick(v: number): string {
  return v >= 1000 ? `${(v / 1000).toLocaleString('en-US', { maximumFractionDigits: 1 })}\u00a0kWh` : `${v}\u00a0Wh`;
}

/** The stripes of unmet load, drawn in a key swatch or referenced by the chart's bars. */
function StripePattern({ id }: { id: string }) {
  return (
    <pattern id={id} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
      <rect width="6" height="6" fill={UNMET_GROUND} />
      <rect width="3" height="6" fill={UNMET_STRIPE} />
    </pattern>
  );
}

/**
 * A pair of bars per day: what the loads asked for (served, with the part the bank could not serve
 * striped on top) beside what charged it (solar and other charging: alternator, shore, generator).
 */
export default function DailyEnergyChart({ forecast, height = 240 }: { forecast: Forecast; height?: number }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const patternId = `unmet-${useId().replace(/[^a-zA-Z0-9_-]/g, '')}`;
  const data = useMemo(
    () =>
      dayEnergy(forecast).map((d) => ({
        date: d.date,
        label: formatDay(d.date).split(' ').slice(0, 2).join(' '),
        served: d.servedWh,
        unmet: d.unmetWh,
        solar: d.solarWh,
        charge: d.chargeWh,
      })),
    [forecast],
  );
  const bad = unmetDays(forecast);
  const hasUnmet = bad.length > 0;
  const summary = daysSummaryText(forecast);
  const unmetWords = hasUnmet
    ? ` Loads not served because the bank was cut off: ${bad.map((d) => `${formatDay(d.date)} ${formatWh(d.unmetWh)} of ${formatWh(d.demandWh)} asked`).join('; ')}.`
    : '';
  const key = [
    { key: 'served', name: 'Loads served', swatch: <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.loads }} /> },
    ...(hasUnmet
      ? [
          {
            key: 'unmet',
            name: 'Loads not served (bank cut off)',
            swatch: (
              <svg width="12" height="12" aria-hidden="true" className="rounded-sm">
                <defs>
                  <StripePattern id={`${patternId}-key`} />
                </defs>
                <rect width="12" height="12" fill={`url(#${patternId}-key)`} />
              </svg>
            ),
          },
        ]
      : []),
    { key: 'solar', name: 'Solar', swatch: <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.solar }} /> },
    { key: 'charge', name: 'Other charging', swatch: <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.charging }} /> },
  ];
  return (
    <figure className="m-0" data-testid="daily-chart">
      <svg width="0" height="0" className="absolute" aria-hidden="true" focusable="false">
        <defs>
          <StripePattern id={patternId} />
        </defs>
      </svg>
      <div ref={ref} className="w-full">
        {width > 0 ? (
          <BarChart width={width} height={height} data={data} margin={{ top: 8, right: 8, bottom: 4, left: 0 }} title="Energy per day" desc={`${summary}${unmetWords}`} barCategoryGap="18%">
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            <XAxis dataKey="label" tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} interval={data.length > 10 && width < 520 ? 'preserveStartEnd' : 0} />
            <YAxis tickFormatter={kwhTick} width={62} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <Tooltip
              formatter={(v, name) => [formatWh(Number(v)), String(name)]}
              labelFormatter={(_, p) => {
                const d = p?.[0]?.payload as { date: string; served: number; unmet: number } | undefined;
                return d ? `${formatDay(d.date)} · loads asked ${formatWh(d.served + d.unmet)}` : '';
              }}
              contentStyle={{ borderRadius: 12, borderColor: COLORS.grid, fontSize: 13 }}
              cursor={{ fill: 'rgba(47,62,85,0.06)' }}
              isAnimationActive={false}
            />
            <Bar dataKey="served" name="Loads served" stackId="demand" fill={COLORS.loads} isAnimationActive={false} className="bar-served" />
            {hasUnmet ? (
              <Bar dataKey="unmet" name="Loads not served (bank cut off)" stackId="demand" fill={`url(#${patternId})`} stroke={UNMET_STRIPE} strokeWidth={1} isAnimationActive={false} className="bar-unmet" />
            ) : null}
            <Bar dataKey="solar" name="Solar" stackId="supply" fill={COLORS.solar} isAnimationActive={false} className="bar-solar" />
            <Bar dataKey="charge" name="Other charging" stackId="supply" fill={COLORS.charging} isAnimationActive={false} className="bar-charge" />
          </BarChart>
        ) : (
          <div className="animate-pulse rounded-lg bg-sand/70" style={{ height }} aria-hidden="true" />
        )}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-text sm:text-sm" aria-label="Chart key">
        {key.map((s) => (
          <li key={s.key} className="flex items-center gap-1.5">
            {s.swatch}
            {s.name}
          </li>
        ))}
      </ul>
      <p className="mt-1 text-xs text-slate-text sm:text-sm">Left bar of each day: what the loads asked for. Right bar: what charged the bank.</p>
      <figcaption className="mt-1 text-sm text-slate-text" data-testid="daily-chart-summary">
        {summary}
        {unmetWords} First and last days are partial.
      </figcaption>
    </figure>
  );
}
