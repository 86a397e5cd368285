import { useId, useMemo, useState } from 'react';
import { Area, CartesianGrid, ComposedChart, Line, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast } from '../../engine';
import { COLORS, defaultDay, rowsOfDay } from './chart-data';
import { formatClock, formatDay, formatWh } from '../../lib/format';
import { useWidth } from './useWidth';

/** Watts hour by hour on one chosen day — loads, solar and other charging — with the state of charge. */
export default function HourlyFlowChart({ forecast, height = 240 }: { forecast: Forecast; height?: number }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const id = useId();
  const days = forecast.days.map((d) => d.date);
  const [day, setDay] = useState(() => {
    const d = defaultDay(forecast);
    return days.includes(d) ? d : days[0] ?? '';
  });
  const data = useMemo(
    () =>
      rowsOfDay(forecast, day).map(({ row }) => ({
        clock: formatClock(row.time),
        load: row.loadWatts,
        solar: row.solarWatts,
        charge: row.chargeWatts,
        soc: row.socPct,
        unmet: row.unmetWatts,
      })),
    [forecast, day],
  );
  const unmetWh = data.reduce((s, d) => s + d.unmet, 0);
  const peak = data.reduce((a, b) => (b.load > a.load ? b : a), data[0] ?? { load: 0, clock: '' });
  const solarWh = data.reduce((s, d) => s + d.solar, 0);
  const loadWh = data.reduce((s, d) => s + d.load, 0);
  const first = data[0];
  const last = data.at(-1);
  const summary =
    !first || !last
      ? 'No hours on this day.'
      : `${formatDay(day)}, ${first.clock} to ${last.clock}: loads ${formatWh(loadWh)} (peak ${peak.load} W at ${peak.clock}), solar ${formatWh(solarWh)}; state of charge from ${first.soc} % to ${last.soc} %.${unmetWh > 0 ? ` Unmet: ${formatWh(unmetWh)} while the bank is disconnected.` : ''}`;

  return (
    <figure className="m-0" data-testid="hourly-flow-chart">
      <div className="no-print mb-2 flex flex-wrap items-center gap-2">
        <label htmlFor={`${id}-day`} className="text-sm font-bold">Day</label>
        <select id={`${id}-day`} className="field-input w-auto py-1" value={day} onChange={(e) => setDay(e.target.value)}>
          {days.map((d) => (
            <option key={d} value={d}>{formatDay(d)}</option>
          ))}
        </select>
      </div>
      <div ref={ref} className="w-full">
        {width > 0 && data.length > 0 ? (
          <ComposedChart width={width} height={height} data={data} margin={{ top: 8, right: 0, bottom: 4, left: 0 }} title={`Power by hour on ${formatDay(day)}`} desc={summary}>
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            <XAxis dataKey="clock" tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} interval={width < 520 ? 3 : 1} />
            <YAxis yAxisId="w" tickFormatter={(v: number) => `${v}\u00a0W`} width={56} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <YAxis yAxisId="soc" orientation="right" domain={[0, 100]} ticks={[0, 50, 100]} tickFormatter={(v: number) => `${v}%`} width={40} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <Tooltip
              formatter={(v, name) => [name === 'State of charge' ? `${v} %` : `${v} W`, String(name)]}
              contentStyle={{ borderRadius: 12, borderColor: COLORS.grid, fontSize: 13 }}
              isAnimationActive={false}
            />
            <Area yAxisId="w" type="stepAfter" dataKey="solar" name="Solar" stroke={COLORS.solar} fill={COLORS.solar} fillOpacity={0.45} isAnimationActive={false} />
            <Area yAxisId="w" type="stepAfter" dataKey="charge" name="Other charging" stroke={COLORS.charging} fill={COLORS.charging} fillOpacity={0.35} isAnimationActive={false} />
            <Line yAxisId="w" type="stepAfter" dataKey="load" name="Loads" stroke={COLORS.loads} strokeWidth={2} dot={false} isAnimationActive={false} />
            {unmetWh > 0 ? (
              <Line yAxisId="w" type="stepAfter" dataKey="unmet" name="Unmet" stroke={COLORS.cutoff} strokeWidth={2} strokeDasharray="5 3" dot={false} isAnimationActive={false} />
            ) : null}
            <Line yAxisId="soc" type="monotone" dataKey="soc" name="State of charge" stroke={COLORS.soc} strokeWidth={1.5} strokeDasharray="3 3" dot={false} isAnimationActive={false} />
          </ComposedChart>
        ) : (
          <div className="animate-pulse rounded-lg bg-sand/70" style={{ height }} aria-hidden="true" />
        )}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-text sm:text-sm" aria-label="Chart key">
        <li className="flex items-center gap-1.5"><span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.solar }} />Solar</li>
        <li className="flex items-center gap-1.5"><span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.charging }} />Other charging</li>
        <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.loads} strokeWidth="2" /></svg>Loads</li>
        {unmetWh > 0 ? (
          <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.cutoff} strokeWidth="2" strokeDasharray="5 3" /></svg>Unmet</li>
        ) : null}
        <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.soc} strokeWidth="1.5" strokeDasharray="3 3" /></svg>State of charge (right axis)</li>
      </ul>
      <figcaption className="mt-1 text-sm text-slate-text">{summary}</figcaption>
    </figure>
  );
}
