import { useQuery } from '@tanstack/react-query';
import { describeDeletion, RESTORE_DAYS } from '../../domain/shared/deletion';
import { deletedKeys, fetchDeletionCounts } from './deleted.api';

/**
 * The question before a rig or trip is deleted, naming what goes with it ("2 trips, 5 saved forecasts,
 * 3 check-ins", counted when the question opens) and where to get it back.
 */
export function DeletionQuestion({ kind, id, name }: { kind: 'rig' | 'trip'; id: string; name: string }) {
  const counts = useQuery({ queryKey: deletedKeys.counts(kind, id), queryFn: () => fetchDeletionCounts(kind, id), staleTime: 0 });
  const where = kind === 'rig' ? 'Rigs' : 'Trips';
  const goes = counts.data
    ? `With it go ${describeDeletion(counts.data)}.`
    : counts.isError
      ? kind === 'rig'
        ? 'With it go its loads, trips, saved forecasts and check-ins.'
        : 'With it go its saved forecasts and check-ins.'
      : 'Counting what goes with it…';
  return (
    <span data-deletion-question>
      Delete {name}? {goes} A crew owner can restore it under “Recently deleted” on the {where} page for {RESTORE_DAYS} days.
    </span>
  );
}
