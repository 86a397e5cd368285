import { useQuery } from '@tanstack/react-query';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import type { InstallerRigDto } from '../../domain/crews/crews.schema';
import { installerRigsQuery } from './installer.queries';

const CHEMISTRY: Record<string, string> = { lifepo4: 'LiFePO4', agm: 'AGM', flooded: 'flooded lead-acid', gel: 'gel' };

function bankLine(bank: InstallerRigDto['bank']): string {
  if (!bank?.capacityAh) return 'Bank not described yet';
  const v = bank.nominalVolts ? ` at ${bank.nominalVolts} V` : '';
  return `${bank.capacityAh} Ah${v} ${CHEMISTRY[bank.chemistry ?? ''] ?? bank.chemistry ?? ''}`.trim();
}

/** The /installer page: every rig a crew has shared with the signed-in installer. */
function InstallerRigs({ clock }: { clock?: ZoneClock | null }) {
  const zone = useUserZone(clock);
  const rigs = useQuery(installerRigsQuery());
  if (rigs.isPending) return <LoadingState label="Loading the rigs shared with you…" />;
  if (rigs.isError) return <ErrorState error={rigs.error} title="The rigs shared with you could not be loaded." onRetry={() => void rigs.refetch()} />;
  if (rigs.data.length === 0) {
    return (
      <EmptyState title="No rigs shared with you yet">
        <p>When a crew’s owner shares a rig with your installer e-mail, it appears here and you get an e-mail.</p>
      </EmptyState>
    );
  }
  return (
    <ul className="grid gap-4 sm:grid-cols-2" aria-label="Rigs shared with you">
      {rigs.data.map((r) => (
        <li key={r.grantId} className="card flex flex-col p-5" data-shared-rig={r.rigName}>
          <p className="text-sm font-bold uppercase tracking-wide text-slate-text">{r.crewName}</p>
          <h2 className="mt-1 text-xl"><a className="hover:underline" href={`/rigs/${encodeURIComponent(r.rigId)}`}>{r.rigName}</a></h2>
          <p className="mt-1">{bankLine(r.bank)}</p>
          <p className="text-sm text-slate-text">
            {r.loadCount} load{r.loadCount === 1 ? '' : 's'} · {r.tripCount} trip{r.tripCount === 1 ? '' : 's'}
          </p>
          <p className="mt-3 text-sm text-slate-text">Shared {r.grantedBy ? `by ${r.grantedBy} ` : ''}on {formatInstant(r.grantedAt, zone, 'date')}</p>
          <div className="mt-4"><a className="btn btn-primary" href={`/rigs/${encodeURIComponent(r.rigId)}`}>Open rig</a></div>
        </li>
      ))}
    </ul>
  );
}

export default withQueryClient(InstallerRigs);
