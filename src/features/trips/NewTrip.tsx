import { withQueryClient } from '../../components/ui/QueryProvider';
import { toUnits, type Units } from '../../lib/units';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import { TripEditor } from './TripEditor';

/** The new-trip page: the editor straight away, with the crew's rigs read by the page. */
function NewTrip({ units, rigId, rigs }: { units: Units; rigId?: string; rigs?: RigDto[] }) {
  return <TripEditor units={toUnits(units)} initialRigId={rigId} initialRigs={rigs} />;
}

export default withQueryClient(NewTrip);
