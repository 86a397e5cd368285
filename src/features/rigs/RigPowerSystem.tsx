import { useQuery } from '@tanstack/react-query';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { RigEditor } from './RigEditor';
import { rigQuery } from './rigs.queries';
import type { Units } from '../../lib/units';

/** The Power system section of a rig: loads the rig, then its editor. */
function RigPowerSystem({ rigId, units }: { rigId: string; units?: Units }) {
  const rig = useQuery(rigQuery(rigId));
  if (rig.isPending) return <LoadingState label="Loading the power system…" />;
  if (rig.isError) return <ErrorState title="Could not load this rig." error={rig.error} onRetry={() => void rig.refetch()} />;
  // Keyed by id only: a background refetch must not wipe edits in progress (saves handle versions).
  return <RigEditor key={rig.data.id} rig={rig.data} units={units} />;
}

export default withQueryClient(RigPowerSystem, { fallback: loadingFallback('Loading the power system…') });
