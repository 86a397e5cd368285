import { useQuery } from '@tanstack/react-query';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { rigsQuery } from '../rigs/rigs.queries';
import { tripsQuery } from './trips.queries';
import { describeSpan } from '../../domain/trips/trip-form';

/** The crew's trips as cards: dates, stops in order, the rig. */
function TripList() {
  const trips = useQuery(tripsQuery());
  const rigs = useQuery(rigsQuery());
  if (trips.isPending) return <LoadingState label="Loading your trips…" />;
  if (trips.isError) return <ErrorState title="Could not load your trips." error={trips.error} onRetry={() => void trips.refetch()} />;
  if (trips.data.length === 0) {
    const noRig = rigs.data?.length === 0;
    return (
      <EmptyState title="No trips yet">
        <p>A trip is your stops in order — where, when, for how many nights, and the weather you expect — with the days you drive between them.</p>
        {noRig ? (
          <p className="mt-2">Trips run on a rig: <a className="font-bold underline" href="/rigs/new">describe your rig first</a>.</p>
        ) : (
          <a href="/trips/new" className="btn btn-primary mt-4">New trip</a>
        )}
      </EmptyState>
    );
  }
  const rigName = (id: string) => rigs.data?.find((r) => r.id === id)?.name;
  return (
    <ul className="grid gap-3 sm:grid-cols-2" aria-label="Trips">
      {trips.data.map((t) => (
        <li key={t.id}>
          <a href={`/trips/${encodeURIComponent(t.id)}`} className="card block h-full p-4 transition-shadow hover:shadow-lg">
            <span className="block text-lg font-extrabold">{t.name}</span>
            <span className="mt-1 block font-semibold">{describeSpan(t.stops)}</span>
            <span className="mt-1 block text-sm text-slate-text">
              {t.stops.map((s) => s.name).join(' → ')}
              {t.drives.length ? ` · ${t.drives.length} drive ${t.drives.length === 1 ? 'day' : 'days'}` : ''}
              {rigName(t.rigId) ? ` · ${rigName(t.rigId)}` : ''}
            </span>
          </a>
        </li>
      ))}
    </ul>
  );
}

export default withQueryClient(TripList, { fallback: loadingFallback('Loading your trips…') });
