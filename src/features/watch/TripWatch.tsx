import { useId } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { zonePlainName, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';
import { formatDay, pct } from '../../lib/format';
import { setWatchEnabled, setWatchFollowing, type TripWatch as Watch, type WatchRun } from './watch.api';
import { watchKeys, watchQueries } from './watch.queries';
import {
  bandSentence,
  dateIn,
  formatCutoff,
  formatInstant,
  isWorse,
  runSentence,
  startsSentence,
  VERDICT_LOOK,
  windowState,
  formatInstantNamed,
} from './watch-display';

interface Props {
  tripId: string;
  /** The user's clock (`userClock(Astro.locals.user)`): runs, the notice and the next run are app events, shown in the user's zone. */
  clock?: ZoneClock | null;
  /** The trip's first stop's clock: the day the watch starts and the trip ends are the trip's own dates. */
  stopClock: ZoneClock;
  /** The server's clock when it rendered the page (ms), so the first render in the browser matches it. */
  renderedAt: number;
  /** The watch as the page read it on the server. */
  initial?: Watch;
}

/** The trip watch on the trip page: on/off (or follow), the notice of a changed answer, the verdicts over the runs and the band. */
export default function TripWatch(props: Props) {
  return (
    <IslandQueryProvider>
      <Inner {...props} />
    </IslandQueryProvider>
  );
}

function Inner({ tripId, clock, stopClock, renderedAt, initial }: Props) {
  const qc = useQueryClient();
  const timeZone = useUserZone(clock);
  // The page's copy counts as read when the server rendered it, so "now" (when the answer was read)
  // is the same on the server and in the browser's first render; each refetch moves it on.
  const watch = useQuery({ ...watchQueries.trip(tripId), initialData: initial, initialDataUpdatedAt: initial ? renderedAt : undefined });
  const now = watch.dataUpdatedAt;
  const save = (w: Watch) => qc.setQueryData(watchKeys.trip(tripId), w);
  const toggle = useMutation({ mutationFn: (enabled: boolean) => setWatchEnabled(tripId, enabled), onSuccess: save });
  const follow = useMutation({ mutationFn: (following: boolean) => setWatchFollowing(tripId, following), onSuccess: save });

  if (watch.isPending) return <LoadingState label="Reading the trip watch…" />;
  if (watch.isError)
    return <ErrorState error={watch.error} title="The trip watch could not be read." onRetry={() => void watch.refetch()} />;
  const w = watch.data;
  const state = windowState(w.window, now);
  const runs = [...w.runs].sort((a, b) => Date.parse(a.ranAt) - Date.parse(b.ranAt));
  const pending = toggle.isPending || follow.isPending;

  return (
    <div className="card space-y-5 p-4 sm:p-5" data-testid="trip-watch" data-enabled={w.enabled ? 'true' : 'false'}>
      <div className="flex flex-col gap-3 sm:flex-row sm:items-start sm:justify-between">
        <p className="max-w-prose text-slate-text">
          From 16 days before you arrive until the trip ends, the watch forecasts this trip again every few hours with the latest weather
          and tells the crew when the answer changes.
        </p>
        {w.canToggle ? (
          <Switch label="Watch this trip" checked={w.enabled} disabled={pending} onChange={(v) => toggle.mutate(v)} testId="watch-toggle" />
        ) : (
          <Switch
            label="Follow by e-mail"
            checked={w.following}
            disabled={pending || !w.enabled}
            onChange={(v) => follow.mutate(v)}
            testId="watch-follow"
          />
        )}
      </div>
      {toggle.isError ? <ErrorState error={toggle.error} title="The watch could not be changed." /> : null}
      {follow.isError ? <ErrorState error={follow.error} title="Following could not be changed." /> : null}

      <Status w={w} state={state} timeZone={timeZone} stopClock={stopClock} />
      {w.notice ? <Notice w={w} tripId={tripId} runs={runs} timeZone={timeZone} /> : null}
      {runs.length > 0 ? (
        <>
          <Timeline runs={runs} timeZone={timeZone} />
          <BandChart runs={runs} timeZone={timeZone} />
        </>
      ) : null}
    </div>
  );
}

function Switch({
  label,
  checked,
  disabled,
  onChange,
  testId,
}: {
  label: string;
  checked: boolean;
  disabled: boolean;
  onChange: (v: boolean) => void;
  testId: string;
}) {
  const id = useId();
  return (
    <div className="flex shrink-0 items-center gap-3">
      <span id={id} className="font-bold">
        {label}
      </span>
      <button
        type="button"
        role="switch"
        aria-checked={checked}
        aria-labelledby={id}
        disabled={disabled}
        data-testid={testId}
        onClick={() => onChange(!checked)}
        className={`relative inline-flex h-11 min-w-[5.5rem] items-center rounded-full border-2 px-1 font-bold transition-colors ${checked ? 'border-moss-deep bg-moss-deep text-white' : 'border-[#8a7b66] bg-white text-dusk'}`}
      >
        <span
          aria-hidden="true"
          className={`absolute top-1 h-8 w-8 rounded-full shadow transition-all ${checked ? 'left-[calc(100%-2.35rem)] bg-white' : 'left-1 bg-[#8a7b66]'}`}
        />
        <span className={checked ? 'mr-auto pl-2' : 'ml-auto pr-2'}>{checked ? 'On' : 'Off'}</span>
      </button>
    </div>
  );
}

function Status({
  w,
  state,
  timeZone,
  stopClock,
}: {
  w: Watch;
  state: ReturnType<typeof windowState>;
  timeZone: ZoneClock;
  stopClock: ZoneClock;
}) {
  let text: string;
  if (!w.enabled)
    text = w.canToggle
      ? 'The watch is off for this trip. Turn it on to hear when the forecast changes.'
      : 'The watch is off for this trip; the owner or an editor can turn it on.';
  else if (state === 'before') text = startsSentence(w.window, stopClock);
  else if (state === 'after') text = `The trip ended on ${formatDay(dateIn(w.window.to, stopClock))}; the watch has stopped.`;
  else if (w.nextRunAt) text = `Next run: ${formatInstantNamed(w.nextRunAt, timeZone)}.`;
  else text = 'The watch is on; the next run is due shortly.';
  return (
    <div className="space-y-2">
      <p
        className={
          state === 'before' && w.enabled && w.runs.length === 0
            ? 'rounded-[12px] border-2 border-dashed border-sand-dark bg-card/60 px-4 py-3 font-semibold'
            : 'font-semibold'
        }
        data-testid="watch-status"
      >
        {text}
      </p>
      {w.enabled && state === 'during' && w.runs.length === 0 ? (
        <p className="text-slate-text">No runs yet: the first answer appears here after the first run.</p>
      ) : null}
      {w.lastError ? (
        <p className="caution text-sm" role="status" data-testid="watch-error">
          The last run could not finish: {w.lastError} The answer below still stands until the next run succeeds.
        </p>
      ) : null}
    </div>
  );
}

function Notice({ w, tripId, runs, timeZone }: { w: Watch; tripId: string; runs: WatchRun[]; timeZone: ZoneClock }) {
  const n = w.notice!;
  const look = VERDICT_LOOK[n.verdict];
  const run = runs.find((r) => r.forecastId === n.forecastId) ?? null;
  const cutoff = run ? formatCutoff(run) : null;
  const worse = isWorse(n.previousVerdict, n.verdict);
  return (
    <section
      className={`rounded-[14px] border-l-[6px] p-4 ${look.box}`}
      aria-labelledby="watch-notice-h"
      data-testid="watch-notice"
      data-verdict={n.verdict}
    >
      <div className="flex items-start gap-3">
        <span
          aria-hidden="true"
          className={`mt-0.5 inline-flex h-8 w-8 shrink-0 items-center justify-center rounded-full text-lg font-extrabold ${look.dot}`}
        >
          {look.mark}
        </span>
        <div className="min-w-0 space-y-1">
          <h3 id="watch-notice-h" className="text-lg">
            {n.previousVerdict && n.previousVerdict !== n.verdict
              ? `The answer changed: ${look.label.toLowerCase()}, no longer ${VERDICT_LOOK[n.previousVerdict].label.toLowerCase()}`
              : `The answer changed: ${look.label.toLowerCase()}`}
          </h3>
          <p className="text-sm text-slate-text">
            Noticed {formatInstantNamed(n.at, timeZone)}
            {worse ? ' · worse than before' : n.previousVerdict && n.previousVerdict !== n.verdict ? ' · better than before' : ''}
          </p>
          {cutoff ? (
            <p data-testid="watch-notice-cutoff">
              <strong>Cutoff:</strong> {cutoff}, local time at the stop.
            </p>
          ) : null}
          <p>{n.summary}</p>
          <p>
            <a
              className="font-bold text-ember-deep underline"
              href={`/trips/${encodeURIComponent(tripId)}/forecasts/${encodeURIComponent(n.forecastId)}`}
            >
              Open the watch forecast
            </a>
          </p>
        </div>
      </div>
    </section>
  );
}

/** Consecutive runs with the same verdict, for the timeline's labels. */
function stretches(runs: WatchRun[]): { verdict: WatchRun['verdict']; runs: WatchRun[] }[] {
  const out: { verdict: WatchRun['verdict']; runs: WatchRun[] }[] = [];
  for (const r of runs) {
    const last = out[out.length - 1];
    if (last && last.verdict === r.verdict) last.runs.push(r);
    else out.push({ verdict: r.verdict, runs: [r] });
  }
  return out;
}

function Timeline({ runs, timeZone }: { runs: WatchRun[]; timeZone: ZoneClock }) {
  const groups = stretches(runs);
  return (
    <section aria-labelledby="watch-timeline-h" data-testid="watch-timeline">
      <h3 id="watch-timeline-h" className="text-base">
        The answer, run by run
      </h3>
      <p className="text-sm text-slate-text">Times of runs in {zonePlainName(timeZone.zone)}; cutoffs in the stop&apos;s local time.</p>
      {/* The strip is the picture; the list under it says the same in words. */}
      <div aria-hidden="true" className="mt-2 flex h-9 items-center gap-[3px]">
        {runs.map((r) => {
          const look = VERDICT_LOOK[r.verdict];
          return (
            <span
              key={r.forecastId}
              title={runSentence(r, timeZone)}
              data-verdict={r.verdict}
              className={`flex h-7 min-w-[6px] flex-1 items-center justify-center overflow-hidden rounded-[6px] text-xs font-extrabold ${look.dot} ${r.changed ? 'h-9 ring-2 ring-dusk ring-offset-1' : ''}`}
            >
              {runs.length <= 24 ? look.mark : null}
            </span>
          );
        })}
      </div>
      <ol className="mt-3 space-y-1 text-sm" data-testid="watch-stretches">
        {groups.map((g) => {
          const look = VERDICT_LOOK[g.verdict];
          const first = g.runs[0]!;
          const last = g.runs[g.runs.length - 1]!;
          return (
            <li key={first.forecastId} className="flex items-start gap-2" data-verdict={g.verdict}>
              <span
                aria-hidden="true"
                className={`mt-0.5 inline-flex h-5 w-5 shrink-0 items-center justify-center rounded-full text-[0.7rem] font-extrabold ${look.dot}`}
              >
                {look.mark}
              </span>
              <span>
                <strong>{look.label}</strong>
                {g.verdict === 'runs-out' && formatCutoff(last) ? ` (cutoff ${formatCutoff(last)})` : `, lowest ${pct(last.minSocPct)}`}
                {' · '}
                {g.runs.length === 1
                  ? `1 run, ${formatInstant(first.ranAt, timeZone)}`
                  : `${g.runs.length} runs, ${formatInstant(first.ranAt, timeZone)} to ${formatInstant(last.ranAt, timeZone)}`}
                {first.changed && first.reason ? <span className="block text-slate-text">Changed: {first.reason}</span> : null}
              </span>
            </li>
          );
        })}
      </ol>
    </section>
  );
}

const DOT: Record<WatchRun['verdict'], string> = { 'makes-it': 'bg-moss-deep', 'below-reserve': 'bg-[#7a5a12]', 'runs-out': 'bg-alert' };

/** Each run as a column on a 0–100 % scale: the band as a bar, the run's own lowest as a dot (HTML, so text keeps its size on a phone). */
function BandChart({ runs, timeZone }: { runs: WatchRun[]; timeZone: ZoneClock }) {
  const sentence = bandSentence(runs);
  if (!sentence) return null;
  const clamp = (v: number) => Math.min(100, Math.max(0, v));
  const first = runs[0]!;
  const last = runs[runs.length - 1]!;
  return (
    <figure aria-labelledby="watch-band-h" data-testid="watch-band">
      <h3 id="watch-band-h" className="text-base">
        How sure, run by run
      </h3>
      <div className="mt-2 flex gap-2" role="img" aria-label={sentence}>
        <div aria-hidden="true" className="relative h-36 w-10 shrink-0 text-right text-xs text-slate-text">
          <span className="absolute right-0 top-0 -translate-y-1/2">100 %</span>
          <span className="absolute right-0 top-1/2 -translate-y-1/2">50 %</span>
          <span className="absolute bottom-0 right-0 translate-y-1/2">0 %</span>
        </div>
        <div aria-hidden="true" className="relative h-36 min-w-0 flex-1 border-b border-sand-dark">
          <div className="absolute inset-x-0 top-0 border-t border-dashed border-sand-dark" />
          <div className="absolute inset-x-0 top-1/2 border-t border-dashed border-sand-dark" />
          <div className="absolute inset-0 flex items-stretch gap-[3px]">
            {runs.map((r) => (
              <div key={r.forecastId} className="relative flex-1" title={runSentence(r, timeZone)}>
                {r.band ? (
                  <div
                    className="absolute left-1/2 w-[60%] max-w-7 min-w-[4px] -translate-x-1/2 rounded-md border border-slate bg-slate/35"
                    style={{
                      bottom: `${clamp(r.band.lowSocPct)}%`,
                      height: `max(3px, ${clamp(r.band.highSocPct) - clamp(r.band.lowSocPct)}%)`,
                    }}
                  />
                ) : null}
                <div
                  className={`absolute left-1/2 h-3 w-3 -translate-x-1/2 translate-y-1/2 rounded-full border-2 border-white ${DOT[r.verdict]}`}
                  style={{ bottom: `${clamp(r.minSocPct)}%` }}
                />
              </div>
            ))}
          </div>
        </div>
      </div>
      <div aria-hidden="true" className="ml-12 mt-2 flex justify-between text-xs text-slate-text">
        <span>{formatInstant(first.ranAt, timeZone)}</span>
        {runs.length > 1 ? <span>{formatInstant(last.ranAt, timeZone)}</span> : null}
      </div>
      <figcaption className="mt-2 text-sm text-slate-text" data-testid="watch-band-sentence">
        {sentence} Bars: the lowest state of charge across the band; dots: each run&apos;s own lowest.
      </figcaption>
    </figure>
  );
}
