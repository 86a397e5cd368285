import { withQueryClient } from '../../components/ui/QueryProvider';
import { RigEditor } from './RigEditor';

/** The new-rig island: an empty power-system form that creates the rig. */
function NewRig() {
  return <RigEditor />;
}

export default withQueryClient(NewRig);
