import { useEffect, useState } from 'react';
import { apiFetch } from '../../lib/query-client';
import { QUICK_PLAN_STORAGE_KEY, readStoredQuickPlan } from '../../domain/quick-plan/quick-plan';
import { ErrorState, LoadingState } from '../../components/ui/States';

type State = { kind: 'saving' } | { kind: 'none' } | { kind: 'error'; error: unknown };

/** After sign-up: saves the quick plan kept in this tab as the camper's first rig and trip, then opens the trip. */
export default function KeepPlan() {
  const [state, setState] = useState<State>({ kind: 'saving' });
  const save = () => {
    const plan = readStoredQuickPlan();
    if (!plan) return setState({ kind: 'none' });
    setState({ kind: 'saving' });
    apiFetch<{ rigId: string; tripId: string }>('/api/quick-plan/keep', { method: 'POST', json: plan })
      .then(({ tripId }) => {
        sessionStorage.removeItem(QUICK_PLAN_STORAGE_KEY);
        window.location.replace(`/trips/${encodeURIComponent(tripId)}?created=1#forecasts`);
      })
      .catch((error: unknown) => setState({ kind: 'error', error }));
  };
  useEffect(save, []);

  if (state.kind === 'saving') return <LoadingState label="Saving your quick plan as your first rig and trip…" />;
  if (state.kind === 'error') return <ErrorState error={state.error} title="Your quick plan could not be saved." onRetry={save} />;
  return (
    <div className="space-y-3">
      <p>There is no quick plan waiting in this browser tab. You can describe your rig from scratch instead.</p>
      <p className="flex flex-wrap gap-2">
        <a className="btn btn-primary" href="/rigs">Describe my rig</a>
        <a className="btn btn-quiet" href="/#quick-plan">Make a quick plan</a>
      </p>
    </div>
  );
}
