import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { runTripForecast } from '../trip-forecasts/trip-forecasts.api';
import { ApiError } from '../../lib/query-client';
import ForecastView from './ForecastView';
import { forecastQueries } from './forecast.queries';
import { savedForecastFromJson, type SavedForecast } from './forecast.api';
import { readPageText, type PageTextRef } from './page-text';
import { useDelayed } from './useWidth';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import type { Units } from '../../lib/units';
import { useUserZone } from '../../components/ui/useUserZone';
import { formatInstant, type ZoneClock } from '../../lib/clock';

export interface ForecastFromApiProps {
  /** The saved forecast's id. */
  id: string;
  /** Show the forecast's name and who saved it above the verdict. */
  showMeta?: boolean;
  /** The forecast as the page read it on the server: rendered at once, no loading state. */
  initial?: SavedForecast;
  /** The same as one string (`savedForecastToJson`: hours as columns). */
  initialJson?: string;
  /** The same string as the forecast page hands it: beside the island, not as a prop (page-text.ts). */
  pageText?: PageTextRef;
  /** The engine's revision now (the page passes it, so this island does not load the engine). */
  currentEngineRevision?: number;
  /** Whether the user may run the trip's forecast again (not a viewer or an installer). */
  canRun?: boolean;
  /** The reader's units setting (°C or °F in the table, warnings, advice and CSV). */
  units?: Units;
  /** The signed-in user's zone for when the forecast was saved (null until known). */
  clock?: ZoneClock | null;
}

/** A saved forecast loaded by id, with loading and error states — never a blank chart. */
export default function ForecastFromApi(props: ForecastFromApiProps) {
  const { initialJson, initial: given, pageText, id } = props;
  const initial = useMemo(() => {
    if (given) return given;
    const text = initialJson ?? readPageText(pageText, id);
    return text ? savedForecastFromJson(text) : undefined;
  }, [given, initialJson, pageText, id]);
  return (
    <IslandQueryProvider>
      <Loaded {...props} initial={initial} />
    </IslandQueryProvider>
  );
}

/**
 * An old snapshot says which engine revision made it and offers to run the trip's current plan
 * again (a new saved forecast); the old one keeps its numbers.
 */
function OlderRevision({ saved, current, canRun }: { saved: SavedForecast; current: number; canRun: boolean }) {
  const [state, setState] = useState<{ busy: boolean; error: string | null }>({ busy: false, error: null });
  const made = saved.forecast.engineRevision ?? saved.engineRevision ?? 1;
  const run = async () => {
    setState({ busy: true, error: null });
    try {
      const created = await runTripForecast(saved.tripId);
      window.location.assign(`/trips/${encodeURIComponent(saved.tripId)}/forecasts/${encodeURIComponent(created.id)}`);
    } catch (e) {
      setState({ busy: false, error: e instanceof Error ? e.message : 'The forecast could not be run again.' });
    }
  };
  return (
    <div className="caution no-print" role="note" data-testid="engine-revision-note">
      <p className="font-bold">Made by forecast engine revision {made}; the engine is now at revision {current}.</p>
      <p className="mt-1 text-sm">
        This snapshot keeps the numbers it was saved with. Revision {current} is more careful in the cold: charge the cold locks away is not counted as usable, a fridge in a heated cabin follows the cabin, and surges can trip a low-voltage cutoff — so a cold trip may come out worse.
        {canRun ? ' Run it again to forecast the trip’s current rig, loads and stops with today’s engine; this one stays as it is.' : ' Someone who can edit the trip can run it again.'}
      </p>
      {canRun ? (
        <button type="button" className="btn btn-primary mt-3" onClick={() => void run()} disabled={state.busy} data-testid="run-again">
          {state.busy ? 'Running…' : 'Run again'}
        </button>
      ) : null}
      {state.error ? (
        <p role="alert" className="mt-2 text-sm font-bold text-alert">
          {state.error}
        </p>
      ) : null}
    </div>
  );
}

function Loaded({ id, showMeta = true, initial, currentEngineRevision, canRun = false, clock, units }: ForecastFromApiProps) {
  const zone = useUserZone(clock);
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
          <span className="font-bold text-dusk">{f.name}</span> · saved <time dateTime={f.createdAt}>{formatInstant(f.createdAt, zone)}</time>
          {f.createdBy ? ` by ${f.createdBy.name}` : ''} · a snapshot: later changes to the rig or loads do not change it.
        </p>
      ) : null}
      {currentEngineRevision !== undefined && (f.forecast.engineRevision ?? f.engineRevision ?? 1) < currentEngineRevision ? (
        <OlderRevision saved={f} current={currentEngineRevision} canRun={canRun} />
      ) : null}
      <ForecastView forecast={f.forecast} plan={f.plan} reserveSocPct={f.reserveSocPct} forecastId={f.id} name={f.name} units={units} />
    </div>
  );
}
