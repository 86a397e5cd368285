import { useQuery } from '@tanstack/react-query';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { plural, rigSummary } from '../../lib/format';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';
import { rigsQuery } from './rigs.queries';

/** The crew's rigs as cards, each with its bank and solar in one line. */
function RigList({ clock }: { clock?: ZoneClock | null }) {
  const zone = useUserZone(clock);
  const rigs = useQuery(rigsQuery());
  if (rigs.isPending) return <LoadingState label="Loading your rigs…" />;
  if (rigs.isError) return <ErrorState title="Could not load your rigs." error={rigs.error} onRetry={() => void rigs.refetch()} />;
  if (rigs.data.length === 0) {
    return (
      <EmptyState title="No rigs yet">
        <p>A rig is one vehicle’s power system: its battery bank, panels, chargers and inverter. Describe yours to start forecasting.</p>
        <a href="/rigs/new" className="btn btn-primary mt-4">New rig</a>
      </EmptyState>
    );
  }
  return (
    <ul className="grid gap-3 sm:grid-cols-2" aria-label="Rigs">
      {rigs.data.map((r) => (
        <li key={r.id}>
          <a href={`/rigs/${encodeURIComponent(r.id)}`} className="card block h-full p-4 transition-shadow hover:shadow-lg">
            <span className="block text-lg font-extrabold">{r.name}</span>
            <span className="mt-1 block font-semibold">{rigSummary(r)}</span>
            <span className="mt-1 block text-sm text-slate-text">
              {r.chargers.length ? plural(r.chargers.length, 'charger') : 'no other chargers'} · {r.inverter ? 'inverter' : 'no inverter'} · updated {formatInstant(r.updatedAt, zone, 'day')}
            </span>
          </a>
        </li>
      ))}
    </ul>
  );
}

export default withQueryClient(RigList, { fallback: loadingFallback('Loading your rigs…') });
