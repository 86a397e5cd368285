import { withQueryClient } from '../../components/ui/QueryProvider';
import { RigEditor } from './RigEditor';
import type { Units } from '../../lib/units';

/** The new-rig island: an empty power-system form that creates the rig. */
function NewRig({ units }: { units?: Units }) {
  return <RigEditor units={units} />;
}

export default withQueryClient(NewRig);
