import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import { ErrorState } from '../../components/ui/States';
import { apiFetch } from '../../lib/query-client';
import { formatDay } from '../../lib/format';

// Development only (/dev): turn the local fake's weather, and run one watch tick now.

interface Turn {
  mode: 'normal' | 'storm';
  from: string | null;
}

interface TickResult {
  ran: number;
  changed: number;
  mailed: number;
}

interface Props {
  /** The fake's weather as the page read it, or null when it could not (the island says why). */
  initial: Turn | null;
  /** Why the weather cannot be turned (not the local fake, or it did not answer), or null. */
  problem: string | null;
}

export default function DevWatchControls(props: Props) {
  return (
    <IslandQueryProvider>
      <Inner {...props} />
    </IslandQueryProvider>
  );
}

const key = ['dev-weather'] as const;

function count(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}

function Inner({ initial, problem }: Props) {
  const qc = useQueryClient();
  const weather = useQuery({
    queryKey: key,
    queryFn: ({ signal }) => apiFetch<Turn>('/api/dev/weather', { signal }),
    initialData: initial ?? undefined,
    enabled: problem === null,
  });
  const [from, setFrom] = useState('');
  const turn = useMutation({
    mutationFn: (mode: Turn['mode']) =>
      apiFetch<Turn>('/api/dev/weather', { method: 'POST', json: mode === 'storm' && from ? { mode, from } : { mode } }),
    onSuccess: (t) => qc.setQueryData(key, t),
  });
  // Every watched trip due now, then one tick: the watch runs at once instead of after its interval.
  const tick = useMutation({
    mutationFn: async () => {
      await apiFetch<{ due: number }>('/api/dev/watch/due', { method: 'POST', json: {} });
      return apiFetch<TickResult>('/api/dev/watch/tick', { method: 'POST', json: {} });
    },
  });
  const now = weather.data;

  return (
    <div className="space-y-6">
      <section className="card space-y-3 p-4" aria-labelledby="dev-weather-h">
        <h2 id="dev-weather-h" className="text-lg">
          Weather
        </h2>
        {problem ? (
          <p className="caution" role="status">
            {problem}
          </p>
        ) : (
          <>
            <p data-testid="dev-weather-now" role="status" aria-live="polite">
              {now === undefined
                ? 'Reading the local fake weather service…'
                : now.mode === 'storm'
                  ? `The local fake weather service forecasts a storm${now.from ? ` from ${formatDay(now.from)}` : ' on every day'}: overcast, dim and cold.`
                  : 'The local fake weather service forecasts its normal weather.'}
            </p>
            <div className="flex flex-wrap items-end gap-2">
              <div>
                <label htmlFor="storm-from" className="field-label">
                  Storm from (leave empty for every day)
                </label>
                <input id="storm-from" type="date" className="field-input" value={from} onChange={(e) => setFrom(e.target.value)} />
              </div>
              <button type="button" className="btn btn-primary" disabled={turn.isPending} onClick={() => turn.mutate('storm')}>
                Turn the weather
              </button>
              <button
                type="button"
                className="btn btn-quiet"
                disabled={turn.isPending || now?.mode === 'normal'}
                onClick={() => turn.mutate('normal')}
              >
                Back to normal
              </button>
            </div>
            <p className="field-hint">
              Only forecasts change; past years stay as they were. Run the watch next to see what the crew would be told.
            </p>
            {turn.isError ? <ErrorState error={turn.error} title="The weather could not be turned." /> : null}
          </>
        )}
      </section>

      <section className="card space-y-3 p-4" aria-labelledby="dev-watch-h">
        <h2 id="dev-watch-h" className="text-lg">
          Trip watch
        </h2>
        <p>
          Runs the watch once now, as the server does every few hours: each watched trip inside its window is forecast again with the latest
          weather, whenever it last ran. E-mails still go at most once per person per 12 hours.
        </p>
        <button type="button" className="btn btn-primary" disabled={tick.isPending} onClick={() => tick.mutate()}>
          {tick.isPending ? 'Running the watch…' : 'Run the watch now'}
        </button>
        {tick.data ? (
          <p role="status" data-testid="dev-tick-result">
            Forecast {count(tick.data.ran, 'trip', 'trips')} again; {count(tick.data.changed, 'answer', 'answers')} changed;{' '}
            {count(tick.data.mailed, 'e-mail', 'e-mails')} sent.{' '}
            <a className="font-bold text-ember-deep underline" href="/dev/mail">
              Read the caught mail
            </a>
          </p>
        ) : null}
        {tick.isError ? <ErrorState error={tick.error} title="The watch could not run." /> : null}
      </section>
    </div>
  );
}
