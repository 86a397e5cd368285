import { lazy, Suspense, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { toUnits, type Units } from '../../lib/units';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import type { TripDto } from '../../domain/trips/trips.schema';
import { rigsQuery } from '../rigs/rigs.queries';
import { TripSummary } from './TripSummary';
import { tripQuery } from './trips.queries';

// The editor (form library, validation schemas, place search) loads when the camper opens it.
const TripEditor = lazy(() => import('./TripEditor').then((m) => ({ default: m.TripEditor })));

interface Props {
  tripId: string;
  units: Units;
  /** The trip and the crew's rigs as the page read them on the server: the itinerary shows at once. */
  initial?: { trip: TripDto; rigs: RigDto[] };
}

/** A saved trip: its itinerary to read, and the editor on request (for those who may change it). */
function TripPlanner({ tripId, units, initial }: Props) {
  const u = toUnits(units);
  const [editing, setEditing] = useState(false);
  const trip = useQuery({ ...tripQuery(tripId), initialData: initial?.trip });
  const rigs = useQuery({ ...rigsQuery(), initialData: initial?.rigs });
  if (trip.isPending) return <LoadingState label="Loading the trip…" />;
  if (trip.isError) return <ErrorState title="Could not load this trip." error={trip.error} onRetry={() => void trip.refetch()} />;
  const summary = (opening: boolean) => (
    <TripSummary trip={trip.data} rigs={rigs.data} units={u} onEdit={trip.data.canEdit ? () => setEditing(true) : undefined} editorLoading={opening} />
  );
  if (!editing) return summary(false);
  // Keyed by id only: a background refetch must not wipe edits in progress (saves handle versions).
  return (
    <Suspense fallback={summary(true)}>
      <TripEditor key={trip.data.id} trip={trip.data} units={u} initialRigs={rigs.data} onClose={() => setEditing(false)} />
    </Suspense>
  );
}

export default withQueryClient(TripPlanner, { fallback: (p: Props) => (p.initial ? undefined : loadingFallback('Loading the trip…')) });
