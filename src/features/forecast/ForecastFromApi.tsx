import { useQuery } from '@tanstack/react-query';
import { ApiError } from '../../lib/query-client';
import ForecastView from './ForecastView';
import { forecastQueries } from './forecast.queries';
import type { SavedForecast } from './forecast.api';
import { useDelayed } from './useWidth';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';

export interface ForecastFromApiProps {
  /** The saved forecast's id. */
  id: string;
  /** Show the forecast's name and who saved it above the verdict. */
  showMeta?: boolean;
  /** The forecast as the page read it on the server: rendered at once, no loading state. */
  initial?: SavedForecast;
}

/** A saved forecast loaded by id, with loading and error states — never a blank chart. */
export default function ForecastFromApi(props: ForecastFromApiProps) {
  return (
    <IslandQueryProvider>
      <Loaded {...props} />
    </IslandQueryProvider>
  );
}

function Loaded({ id, showMeta = true, initial }: ForecastFromApiProps) {
  const q = useQuery({ ...forecastQueries.detail(id), initialData: initial });
  const slow = useDelayed(q.isPending);

  if (q.isPending) {
    return (
      <div className="space-y-4" aria-busy="true" data-testid="forecast-loading">
        <div className="rounded-[14px] border-l-[6px] border-sand-dark bg-card p-5">
          <p role="status" className="flex items-center gap-2 text-slate-text">
            {slow ? <span aria-hidden="true" className="inline-block h-4 w-4 animate-spin rounded-full border-[3px] border-sand-dark border-t-ember" /> : null}
            Loading the forecast…
          </p>
        </div>
        <div className="card h-72 animate-pulse" aria-hidden="true" />
      </div>
    );
  }

  if (q.isError) {
    const notFound = q.error instanceof ApiError && q.error.status === 404;
    return (
      <div role="alert" className="caution" data-testid="forecast-error">
        <p className="font-bold">{notFound ? 'This forecast was not found.' : 'Couldn’t load this forecast — try again.'}</p>
        <p className="mt-1 text-sm">
          {notFound ? 'It may have been deleted, or it belongs to a crew you are not in.' : q.error instanceof Error ? q.error.message : 'Something went wrong.'}
        </p>
        {!notFound ? (
          <button type="button" className="btn btn-quiet mt-3" onClick={() => q.refetch()} disabled={q.isFetching}>
            {q.isFetching ? 'Trying again…' : 'Try again'}
          </button>
        ) : null}
      </div>
    );
  }

  const f = q.data;
  return (
    <div className="space-y-4">
      {showMeta ? (
        <p className="text-sm text-slate-text">
          <span className="font-bold text-dusk">{f.name}</span> · saved {f.createdAt.slice(0, 10)}
          {f.createdBy ? ` by ${f.createdBy.name}` : ''} · a snapshot: later changes to the rig or loads do not change it.
        </p>
      ) : null}
      <ForecastView forecast={f.forecast} plan={f.plan} reserveSocPct={f.reserveSocPct} forecastId={f.id} name={f.name} />
    </div>
  );
}
