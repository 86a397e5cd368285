import { useMemo } from 'react';
import { CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceDot, ReferenceLine, Tooltip, XAxis, YAxis } from 'recharts';
import type { Forecast, ResolvedPlan } from '../../engine';
import { COLORS, cutoffX, dayTicks, nightBands, socSeries, socSummaryText, stopSegments, usableSeries, voltageMarks } from './chart-data';
import { formatClock, formatRowTimeWithZone } from '../../lib/format';
import { reserveOf } from '../../domain/forecasts/verdict';
import { SOC_PLOT, SocKey, SocSketchPlot, stripKinds } from './SocSketch';
import { STRIPS, tripBands } from './hour-marks';
import { useWidth } from './useWidth';

/** A second forecast drawn over the first (compare). */
export interface CompareSeries {
  name: string;
  forecast: Forecast;
  plan: ResolvedPlan;
}

export interface SocChartProps {
  forecast: Forecast;
  plan: ResolvedPlan;
  /** The trip's reserve; the bank's floor when not given. */
  reserveSocPct?: number | null;
  /** Name of the main line (shown in the legend when comparing). */
  name?: string;
  /** A second forecast, drawn as an ember dashed line. */
  compare?: CompareSeries | null;
  height?: number;
  /** Show the text summary under the chart (it is always there for screen readers). */
  showSummary?: boolean;
}

interface Point {
  x: number;
  soc?: number;
  row?: number;
  soc2?: number;
  row2?: number;
  /** Usable charge at the hour's end (engine revision 2), when the cold strands some. */
  usable?: number;
}

// The sketch's plot box: recharts adds its 30 px x axis under the bottom margin.
const Y_AXIS_WIDTH = SOC_PLOT.left;
const MARGIN = { top: SOC_PLOT.top, right: SOC_PLOT.right, bottom: SOC_PLOT.bottom - 30, left: 0 };

/** The state-of-charge line across the trip: nights shaded, the reserve as a band, the cutoff marked, stops named along the top. */
export default function SocChart({ forecast, plan, reserveSocPct, name, compare, height = 280, showSummary = true }: SocChartProps) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const n = Math.max(forecast.hourly.length, compare?.forecast.hourly.length ?? 0);
  const reserve = reserveOf(forecast, plan, reserveSocPct);

  const data = useMemo<Point[]>(() => {
    const a = socSeries(forecast);
    const b = compare ? socSeries(compare.forecast) : [];
    const u = compare ? null : usableSeries(forecast);
    const out: Point[] = [];
    for (let x = 0; x <= n; x++) {
      const p: Point = { x };
      const pa = a[x];
      const pb = b[x];
      const pu = u?.[x - 1];
      if (pu) p.usable = pu.soc;
      if (pa) {
        p.soc = pa.soc;
        p.row = pa.row;
      }
      if (pb) {
        p.soc2 = pb.soc;
        p.row2 = pb.row;
      }
      out.push(p);
    }
    return out;
  }, [forecast, compare, n]);

  const nights = useMemo(() => nightBands(forecast), [forecast]);
  const stops = useMemo(() => stopSegments(forecast, plan), [forecast, plan]);
  const ticks = useMemo(() => dayTicks(forecast, width > 0 && width < 520 ? 5 : 10), [forecast, width]);
  const tickLabel = useMemo(() => new Map(ticks.map((t) => [t.x, t.label])), [ticks]);
  const cx = cutoffX(forecast);
  const cx2 = compare ? cutoffX(compare.forecast) : null;
  const hasUsable = !compare && usableSeries(forecast) !== null;
  const marks = useMemo(() => (compare ? [] : voltageMarks(forecast)), [forecast, compare]);
  // Drive and cut-off hours as strips along the bottom (one forecast only: an overlay would need two).
  const strips = useMemo(() => (compare ? { drives: [], cutOff: [] } : tripBands(forecast)), [forecast, compare]);
  const summary = useMemo(() => {
    const main = socSummaryText(forecast, plan, reserveSocPct);
    if (!compare) return main;
    return `${name ?? 'First'}: ${main} ${compare.name}: ${socSummaryText(compare.forecast, compare.plan, reserveSocPct)}`;
  }, [forecast, plan, reserveSocPct, compare, name]);

  const plotLeft = Y_AXIS_WIDTH + MARGIN.left;
  const narrow = width > 0 && width < 520;

  return (
    <figure className="soc-chart m-0" data-testid="soc-chart">
      <div ref={ref} className="relative w-full">
        {/* Stop names along the top, aligned with the plot area below. */}
        <div className="relative h-6 text-xs font-bold text-slate-text" style={{ marginLeft: plotLeft, marginRight: MARGIN.right }} aria-hidden="true">
          {stops.map((s, i) => (
            <span
              key={`${s.name}-${i}`}
              data-testid="stop-name"
              className="absolute top-0 truncate border-l-2 border-slate/40 pl-1"
              style={{ left: `${(s.x1 / Math.max(n, 1)) * 100}%`, width: `${((s.x2 - s.x1) / Math.max(n, 1)) * 100}%` }}
              title={s.name}
            >
              {s.name}
            </span>
          ))}
        </div>
        {width > 0 ? (
          <ComposedChart
            width={width}
            height={height}
            data={data}
            margin={MARGIN}
            title="State of charge through the trip"
            desc={summary}
            className="soc-chart-svg"
          >
            <CartesianGrid vertical={false} stroke={COLORS.grid} />
            {nights.map((b) => (
              <ReferenceArea key={`n${b.x1}`} x1={b.x1} x2={b.x2} className="night-band" fill={COLORS.night} fillOpacity={0.08} stroke="none" ifOverflow="hidden" />
            ))}
            <ReferenceArea
              y1={0}
              y2={reserve}
              ifOverflow="hidden"
              className="reserve-band"
              shape={(p: { x?: number; y?: number; width?: number; height?: number }) => (
                <rect data-testid="reserve-band" className="reserve-band-rect" x={p.x} y={p.y} width={p.width} height={p.height} fill={COLORS.reserveFill} fillOpacity={0.8} />
              )}
            />
            <ReferenceLine
              y={reserve}
              stroke={COLORS.reserveEdge}
              strokeDasharray="6 4"
              strokeWidth={1.5}
              shape={<line data-testid="reserve-edge" />}
              label={{ value: `Reserve ${Math.round(reserve)} %`, position: 'insideBottomLeft', fill: COLORS.axis, fontSize: 12, fontWeight: 700 }}
            />
            {stops.slice(1).map((s) => (
              <ReferenceLine key={`s${s.x1}`} x={s.x1} stroke={COLORS.loads} strokeOpacity={0.6} strokeDasharray="2 3" />
            ))}
            <XAxis
              dataKey="x"
              type="number"
              domain={[0, n]}
              ticks={ticks.map((t) => t.x)}
              tickFormatter={(v: number) => tickLabel.get(v) ?? ''}
              tick={{ fontSize: 12, fill: COLORS.axis }}
              stroke={COLORS.axis}
              interval={0}
              allowDecimals={false}
            />
            <YAxis
              domain={[0, 100]}
              ticks={[0, 25, 50, 75, 100]}
              tickFormatter={(v: number) => `${v}%`}
              width={Y_AXIS_WIDTH}
              tick={{ fontSize: 12, fill: COLORS.axis }}
              stroke={COLORS.axis}
              allowDataOverflow
            />
            <Tooltip
              content={(props) => <SocTooltip {...(props as unknown as TooltipProps)} forecast={forecast} plan={plan} compare={compare} name={name} />}
              cursor={{ stroke: COLORS.soc, strokeOpacity: 0.35 }}
              isAnimationActive={false}
            />
            {compare ? (
              <Line
                dataKey="soc2"
                name={compare.name}
                className="soc-line-compare"
                stroke={COLORS.compare}
                strokeWidth={2.5}
                strokeDasharray="7 5"
                dot={false}
                activeDot={{ r: 4 }}
                isAnimationActive={false}
                connectNulls={false}
              />
            ) : null}
 {hasUsable ? (
              <Line dataKey="usable" name="Usable in the cold" className="usable-line" stroke={COLORS.usable} strokeWidth={2} strokeDasharray="5 4" dot={false} activeDot={false} isAnimationActive={false} connectNulls={false} />
            ) : null}
            {strips.drives.map((b) => (
              <ReferenceArea key={`d${b.x1}`} x1={b.x1} x2={b.x2} y1={STRIPS.drive[0]} y2={STRIPS.drive[1]} fill={COLORS.charging} fillOpacity={0.9} stroke="none" ifOverflow="hidden" className="drive-strip" />
            ))}
            {strips.cutOff.map((b) => (
              <ReferenceArea key={`c${b.x1}`} x1={b.x1} x2={b.x2} y1={STRIPS.cutOff[0]} y2={STRIPS.cutOff[1]} fill={COLORS.cutoff} fillOpacity={0.9} stroke="none" ifOverflow="hidden" className="cutoff-strip" />
            ))}
            {marks.map((m) => (
              <ReferenceArea key={`v${m.x}`} x1={m.x} x2={m.x + 1} y1={0} y2={12} fill={COLORS.cutoffText} fillOpacity={0.85} stroke="none" ifOverflow="hidden" className="voltage-mark" />
            ))}
            <Line dataKey="soc" name={name ?? 'State of charge'} className="soc-line" stroke={COLORS.soc} strokeWidth={2.5} dot={false} activeDot={{ r: 4 }} isAnimationActive={false} connectNulls={false} />
            {cx !== null ? (
              <ReferenceLine
                x={cx}
                stroke={COLORS.cutoff}
                strokeWidth={2}
                shape={<line data-testid="cutoff-marker" />}
                label={(p: { viewBox?: { x: number; y: number } }) => (
                  <CutoffLabel viewBox={p.viewBox} text={`Cutoff ${formatClock(forecast.summary.firstCutoffAt ?? '')}`} rightHalf={cx > n / 2} />
                )}
              />
            ) : null}
            {cx !== null ? <ReferenceDot x={cx + 1} y={forecast.hourly[cx]?.socPct ?? reserve} r={5} fill={COLORS.cutoff} stroke="#fff" strokeWidth={1.5} /> : null}
            {compare && cx2 !== null ? (
              <ReferenceLine
                x={cx2}
                stroke={COLORS.cutoff}
                strokeWidth={2}
                strokeDasharray="4 3"
                shape={<line data-testid="cutoff-marker-compare" />}
                label={(p: { viewBox?: { x: number; y: number } }) => (
                  <CutoffLabel viewBox={p.viewBox} text={`${compare.name}: cutoff ${formatClock(compare.forecast.summary.firstCutoffAt ?? '')}`} rightHalf={cx2 > n / 2} dy={16} />
                )}
              />
            ) : null}
          </ComposedChart>
        ) : (
          // Until the width is known, the same chart drawn without measuring (no blank box, no jump).
          <SocSketchPlot forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} height={height} label={summary} />
        )}
      </div>
      <SocKey compareName={compare?.name} name={name} narrow={narrow} hasCutoff={cx !== null || cx2 !== null} hasUsable={hasUsable} markKinds={marks.map((m) => m.kind)} {...(compare ? {} : stripKinds(forecast))} />
      <figcaption className={showSummary ? 'mt-2 text-sm text-slate-text' : 'sr-only'} data-testid="soc-summary">
        {summary}
      </figcaption>
    </figure>
  );
}

function CutoffLabel({ viewBox, text, rightHalf, dy = 0 }: { viewBox?: { x: number; y: number }; text: string; rightHalf: boolean; dy?: number }) {
  if (!viewBox) return null;
  const x = rightHalf ? viewBox.x - 6 : viewBox.x + 6;
  return (
    <text x={x} y={viewBox.y + 16 + dy} textAnchor={rightHalf ? 'end' : 'start'} fill={COLORS.cutoffText} fontSize={13} fontWeight={800} data-testid="cutoff-label" paintOrder="stroke" stroke="#FFFDF9" strokeWidth={4}>
      {text}
    </text>
  );
}

interface TooltipProps {
  active?: boolean;
  payload?: { payload?: Point }[];
}

function SocTooltip({ active, payload, forecast, plan, compare, name }: TooltipProps & { forecast: Forecast; plan: ResolvedPlan; compare?: CompareSeries | null; name?: string }) {
  const p = payload?.[0]?.payload;
  if (!active || !p) return null;
  const row = p.row !== undefined && p.row >= 0 ? forecast.hourly[p.row] : undefined;
  const stopName = row ? forecast.stops?.[row.stop]?.name ?? plan.stops[row.stop]?.name : undefined;
  const zone = row ? forecast.stops?.[row.stop]?.timeZone ?? plan.stops[row.stop]?.timeZone : undefined;
  const row2 = compare && p.row2 !== undefined && p.row2 >= 0 ? compare.forecast.hourly[p.row2] : undefined;
  return (
    <div className="max-w-[17rem] rounded-xl border border-sand-dark bg-card p-3 text-sm shadow-lg" data-testid="soc-tooltip">
      {row ? (
        <>
          <p className="font-extrabold leading-snug">{formatRowTimeWithZone(row.time, zone)}</p>
          <p className="text-xs text-slate-text">
            {stopName}
            {row.driving ? ' · driving' : ''}
            {row.generatorOn ? ' · generator on' : ''}
            {row.disconnected ? ' · bank disconnected' : ''}
          </p>
          <dl className="mt-1.5 grid grid-cols-[auto_auto] gap-x-3 tabular-nums">
            <dt>{compare ? `SOC, ${name ?? 'first'}` : 'State of charge'}</dt>
            <dd className="text-right font-bold">{row.socPct.toFixed(1)} %</dd>
            {row2 ? (
              <>
                <dt>SOC, {compare?.name}</dt>
                <dd className="text-right font-bold">{row2.socPct.toFixed(1)} %</dd>
              </>
            ) : null}
            {row.usablePct !== undefined && row.socPct - row.usablePct >= 0.05 ? (
              <>
                <dt>Usable in the cold</dt>
                <dd className="text-right">{row.usablePct.toFixed(1)} %</dd>
              </>
            ) : null}
            <dt>Volts</dt>
            <dd className="text-right">{row.volts.toFixed(2)} V</dd>
            {row.minVolts !== undefined ? (
              <>
                <dt>Lowest volts</dt>
                <dd className="text-right">{row.minVolts.toFixed(2)} V</dd>
              </>
            ) : null}
            <dt>Solar</dt>
            <dd className="text-right">{row.solarWatts} W</dd>
            <dt>Charging</dt>
            <dd className="text-right">{row.chargeWatts} W</dd>
            <dt>Loads</dt>
            <dd className="text-right">{row.loadWatts} W</dd>
            {row.unmetWatts > 0 ? (
              <>
                <dt className="font-bold text-alert">Unmet</dt>
                <dd className="text-right font-bold text-alert">{row.unmetWatts} W</dd>
              </>
            ) : null}
          </dl>
          <p className="mt-1 text-xs text-slate-text">SOC at the end of the hour; watts are the hour’s average.</p>
        </>
      ) : (
        <p className="font-bold">Start: {forecast.summary.startSocPct.toFixed(1)} %</p>
      )}
    </div>
  );
}
