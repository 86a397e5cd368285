import { useQuery } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { rigSummary } from '../../lib/format';
import { rigQuery } from './rigs.queries';

function HeaderView({ name, summary }: { name: string; summary: string }) {
  return (
    <div>
      <p className="text-sm font-bold"><a href="/rigs" className="text-slate-text underline-offset-2 hover:underline">← Rigs</a></p>
      <h1 className="text-2xl sm:text-3xl">{name}</h1>
      <p className="mt-1 min-h-[1.6em] font-semibold text-slate-text">{summary}</p>
    </div>
  );
}

/** The rig page's heading: its name and bank summary, kept current as the rig is saved. */
function RigHeader({ rigId }: { rigId: string }) {
  const rig = useQuery(rigQuery(rigId));
  return <HeaderView name={rig.data?.name ?? (rig.isError ? 'Rig not found' : 'Rig')} summary={rig.data ? rigSummary(rig.data) : ''} />;
}

export default withQueryClient(RigHeader, { fallback: <HeaderView name="Rig" summary="" /> });
