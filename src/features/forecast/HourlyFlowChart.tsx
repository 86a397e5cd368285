import { useId, useMemo, useState } from 'react';
import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast } from '../../engine';
import { COLORS, defaultDay, rowsOfDay } from './chart-data';
import { hourBands, isCutOff, isDriving, UNUSED_WORDS, unusedSolarOf, type HourBand } from './hour-marks';
import { formatClock, formatDay, formatWh, localParts } from '../../lib/format';
import { useWidth } from './useWidth';

/** Band colours: drive hours moss (the alternator charges), cut-off hours ember (loads go unserved). */
const DRIVE_FILL = COLORS.charging;
const CUTOFF_FILL = COLORS.cutoff;
/** Unused solar: full in pale sun, too cold in a cold slate blue, over the limit in sand-dark. */
const UNUSED = {
  full: { fill: '#F8DC9C', stroke: '#B8841A' },
  cold: { fill: '#B9CCE0', stroke: '#3F6289' },
  limit: { fill: '#E6D8C1', stroke: '#8A7552' },
} as const;

function bandWords(bands: HourBand[], clocks: string[], endClock: string): string {
  return bands.map((b) => `${clocks[b.x1] ?? ''}–${clocks[b.x2] ?? endClock}`).join(', ');
}

/**
 * Watts hour by hour on one chosen day — loads, solar (with the solar left unused and why) and other
 * charging — with the state of charge; drive hours and hours the bank is cut off are shaded.
 * The x axis is the hour's position in the day (one unit an hour), so a repeated or skipped clock hour
 * (a DST change) keeps its own place and each band covers its hours exactly.
 */
export default function HourlyFlowChart({ forecast, height = 240 }: { forecast: Forecast; height?: number }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const id = useId();
  const days = forecast.days.map((d) => d.date);
  const [day, setDay] = useState(() => {
    const d = defaultDay(forecast);
    return days.includes(d) ? d : days[0] ?? '';
  });
  const rows = useMemo(() => rowsOfDay(forecast, day).map(({ row }) => row), [forecast, day]);
  const data = useMemo(() => {
    const pts = rows.map((row, x) => {
      const u = unusedSolarOf(row);
      return {
        x,
        clock: formatClock(row.time),
        load: row.loadWatts,
        solar: row.solarWatts,
        charge: row.chargeWatts,
        soc: row.socPct,
        unmet: row.unmetWatts,
        full: u ? u.full : row.curtailedWatts,
        cold: u ? u.cold : 0,
        limit: u ? u.limit : 0,
      };
    });
    // The last hour ends at x = n: repeat its values there so its step has width.
    const last = pts[pts.length - 1];
    if (last) pts.push({ ...last, x: pts.length });
    return pts;
  }, [rows]);
  const n = rows.length;
  const hours = data.slice(0, n);
  const clocks = hours.map((d) => d.clock);
  const lastRow = rows[n - 1];
  const lastParts = lastRow ? localParts(lastRow.time) : null;
  // The day's last hour ends one clock hour after it starts (a DST change inside it is not worth a word here).
  const endClock = lastParts ? `${String((lastParts.hour + 1) % 24).padStart(2, '0')}:${String(lastParts.minute).padStart(2, '0')}` : '';
  const drives = hourBands(rows, isDriving);
  const cutOff = hourBands(rows, isCutOff);
  const causesKnown = rows.every((r) => unusedSolarOf(r) !== null);
  const sum = (k: 'unmet' | 'solar' | 'load' | 'full' | 'cold' | 'limit') => hours.reduce((s, d) => s + d[k], 0);
  const unmetWh = sum('unmet');
  const unused = { full: sum('full'), cold: sum('cold'), limit: sum('limit') };
  const peak = hours.reduce((a, b) => (b.load > a.load ? b : a), hours[0] ?? { load: 0, clock: '' });
  const first = hours[0];
  const last = hours.at(-1);
  const unusedKinds = (['full', 'cold', 'limit'] as const).filter((k) => unused[k] >= 1);
  const unusedLabel = (k: 'full' | 'cold' | 'limit') => (causesKnown ? `Solar unused: ${UNUSED_WORDS[k]}` : 'Solar unused (bank full or too cold)');
  const summary =
    !first || !last
      ? 'No hours on this day.'
      : [
          `${formatDay(day)}, ${first.clock} to ${last.clock}: loads ${formatWh(sum('load'))} (peak ${peak.load} W at ${peak.clock}), solar ${formatWh(sum('solar'))}; state of charge from ${first.soc} % to ${last.soc} %.`,
          ...(drives.length > 0 ? [`Driving (the alternator charges): ${bandWords(drives, clocks, endClock)}.`] : []),
          ...(cutOff.length > 0 ? [`The bank is cut off ${bandWords(cutOff, clocks, endClock)}${unmetWh > 0 ? `: ${formatWh(unmetWh)} of loads not served` : ''}.`] : []),
          ...(unusedKinds.length > 0 ? [`Solar left unused: ${unusedKinds.map((k) => `${formatWh(unused[k])} ${causesKnown ? UNUSED_WORDS[k] : '(bank full or too cold)'}`).join(', ')}.`] : []),
        ].join(' ');
  const xTicks = hours.filter((_, i) => i % (width < 520 ? 4 : 2) === 0).map((d) => d.x);

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
        {width > 0 && n > 0 ? (
          <ComposedChart width={width} height={height} data={data} margin={{ top: 8, right: 0, bottom: 4, left: 0 }} title={`Power by hour on ${formatDay(day)}`} desc={summary}>
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            <XAxis
              dataKey="x"
              type="number"
              domain={[0, n]}
              ticks={xTicks}
              tickFormatter={(x: number) => clocks[x] ?? ''}
              tick={{ fontSize: 12, fill: COLORS.axis }}
              stroke={COLORS.axis}
              allowDecimals={false}
            />
            <YAxis yAxisId="w" tickFormatter={(v: number) => `${v}\u00a0W`} width={56} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            <YAxis yAxisId="soc" orientation="right" domain={[0, 100]} ticks={[0, 50, 100]} tickFormatter={(v: number) => `${v}%`} width={40} tick={{ fontSize: 12, fill: COLORS.axis }} stroke={COLORS.axis} />
            {cutOff.map((b) => (
              <ReferenceArea key={`c${b.x1}`} yAxisId="w" x1={b.x1} x2={b.x2} fill={CUTOFF_FILL} fillOpacity={0.12} stroke="none" ifOverflow="hidden" className="cutoff-band" />
            ))}
            {/* Drive hours: a green strip along the top (SOC axis 92–100) with dashed edges down the chart, so it reads on top of a cut-off band too. */}
            {drives.map((b) => (
              <ReferenceArea key={`d${b.x1}`} yAxisId="soc" x1={b.x1} x2={b.x2} y1={0} y2={100} fill="none" stroke={DRIVE_FILL} strokeWidth={1.5} strokeDasharray="4 3" ifOverflow="hidden" className="drive-band" />
            ))}
            {drives.map((b) => (
              <ReferenceArea key={`s${b.x1}`} yAxisId="soc" x1={b.x1} x2={b.x2} y1={92} y2={100} fill={DRIVE_FILL} fillOpacity={0.9} stroke="none" ifOverflow="hidden" className="drive-strip" />
            ))}
            <Tooltip
              formatter={(v, name) => [name === 'State of charge' ? `${v} %` : `${v} W`, String(name)]}
              labelFormatter={(x) => {
                const i = Math.min(Number(x), n - 1);
                const r = rows[i];
                const notes = [r?.driving ? 'driving' : '', r?.disconnected ? 'bank cut off' : ''].filter(Boolean).join(', ');
                return `${clocks[i] ?? ''}${notes ? ` · ${notes}` : ''}`;
              }}
              contentStyle={{ borderRadius: 12, borderColor: COLORS.grid, fontSize: 13 }}
              isAnimationActive={false}
            />
            <Area yAxisId="w" type="stepAfter" dataKey="solar" name="Solar" stackId="sun" stroke={COLORS.solar} fill={COLORS.solar} fillOpacity={0.45} isAnimationActive={false} />
            {unusedKinds.map((k) => (
              <Area key={k} yAxisId="w" type="stepAfter" dataKey={k} name={unusedLabel(k)} stackId="sun" stroke={UNUSED[k].stroke} strokeDasharray="4 3" fill={UNUSED[k].fill} fillOpacity={0.6} isAnimationActive={false} className={`unused-${k}`} />
            ))}
            <Area yAxisId="w" type="stepAfter" dataKey="charge" name="Other charging" stroke={COLORS.charging} fill={COLORS.charging} fillOpacity={0.35} isAnimationActive={false} />
            <Line yAxisId="w" type="stepAfter" dataKey="load" name="Loads" stroke={COLORS.loads} strokeWidth={2} dot={false} isAnimationActive={false} />
            {unmetWh > 0 ? (
              <Line yAxisId="w" type="stepAfter" dataKey="unmet" name="Loads not served" stroke={COLORS.cutoff} strokeWidth={2} strokeDasharray="5 3" dot={false} isAnimationActive={false} />
            ) : null}
            <Line yAxisId="soc" type="monotone" dataKey="soc" name="State of charge" stroke={COLORS.soc} strokeWidth={1.5} strokeDasharray="3 3" dot={false} isAnimationActive={false} />
          </ComposedChart>
        ) : (
          <div className="animate-pulse rounded-lg bg-sand/70" style={{ height }} aria-hidden="true" />
        )}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-text sm:text-sm" aria-label="Chart key" data-testid="hourly-key">
        <li className="flex items-center gap-1.5"><span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.solar }} />Solar</li>
        {unusedKinds.map((k) => (
          <li key={k} className="flex items-center gap-1.5">
            <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm border border-dashed" style={{ background: UNUSED[k].fill, borderColor: UNUSED[k].stroke }} />
            {unusedLabel(k)}
          </li>
        ))}
        <li className="flex items-center gap-1.5"><span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm" style={{ background: COLORS.charging }} />Other charging</li>
        <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.loads} strokeWidth="2" /></svg>Loads</li>
        {unmetWh > 0 ? (
          <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.cutoff} strokeWidth="2" strokeDasharray="5 3" /></svg>Loads not served</li>
        ) : null}
        <li className="flex items-center gap-1.5"><svg width="18" height="8" aria-hidden="true"><line x1="0" y1="4" x2="18" y2="4" stroke={COLORS.soc} strokeWidth="1.5" strokeDasharray="3 3" /></svg>State of charge (right axis)</li>
        {drives.length > 0 ? (
          <li className="flex items-center gap-1.5">
            <svg width="18" height="12" aria-hidden="true"><rect x="0.75" y="0.75" width="16.5" height="10.5" fill="none" stroke={DRIVE_FILL} strokeWidth="1.5" strokeDasharray="3 2" /><rect x="0" y="0" width="18" height="3.5" fill={DRIVE_FILL} /></svg>
            Green strip and dashed edges: driving (alternator charging)
          </li>
        ) : null}
        {cutOff.length > 0 ? (
          <li className="flex items-center gap-1.5"><span aria-hidden="true" className="inline-block h-3 w-4 rounded-sm" style={{ background: 'rgba(217,100,46,0.2)' }} />Shaded orange: bank cut off</li>
        ) : null}
      </ul>
      <figcaption className="mt-1 text-sm text-slate-text" data-testid="hourly-summary">{summary}</figcaption>
    </figure>
  );
}
