import type { Forecast, ResolvedPlan } from '../../engine';
import { COLORS, cutoffX, dayTicks, nightBands, socSeries, socSummaryText, stopSegments, usableSeries, voltageMarks, VOLTAGE_MARK_WORDS, type VoltageCutoffKind } from './chart-data';
import { formatClock } from '../../lib/format';
import { reserveOf } from '../../domain/forecasts/verdict';
import { STRIPS, tripBands } from './hour-marks';

export interface SocSketchProps {
  forecast: Forecast;
  plan: ResolvedPlan;
  /** The trip's reserve; the bank's floor when not given. */
  reserveSocPct?: number | null;
  /** Height of the plot with its day labels, px (the stop names sit above it). */
  height?: number;
  /** Show the text summary under the chart (it is always there for screen readers). */
  showSummary?: boolean;
}

/** Plot margins shared with the interactive chart (SocChart), so one can stand in for the other without a jump. */
export const SOC_PLOT = { top: 10, right: 14, bottom: 34, left: 44 } as const;

/**
 * The state-of-charge chart as plain SVG and HTML, drawn without measuring anything: it renders
 * on the server and needs no JavaScript. The landing page shows it as it is; the forecast page
 * shows it first and swaps in the interactive chart (hourly tooltips) when the camper reaches
 * for it. Coordinates are hours × SOC %, stretched to the box; text is HTML so it never stretches.
 */
export default function SocSketch({ forecast: f, plan, reserveSocPct, height = 280, showSummary = true }: SocSketchProps) {
  const n = Math.max(1, f.hourly.length);
  const stops = stopSegments(f, plan);
  const cx = cutoffX(f);
  const summary = socSummaryText(f, plan, reserveSocPct);

  return (
    <figure className="soc-chart m-0" data-testid="soc-chart" data-sketch="">
      <div className="relative h-6 text-xs font-bold text-slate-text" style={{ marginLeft: SOC_PLOT.left, marginRight: SOC_PLOT.right }} aria-hidden="true">
        {stops.map((s, i) => (
          <span
            key={`${s.name}-${i}`}
            data-testid="stop-name"
            className="absolute top-0 truncate border-l-2 border-slate/40 pl-1"
            style={{ left: pctOf(s.x1, n), width: pctOf(s.x2 - s.x1, n) }}
            title={s.name}
          >
            {s.name}
          </span>
        ))}
      </div>
      <SocSketchPlot forecast={f} plan={plan} reserveSocPct={reserveSocPct} height={height} label={summary} />
      <SocKey hasCutoff={cx !== null} hasUsable={usableSeries(f) !== null} markKinds={voltageMarks(f).map((m) => m.kind)} {...stripKinds(f)} />
      <figcaption className={showSummary ? 'mt-2 text-sm text-slate-text' : 'sr-only'} data-testid="soc-summary">
        {summary}
      </figcaption>
    </figure>
  );
}

const pctOf = (x: number, n: number) => `${((x / n) * 100).toFixed(3)}%`;

/** Which strips the key names. */
export function stripKinds(f: Forecast): { hasDrive: boolean; hasCutOffHours: boolean } {
  const b = tripBands(f);
  return { hasDrive: b.drives.length > 0, hasCutOffHours: b.cutOff.length > 0 };
}

// The two lines' paths (an hour each) per forecast object: the saved forecast page renders the
// same decoded forecast again and again (savedForecastFromJson), which is never changed once made.
const lines = new WeakMap<Forecast, { line: string; usableLine: string | undefined }>();
function linesOf(f: Forecast): { line: string; usableLine: string | undefined } {
  let kept = lines.get(f);
  if (!kept) {
    const path = (points: { x: number; soc: number }[]) => points.map((p, i) => `${i ? 'L' : 'M'}${p.x.toFixed(2)},${(100 - p.soc).toFixed(2)}`).join(' ');
    const usable = usableSeries(f);
    kept = { line: path(socSeries(f)), usableLine: usable ? path(usable) : undefined };
    lines.set(f, kept);
  }
  return kept;
}

/** The plot alone (axes, bands, line, cutoff, day labels) in a box of the given height. */
export function SocSketchPlot({ forecast: f, plan, reserveSocPct, height, label }: { forecast: Forecast; plan: ResolvedPlan; reserveSocPct?: number | null; height: number; label: string }) {
  const n = Math.max(1, f.hourly.length);
  const pctX = (x: number) => pctOf(x, n);
  const y = (soc: number) => 100 - soc;
  const { line, usableLine } = linesOf(f);
  const reserve = reserveOf(f, plan, reserveSocPct);
  const nights = nightBands(f);
  const stops = stopSegments(f, plan);
  const days = dayTicks(f, 6);
  const cx = cutoffX(f);
  const cutoffSoc = cx !== null ? f.hourly[cx]?.socPct ?? reserve : null;
  const marks = voltageMarks(f);
  const strips = tripBands(f);

  return (
    <div className="relative" style={{ height }}>
      <div className="absolute" style={{ top: SOC_PLOT.top, right: SOC_PLOT.right, bottom: SOC_PLOT.bottom, left: SOC_PLOT.left }}>
        {[100, 75, 50, 25, 0].map((v) => (
          <span key={v} aria-hidden="true" className="absolute -translate-y-1/2 text-right text-xs text-slate-text" style={{ top: `${100 - v}%`, left: -SOC_PLOT.left, width: SOC_PLOT.left - 6 }}>
            {v}%
          </span>
        ))}
        <svg className="soc-chart-svg absolute inset-0 h-full w-full overflow-visible" viewBox={`0 0 ${n} 100`} preserveAspectRatio="none" role="img" aria-label={label}>
          {nights.map((b) => (
            <rect key={`n${b.x1}`} className="night-band" x={b.x1} y="0" width={b.x2 - b.x1} height="100" fill={COLORS.night} fillOpacity="0.08" />
          ))}
          {[25, 50, 75, 100].map((v) => (
            <line key={v} x1="0" x2={n} y1={y(v)} y2={y(v)} stroke={COLORS.grid} strokeWidth="1" vectorEffect="non-scaling-stroke" />
          ))}
          <rect data-testid="reserve-band" x="0" y={y(reserve)} width={n} height={reserve} fill={COLORS.reserveFill} fillOpacity="0.8" />
          <line data-testid="reserve-edge" x1="0" x2={n} y1={y(reserve)} y2={y(reserve)} stroke={COLORS.reserveEdge} strokeWidth="1.5" strokeDasharray="6 4" vectorEffect="non-scaling-stroke" />
          {stops.slice(1).map((s) => (
            <line key={`s${s.x1}`} x1={s.x1} x2={s.x1} y1="0" y2="100" stroke={COLORS.loads} strokeOpacity="0.6" strokeDasharray="2 3" vectorEffect="non-scaling-stroke" />
          ))}
          {strips.drives.map((b) => (
            <rect key={`d${b.x1}`} className="drive-strip" x={b.x1} y={y(STRIPS.drive[1])} width={b.x2 - b.x1} height={STRIPS.drive[1] - STRIPS.drive[0]} fill={COLORS.charging} fillOpacity="0.9" />
          ))}
          {strips.cutOff.map((b) => (
            <rect key={`c${b.x1}`} className="cutoff-strip" x={b.x1} y={y(STRIPS.cutOff[1])} width={b.x2 - b.x1} height={STRIPS.cutOff[1] - STRIPS.cutOff[0]} fill={COLORS.cutoff} fillOpacity="0.9" />
          ))}
          {usableLine ? (
            <g className="usable-line" data-testid="usable-line">
              <path d={usableLine} fill="none" stroke={COLORS.usable} strokeWidth="2" strokeDasharray="5 4" strokeLinejoin="round" vectorEffect="non-scaling-stroke" />
            </g>
          ) : null}
          <g className="soc-line">
            <path d={line} fill="none" stroke={COLORS.soc} strokeWidth="2.5" strokeLinejoin="round" vectorEffect="non-scaling-stroke" />
          </g>
          {marks.map((m) => (
            <rect key={`v${m.x}`} data-testid="voltage-mark" data-kind={m.kind} x={m.x} y="88" width="1" height="12" fill={COLORS.cutoffText} fillOpacity="0.85">
              <title>{`${VOLTAGE_MARK_WORDS[m.kind]}, ${formatClock(m.time)}`}</title>
            </rect>
          ))}
          {cx !== null ? <line data-testid="cutoff-marker" x1={cx} x2={cx} y1="0" y2="100" stroke={COLORS.cutoff} strokeWidth="2" vectorEffect="non-scaling-stroke" /> : null}
          <line x1="0" x2={n} y1="100" y2="100" stroke={COLORS.axis} strokeWidth="1" vectorEffect="non-scaling-stroke" />
          <line x1="0" x2="0" y1="0" y2="100" stroke={COLORS.axis} strokeWidth="1" vectorEffect="non-scaling-stroke" />
        </svg>
        <span aria-hidden="true" className="absolute left-1 text-xs font-bold" style={{ top: `calc(${y(reserve)}% - 1.1rem)`, color: COLORS.axis }}>
          Reserve {Math.round(reserve)} %
        </span>
        {cx !== null && cutoffSoc !== null ? (
          <>
            <span aria-hidden="true" className="absolute h-2.5 w-2.5 -translate-x-1/2 -translate-y-1/2 rounded-full border-[1.5px] border-white" style={{ left: pctX(cx + 1), top: `${y(cutoffSoc)}%`, background: COLORS.cutoff }} />
            <span
              aria-hidden="true"
              data-testid="cutoff-label"
              className={`absolute top-1 whitespace-nowrap text-[13px] font-extrabold ${cx > n / 2 ? '-translate-x-full pr-1.5' : 'pl-1.5'}`}
              style={{ left: pctX(cx), color: COLORS.cutoffText, textShadow: '0 0 3px #FFFDF9, 0 0 3px #FFFDF9' }}
            >
              Cutoff {formatClock(f.summary.firstCutoffAt ?? '')}
            </span>
          </>
        ) : null}
        {days.map((d) => (
          <span key={d.x} aria-hidden="true" className="absolute -translate-x-1/2 whitespace-nowrap pt-1.5 text-xs" style={{ left: pctX(d.x), top: '100%', color: COLORS.axis }}>
            {d.label}
          </span>
        ))}
      </div>
    </div>
  );
}

/** The chart's key (one line or a second dashed line when comparing). */
export function SocKey({
  hasCutoff,
  compareName,
  name,
  narrow = false,
  hasUsable = false,
  markKinds = [],
  hasDrive = false,
  hasCutOffHours = false,
}: {
  hasCutoff: boolean;
  compareName?: string;
  name?: string;
  narrow?: boolean;
  hasUsable?: boolean;
  markKinds?: VoltageCutoffKind[];
  hasDrive?: boolean;
  hasCutOffHours?: boolean;
}) {
  const kinds = [...new Set(markKinds)];
  return (
    <ul className={`mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-text ${narrow ? '' : 'sm:text-sm'}`} aria-label="Chart key">
      <li className="flex items-center gap-1.5">
        <svg width="22" height="8" aria-hidden="true"><line x1="0" y1="4" x2="22" y2="4" stroke={COLORS.soc} strokeWidth="2.5" /></svg>
        {compareName ? name ?? 'First' : 'State of charge'}
      </li>
      {compareName ? (
        <li className="flex items-center gap-1.5">
          <svg width="22" height="8" aria-hidden="true"><line x1="0" y1="4" x2="22" y2="4" stroke={COLORS.compare} strokeWidth="2.5" strokeDasharray="7 5" /></svg>
          {compareName}
        </li>
      ) : null}
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm border-t-2 border-dashed" style={{ background: COLORS.reserveFill, borderColor: COLORS.reserveEdge }} />
        Reserve
      </li>
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm" style={{ background: 'rgba(47,62,85,0.12)' }} />
        Night
      </li>
      {hasUsable ? (
        <li className="flex items-center gap-1.5">
          <svg width="22" height="8" aria-hidden="true"><line x1="0" y1="4" x2="22" y2="4" stroke={COLORS.usable} strokeWidth="2" strokeDasharray="5 4" /></svg>
          Usable in the cold
        </li>
      ) : null}
      {hasCutoff ? (
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block h-3 w-0.5" style={{ background: COLORS.cutoff }} />
          Cutoff
        </li>
      ) : null}
      {hasDrive || hasCutOffHours ? (
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-flex h-3 w-5 flex-col justify-end">
            {hasCutOffHours ? <span className="block h-1" style={{ background: COLORS.cutoff }} /> : null}
            {hasDrive ? <span className="block h-1" style={{ background: COLORS.charging }} /> : null}
          </span>
          {hasDrive && hasCutOffHours ? 'Strips at the bottom: green driving, orange bank cut off' : hasDrive ? 'Green strip at the bottom: driving' : 'Orange strip at the bottom: bank cut off'}
        </li>
      ) : null}
      {kinds.length > 0 ? (
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block h-3 w-1.5" style={{ background: COLORS.cutoffText }} />
          {kinds.map((k) => VOLTAGE_MARK_WORDS[k]).join(', ').replace(/^./, (c) => c.toUpperCase())}
        </li>
      ) : null}
    </ul>
  );
}
