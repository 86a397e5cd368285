import { useEffect, useState } from 'react';
import { useSeen } from '../../components/ui/useSeen';
import type { Forecast, ResolvedPlan } from '../../engine';
import type { Advice } from '../../domain/advice/advice';
import { CAUTIONS } from '../../domain/advice/cautions';
import type { Units } from '../../lib/units';
import { whPerDay } from '../../lib/format';
import { useDelayed } from './useWidth';

type State = { status: 'working' } | { status: 'done'; advice: Advice } | { status: 'error' };

/** The two or three changes that matter most, where the energy goes, and the warnings with their cautions. */
export default function AdvicePanel({ forecast, plan, reserveSocPct, now = false, units = 'metric' }: { forecast: Forecast; plan: ResolvedPlan; reserveSocPct?: number | null; now?: boolean; units?: Units }) {
  const [state, setState] = useState<State>({ status: 'working' });
  const slow = useDelayed(state.status === 'working');
  // Advice reruns the engine a few times (the engine's code loads for it): only once the panel is in view.
  const { ref, seen } = useSeen<HTMLElement>(now);

  useEffect(() => {
    if (!seen) return;
    let gone = false;
    setState({ status: 'working' });
    import('../../domain/advice/advice')
      .then(({ advise }) => {
        if (!gone) setState({ status: 'done', advice: advise(plan, forecast, reserveSocPct, units) });
      })
      .catch(() => {
        if (!gone) setState({ status: 'error' });
      });
    return () => {
      gone = true;
    };
  }, [seen, forecast, plan, reserveSocPct, units]);

  return (
    <section ref={ref} aria-labelledby="advice-heading" className="card p-4 sm:p-5" data-testid="advice" data-pending={state.status === 'working' ? '' : undefined}>
      <h2 id="advice-heading" className="text-xl">Advice</h2>
      <p className="text-sm text-slate-text">What would change the answer most — each effect worked out by running the forecast again. All figures are estimates.</p>
      {state.status === 'working' ? (
        slow ? (
          <p role="status" className="mt-3 flex items-center gap-2 text-slate-text">
            <span aria-hidden="true" className="inline-block h-4 w-4 animate-spin rounded-full border-[3px] border-sand-dark border-t-ember" />
            Working out the advice…
          </p>
        ) : (
          <div className="mt-3 h-16" aria-hidden="true" />
        )
      ) : state.status === 'error' ? (
        <p role="alert" className="caution mt-3">The advice could not be worked out for this plan. The forecast above still stands.</p>
      ) : (
        <AdviceBody advice={state.advice} />
      )}
      <p className="caution mt-4 text-sm">{CAUTIONS.estimate}</p>
    </section>
  );
}

function AdviceBody({ advice }: { advice: Advice }) {
  return (
    <>
      {advice.changes.length > 0 ? (
        <ol className="mt-3 space-y-3" data-testid="advice-changes">
          {advice.changes.map((c) => (
            <li key={c.kind + c.title} className="rounded-xl border border-sand-dark bg-white/70 p-3" data-kind={c.kind}>
              <p className="font-extrabold">{c.title}</p>
              <p className={c.fixes ? 'text-moss-deep' : 'text-dusk'}>{c.effect}</p>
              <p className="text-sm text-slate-text">{c.detail}</p>
              {c.caution ? <p className="caution mt-2 text-sm"><strong>Caution:</strong> {c.caution}</p> : null}
            </li>
          ))}
        </ol>
      ) : (
        <p className="mt-3">No single change stands out for this plan.</p>
      )}

      {advice.cold ? (
        <div className="mt-5" data-testid="advice-cold">
          <h3 className="text-base">In the cold</h3>
          <p className="font-bold">{advice.cold.alone}</p>
          <ol className="mt-2 space-y-3">
            {advice.cold.fixes.map((c) => (
              <li key={c.kind} className="rounded-xl border border-sand-dark bg-white/70 p-3" data-kind={c.kind} data-fixes={c.fixes ? 'yes' : 'no'}>
                <p className="font-extrabold">{c.title}{c.fixes ? <span className="ml-2 rounded-full bg-moss/15 px-2 py-0.5 text-xs font-bold text-moss-deep">makes the trip alone</span> : null}</p>
                <p className={c.fixes ? 'text-moss-deep' : 'text-dusk'}>{c.effect}</p>
                <p className="text-sm text-slate-text">{c.detail}</p>
                {c.caution ? <p className="caution mt-2 text-sm"><strong>Caution:</strong> {c.caution}</p> : null}
              </li>
            ))}
          </ol>
        </div>
      ) : null}

      {advice.topLoads.length > 0 ? (
        <div className="mt-5">
          <h3 className="text-base">Where the energy goes</h3>
          <p className="text-sm text-slate-text">About {whPerDay(advice.totalWhPerDay)} from all loads (estimate).</p>
          <ul className="mt-2 space-y-2" data-testid="top-loads">
            {advice.topLoads.map((l) => (
              <li key={l.name}>
                <div className="flex justify-between gap-2 text-sm">
                  <span className="font-bold">{l.name}</span>
                  <span className="tabular-nums">{whPerDay(l.whPerDay)} · {Math.round(l.sharePct)} %</span>
                </div>
                <div className="mt-1 h-2 rounded-full bg-sand" aria-hidden="true">
                  <div className="h-2 rounded-full bg-slate" style={{ width: `${Math.min(100, Math.max(2, l.sharePct))}%` }} />
                </div>
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      {advice.warnings.length > 0 ? (
        <div className="mt-5">
          <h3 className="text-base">Warnings</h3>
          <ul className="mt-2 space-y-2" data-testid="advice-warnings">
            {advice.warnings.map((w) => (
              <li key={w.code + w.message} className="rounded-xl border border-sand-dark bg-white/70 p-3">
                <p className="font-bold">{w.title}</p>
                <p className="text-sm">{w.message}</p>
                {w.caution ? <p className="caution mt-2 text-sm"><strong>Caution:</strong> {w.caution}</p> : null}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </>
  );
}
