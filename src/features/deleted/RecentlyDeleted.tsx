import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { RESTORE_DAYS, type DeletedItem } from '../../domain/shared/deletion';
import { plural } from '../../lib/format';
import { rigKeys } from '../rigs/rigs.queries';
import { tripKeys } from '../trips/trips.queries';
import { deletedKeys, fetchDeleted, restoreRig, restoreTrip } from './deleted.api';

/**
 * "Recently deleted" under the rig or trip list: what a crew owner deleted in the last 30 days, with the
 * days left before it is removed for good and a Restore button. Shows nothing when there is nothing (and
 * to editors and viewers, who cannot restore).
 */
function RecentlyDeleted({ kind }: { kind: 'rig' | 'trip' }) {
  const qc = useQueryClient();
  const list = useQuery({ queryKey: deletedKeys.list(), queryFn: fetchDeleted });
  const [status, setStatus] = useState<{ text: string; href?: string } | null>(null);
  const [problem, setProblem] = useState<{ id: string; text: string } | null>(null);
  const restore = useMutation({
    mutationFn: async (item: DeletedItem): Promise<void> => {
      if (item.kind === 'rig') await restoreRig(item.id);
      else await restoreTrip(item.id);
    },
    onSuccess: (_row, item) => {
      setProblem(null);
      setStatus({ text: `Restored ${item.name}.`, href: `/${item.kind}s/${encodeURIComponent(item.id)}` });
      void qc.invalidateQueries({ queryKey: deletedKeys.all });
      void qc.invalidateQueries({ queryKey: rigKeys.all });
      void qc.invalidateQueries({ queryKey: tripKeys.all });
    },
    onError: (e, item) => setProblem({ id: item.id, text: e instanceof Error ? e.message : 'Could not restore it. Try again.' }),
  });

  const items = (list.data ?? []).filter((d) => d.kind === kind);
  if (!items.length && !status) return null;
  const title = kind === 'rig' ? 'Recently deleted rigs' : 'Recently deleted trips';
  return (
    <section aria-labelledby={`deleted-${kind}-heading`} className="mt-8" data-recently-deleted={kind}>
      <h2 id={`deleted-${kind}-heading`} className="text-xl">
        {title}
      </h2>
      <p className="mt-1 text-slate-text">
        Kept for {RESTORE_DAYS} days with{' '}
        {kind === 'rig' ? 'their loads, trips, saved forecasts and check-ins' : 'their saved forecasts and check-ins'}, then removed for
        good. Only the crew’s owners see this list.
      </p>
      <p role="status" aria-live="polite" className={status ? 'mt-2 font-semibold text-moss-deep' : 'sr-only'}>
        {status ? (
          <>
            {status.text}{' '}
            {status.href ? (
              <a className="underline" href={status.href}>
                Open it
              </a>
            ) : null}
          </>
        ) : (
          ''
        )}
      </p>
      {items.length ? (
        <ul className="mt-3 space-y-2" aria-label={title}>
          {items.map((d) => (
            <li key={d.id} className="card flex flex-wrap items-center justify-between gap-3 p-4">
              <span className="min-w-0">
                <span className="block font-extrabold">{d.name}</span>
                <span className="block text-sm text-slate-text">
                  {d.kind === 'trip' && d.rigName ? `on ${d.rigName} · ` : ''}
                  deleted{d.deletedBy ? ` by ${d.deletedBy}` : ''} ·{' '}
                  {d.daysLeft > 0 ? `${plural(d.daysLeft, 'day')} left` : 'removed today'}
                </span>
                {d.rigDeleted ? (
                  <span className="block text-sm font-semibold">Its rig is deleted too: restore the rig first (Rigs page).</span>
                ) : null}
                {problem?.id === d.id ? (
                  <span role="alert" className="block text-sm font-semibold text-alert">
                    {problem.text}
                  </span>
                ) : null}
              </span>
              <button
                type="button"
                className="btn btn-quiet"
                disabled={restore.isPending || d.rigDeleted === true}
                onClick={() => restore.mutate(d)}
                aria-label={`Restore ${d.name}`}
              >
                Restore
              </button>
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

export default withQueryClient(RecentlyDeleted);
