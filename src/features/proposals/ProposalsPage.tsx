import { useQuery } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { formatMoney } from '../../lib/format';
import type { ProposalListItem } from '../../domain/proposals/proposals.schema';
import { formatRowTime } from '../../lib/format';
import PriceListForm from './PriceListForm';
import { STATUS_LOOK } from './status';
import { proposalQueries } from './proposals.queries';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';

const outcome = (s: ProposalListItem['before']) => (s.firstCutoffAt ? `runs out ${formatRowTime(s.firstCutoffAt)}` : `lowest ${Math.round(s.minSocPct)} %`);

/** /proposals: an installer's proposals and price list, or the proposals sent to the user's crews. */
function ProposalsPage({ installer, showPrices = true, clock }: { installer: boolean; showPrices?: boolean; clock?: ZoneClock | null }) {
  const zone = useUserZone(clock);
  const day = (iso: string) => formatInstant(iso, zone, 'dayDate');
  const q = useQuery(proposalQueries.list());
  return (
    <div className="space-y-8">
      <section aria-labelledby="list-heading">
        <h2 id="list-heading" className="mb-3 text-xl">{installer ? 'Your proposals' : 'Proposals from your installers'}</h2>
        {q.isPending ? <LoadingState label="Loading proposals…" /> : null}
        {q.isError ? <ErrorState error={q.error} title="The proposals could not be loaded." onRetry={() => void q.refetch()} /> : null}
        {q.data && q.data.length === 0 ? (
          <EmptyState title="No proposals yet">
            {installer ? (
              showPrices ? (
                <p>Open a saved forecast of a rig shared with you (under <a className="font-bold text-ember-deep underline" href="/installer">Rigs shared with me</a>) and choose “Plan an upgrade”.</p>
              ) : (
                <p>Open a saved forecast of one of the rigs above and choose “Plan an upgrade”.</p>
              )
            ) : (
              <p>When an installer you shared a rig with sends an upgrade proposal, it shows here and the crew’s owners get an e-mail.</p>
            )}
          </EmptyState>
        ) : null}
        {q.data && q.data.length > 0 ? (
          <ul className="space-y-3" aria-label="Proposals">
            {q.data.map((p) => {
              const s = STATUS_LOOK[p.status];
              return (
                <li key={p.id} className="card flex flex-col gap-2 p-4 sm:flex-row sm:items-center" data-proposal={p.title}>
                  <div className="min-w-0 flex-1">
                    <a className="font-bold text-dusk underline decoration-sand-dark underline-offset-4 hover:decoration-ember" href={`/proposals/${encodeURIComponent(p.id)}`}>{p.title}</a>
                    <p className="text-sm text-slate-text">
                      {p.rigName} · {p.crewName} · {installer ? (p.sentAt ? `sent ${day(p.sentAt)}` : `drafted ${day(p.createdAt)}`) : `from ${p.installerName}, ${day(p.sentAt ?? p.createdAt)}`}
                    </p>
                    <p className="text-sm">Before: {outcome(p.before)} → after: {outcome(p.after)}</p>
                  </div>
                  <span className="text-lg font-extrabold tabular-nums">{formatMoney(p.total, p.currency)}</span>
                  <span className={`self-start rounded-full px-3 py-1 text-sm font-bold sm:self-center ${s.cls}`} data-status={p.status}>{s.label}</span>
                </li>
              );
            })}
          </ul>
        ) : null}
      </section>
      {installer && showPrices ? (
        <section aria-labelledby="prices-heading" id="price-list" className="card p-4 sm:p-5">
          <h2 id="prices-heading" className="mb-1 text-xl">Your price list</h2>
          <p className="mb-4 text-slate-text">Sweeps rank upgrade options by these prices, and a new proposal’s parts list starts from them.</p>
          <PriceListForm />
        </section>
      ) : null}
    </div>
  );
}

export default withQueryClient(ProposalsPage, { fallback: <LoadingState label="Loading proposals…" /> });
