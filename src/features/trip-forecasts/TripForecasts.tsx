import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ApiError } from '../../lib/query-client';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import { useDelayed } from '../forecast/useWidth';
import { formatRowTime } from '../../lib/format';
import { forecastKeys } from '../forecast/forecast.queries';
import { deleteSavedForecast, runTripForecast, type ForecastListItem } from './trip-forecasts.api';
import { tripForecastKeys, tripForecastQueries } from './trip-forecasts.queries';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import { useUserZone } from '../../components/ui/useUserZone';
import { formatInstant, type ZoneClock } from '../../lib/clock';

interface Props {
  tripId: string;
  canEdit: boolean;
  /** The list as the page read it on the server. */
  initial?: ForecastListItem[];
  /** The signed-in user's zone for when each forecast was saved (null until known). */
  clock?: ZoneClock | null;
}

/** A trip's saved forecasts: run a new one, open, compare two, delete. */
export default function TripForecasts(props: Props) {
  return (
    <IslandQueryProvider>
      <Inner {...props} />
    </IslandQueryProvider>
  );
}

function Inner({ tripId, canEdit, initial, clock }: Props) {
  const zone = useUserZone(clock);
  const qc = useQueryClient();
  const list = useQuery({ ...tripForecastQueries.list(tripId), initialData: initial });
  const [name, setName] = useState('');
  const [picked, setPicked] = useState<string[]>([]);
  const [pickA, pickB] = picked;
  const pickedPair = picked.length === 2 && pickA !== undefined && pickB !== undefined ? ([pickA, pickB] as const) : null;
  const run = useMutation({
    mutationFn: () => runTripForecast(tripId, name.trim() || undefined),
    onSuccess: (saved) => {
      qc.setQueryData(forecastKeys.detail(saved.id), saved);
      qc.invalidateQueries({ queryKey: tripForecastKeys.list(tripId) });
      window.location.assign(`/trips/${encodeURIComponent(tripId)}/forecasts/${encodeURIComponent(saved.id)}`);
    },
  });
  const remove = useMutation({
    mutationFn: (id: string) => deleteSavedForecast(id),
    onSuccess: (_v, id) => {
      setPicked((p) => p.filter((x) => x !== id));
      qc.invalidateQueries({ queryKey: tripForecastKeys.list(tripId) });
    },
  });
  const slow = useDelayed(run.isPending);
  const toggle = (id: string) => setPicked((p) => (p.includes(id) ? p.filter((x) => x !== id) : [...p.slice(-1), id]));

  return (
    <div className="space-y-4">
      {canEdit ? (
        <form
          className="card flex flex-col gap-3 p-4 sm:flex-row sm:items-end"
          onSubmit={(e) => {
            e.preventDefault();
            run.mutate();
          }}
        >
          <div className="flex-1">
            <label htmlFor="forecast-name" className="field-label">Name this forecast (optional)</label>
            <input id="forecast-name" className="field-input" maxLength={100} placeholder="e.g. Before the second panel" value={name} onChange={(e) => setName(e.target.value)} />
          </div>
          <button type="submit" className="btn btn-primary" disabled={run.isPending}>
            {run.isPending ? 'Forecasting…' : 'Run a forecast'}
          </button>
        </form>
      ) : null}
      {run.isPending && slow ? <LoadingState label="Stepping through the trip hour by hour…" /> : null}
      {run.isError ? <ErrorState error={run.error} title="The forecast could not run." /> : null}
      {run.error instanceof ApiError && run.error.issues.length ? (
        <ul className="caution list-inside list-disc text-sm">
          {run.error.issues.slice(0, 6).map((i) => (
            <li key={i.path + i.message}><strong>{i.path}</strong>: {i.message}</li>
          ))}
        </ul>
      ) : null}

      {list.isPending ? <LoadingState label="Loading saved forecasts…" /> : null}
      {list.isError ? <ErrorState error={list.error} title="Couldn't load the saved forecasts." onRetry={() => list.refetch()} /> : null}
      {list.data && list.data.length === 0 ? (
        <EmptyState title="No saved forecasts yet">
          {canEdit ? 'Run a forecast to see, hour by hour, whether the bank carries you through this trip.' : 'When someone in your crew runs a forecast of this trip, it shows here.'}
        </EmptyState>
      ) : null}
      {list.data && list.data.length > 0 ? (
        <>
          <ul className="space-y-2" aria-label="Saved forecasts">
            {list.data.map((f) => (
              <ForecastRow key={f.id} f={f} tripId={tripId} zone={zone} canEdit={canEdit} picked={picked.includes(f.id)} onPick={() => toggle(f.id)} onDelete={() => remove.mutate(f.id)} deleting={remove.isPending && remove.variables === f.id} />
            ))}
          </ul>
          {remove.isError ? <ErrorState error={remove.error} title="Couldn't delete that forecast." /> : null}
          {list.data.length > 1 ? (
            <div className="flex flex-wrap items-center gap-3">
              <a
                className={`btn ${pickedPair ? 'btn-primary' : 'btn-quiet pointer-events-none opacity-60'}`}
                aria-disabled={!pickedPair}
                href={pickedPair ? `/trips/${encodeURIComponent(tripId)}/compare?a=${encodeURIComponent(pickedPair[0])}&b=${encodeURIComponent(pickedPair[1])}` : undefined}
              >
                Compare the two picked
              </a>
              <span className="text-sm text-slate-text">{picked.length === 2 ? 'Ready to compare.' : `Pick two forecasts to compare (${picked.length} of 2).`}</span>
            </div>
          ) : null}
        </>
      ) : null}
    </div>
  );
}

function ForecastRow({ f, tripId, canEdit, picked, onPick, onDelete, deleting, zone }: { f: ForecastListItem; tripId: string; zone: ZoneClock; canEdit: boolean; picked: boolean; onPick: () => void; onDelete: () => void; deleting: boolean }) {
  const s = f.summary;
  const reserve = f.reserveSocPct ?? s.floorSocPct;
  const outcome = s.firstCutoffAt
    ? { text: `Runs out ${formatRowTime(s.firstCutoffAt)}`, cls: 'bg-ember-deep text-white' }
    : s.minSocPct < reserve
      ? { text: `Dips below reserve: lowest ${Math.round(s.minSocPct)} %`, cls: 'bg-sun text-dusk' }
      : { text: `Makes it: lowest ${Math.round(s.minSocPct)} %`, cls: 'bg-moss-deep text-white' };
  return (
    <li className={`card flex flex-col gap-2 p-3 sm:flex-row sm:items-center ${picked ? 'ring-2 ring-ember' : ''}`}>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="h-5 w-5 accent-ember" checked={picked} onChange={onPick} aria-label={`Pick ${f.name} to compare`} />
      </label>
      <div className="min-w-0 flex-1">
        <a className="font-bold text-dusk underline decoration-sand-dark underline-offset-4 hover:decoration-ember" href={`/trips/${encodeURIComponent(tripId)}/forecasts/${encodeURIComponent(f.id)}`}>{f.name}</a>
        <p className="text-sm text-slate-text">
          <time dateTime={f.createdAt}>{formatInstant(f.createdAt, zone)}</time>
          {f.createdBy ? ` · by ${f.createdBy.name}` : ''}
        </p>
      </div>
      <span className={`self-start rounded-full px-3 py-1 text-sm font-bold sm:self-center ${outcome.cls}`}>{outcome.text}</span>
      {canEdit ? (
        <AskFirst buttonClassName="btn btn-quiet text-sm" label={deleting ? 'Deleting…' : 'Delete'} ariaLabel={`Delete the saved forecast ${f.name}`} question={`Delete the saved forecast “${f.name}”?`} confirmLabel="Delete" onConfirm={onDelete} busy={deleting} />
      ) : null}
    </li>
  );
}
