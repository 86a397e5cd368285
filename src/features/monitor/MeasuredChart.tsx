import { useMemo } from 'react';
import { CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast } from '../../engine';
import { COLORS, dayTicks, nightBands } from '../forecast/chart-data';
import { formatRowTime } from '../../lib/format';
import { useWidth } from '../forecast/useWidth';
import type { Overlay } from '../../domain/monitor/overlay';

const MEASURED = '#3E6646';

/** The forecast's SOC line with the monitor's measured SOC over it, hour by hour; nights shaded. */
export default function MeasuredChart({ forecast, overlay, name, summary }: { forecast: Forecast; overlay: Overlay; name: string; summary: string }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const n = forecast.hourly.length;
  const data = useMemo(
    () =>
      Array.from({ length: n + 1 }, (_, x) => ({
        x,
        forecast: x === 0 ? forecast.summary.startSocPct : (forecast.hourly[x - 1]?.socPct ?? null),
        measured: overlay.measured[x] ?? null,
      })),
    [forecast, overlay, n],
  );
  const nights = useMemo(() => nightBands(forecast), [forecast]);
  const ticks = useMemo(() => dayTicks(forecast, width > 0 && width < 520 ? 5 : 10), [forecast, width]);
  const label = new Map(ticks.map((t) => [t.x, t.label]));
  return (
    <figure className="m-0" data-testid="measured-chart">
      <div ref={ref} className="w-full">
        {width > 0 ? (
          <ComposedChart width={width} height={260} data={data} margin={{ top: 10, right: 14, bottom: 4, left: 0 }} title={`Measured state of charge against ${name}`} desc={summary}>
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            {nights.map((b) => (
              <ReferenceArea key={b.x1} x1={b.x1} x2={b.x2} fill={COLORS.night} fillOpacity={0.08} stroke="none" ifOverflow="hidden" />
            ))}
            <XAxis dataKey="x" type="number" domain={[0, n]} ticks={ticks.map((t) => t.x)} tickFormatter={(v: number) => label.get(v) ?? ''} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} interval={0} />
            <YAxis domain={[0, 100]} ticks={[0, 25, 50, 75, 100]} tickFormatter={(v: number) => `${v}%`} width={44} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <Tooltip
              isAnimationActive={false}
              content={(props) => {
                const p = props as unknown as { active?: boolean; payload?: { payload?: { x: number; forecast: number; measured: number | null } }[] };
                const d = p.payload?.[0]?.payload;
                if (!p.active || !d) return null;
                const row = d.x > 0 ? forecast.hourly[d.x - 1] : null;
                return (
                  <div className="rounded-xl border border-sand-dark bg-card p-3 text-sm shadow-lg">
                    <p className="font-extrabold">{row ? formatRowTime(row.time) : 'Start'}</p>
                    <p>Forecast: {d.forecast.toFixed(1)} %</p>
                    <p>Measured: {d.measured === null ? 'no reading' : `${d.measured.toFixed(1)} %`}</p>
                  </div>
                );
              }}
            />
            <Line dataKey="forecast" name={name} stroke={COLORS.soc} strokeWidth={2.5} dot={false} isAnimationActive={false} className="forecast-line" />
            <Line dataKey="measured" name="Measured" stroke={MEASURED} strokeWidth={2.5} strokeDasharray="6 3" dot={false} connectNulls={false} isAnimationActive={false} className="measured-line" />
          </ComposedChart>
        ) : (
          <div className="h-[260px] animate-pulse rounded-lg bg-sand/70" aria-hidden="true" />
        )}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 text-xs text-slate-text" aria-label="Chart key">
        <li className="flex items-center gap-1.5">
          <svg width="22" height="8" aria-hidden="true"><line x1="0" y1="4" x2="22" y2="4" stroke={COLORS.soc} strokeWidth="2.5" /></svg>
          Forecast “{name}”
        </li>
        <li className="flex items-center gap-1.5">
          <svg width="22" height="8" aria-hidden="true"><line x1="0" y1="4" x2="22" y2="4" stroke={MEASURED} strokeWidth="2.5" strokeDasharray="6 3" /></svg>
          Measured by the monitor
        </li>
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm" style={{ background: 'rgba(47,62,85,0.12)' }} />
          Night
        </li>
      </ul>
      <figcaption className="mt-2 text-sm text-slate-text" data-testid="measured-summary">{summary}</figcaption>
    </figure>
  );
}
