import { useQuery } from '@tanstack/react-query';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { toUnits, type Units } from '../../lib/units';
import { TripEditor } from './TripEditor';
import { tripQuery } from './trips.queries';

/** The trip planner island: a new trip (no id) or a saved one, loaded first. */
function TripPlanner({ tripId, units, rigId }: { tripId?: string; units: Units; rigId?: string }) {
  const u = toUnits(units);
  const trip = useQuery({ ...tripQuery(tripId ?? ''), enabled: Boolean(tripId) });
  if (!tripId) return <TripEditor units={u} initialRigId={rigId} />;
  if (trip.isPending) return <LoadingState label="Loading the trip…" />;
  if (trip.isError) return <ErrorState title="Could not load this trip." error={trip.error} onRetry={() => void trip.refetch()} />;
  // Keyed by id only: a background refetch must not wipe edits in progress (saves handle versions).
  return <TripEditor key={trip.data.id} trip={trip.data} units={u} />;
}

export default withQueryClient(TripPlanner, { fallback: loadingFallback('Loading the trip…') });
