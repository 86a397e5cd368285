import { useEffect } from 'react';
import { hashKey, useInfiniteQuery, useQueryClient } from '@tanstack/react-query';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { ApiError } from '../../lib/query-client';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';
import type { ActivityDto } from '../../domain/crews/crews.schema';
import { loadKeys } from '../loads/loads.queries';
import { activityKeys, activityQuery } from './activity.queries';
import { formatTemp, type Units } from '../../lib/units';

const FIELD_LABEL: Record<string, string> = {
  name: 'name',
  watts: 'watts',
  quantity: 'quantity',
  supply: 'supply',
  windows: 'hours on',
  dutyPct: 'duty cycle',
  days: 'days',
  response: 'temperature response',
  setpointC: 'setpoint',
  note: 'note',
  standby: 'standby',
  position: 'position in the list',
};

function show(field: string, v: unknown, units: Units): string {
  if (v === null || v === undefined || v === '') return '—';
  if (field === 'windows' && Array.isArray(v)) return (v as [number, number][]).map(([a, b]) => `${String(a).padStart(2, '0')}:00–${String(b).padStart(2, '0')}:00`).join(', ');
  if (field === 'watts') return `${v} W`;
  if (field === 'dutyPct') return `${v} %`;
  if (field === 'setpointC') return typeof v === 'number' ? formatTemp(v, units) : String(v);
  if (field === 'supply') return String(v).toUpperCase();
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return String(v);
}

const VERB: Record<ActivityDto['action'], string> = { added: 'added', changed: 'changed', removed: 'removed', imported: 'imported' };
const DOT: Record<ActivityDto['action'], string> = { added: 'bg-moss', imported: 'bg-moss', changed: 'bg-sun', removed: 'bg-ember' };

function Entry({ e, zone, units }: { e: ActivityDto; zone: ZoneClock; units: Units }) {
  const changed = e.action === 'changed' ? Object.entries(e.changes) : [];
  return (
    <li className="relative pl-6" data-activity={e.action}>
      <span aria-hidden="true" className={`absolute left-0 top-2 h-3 w-3 rounded-full ${DOT[e.action]}`} />
      <p>
        <strong>{e.by ?? 'A former member'}</strong> {VERB[e.action]} <strong>{e.loadName}</strong>{' '}
        <span className="text-sm text-slate-text">· <time dateTime={e.at}>{formatInstant(e.at, zone, 'time')}</time></span>
      </p>
      {changed.length ? (
        <ul className="mt-0.5 text-sm text-slate-text">
          {changed.map(([field, [before, after]]) => (
            <li key={field}>
              {FIELD_LABEL[field] ?? field}: {show(field, before, units)} → <span className="font-semibold text-dusk">{show(field, after, units)}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}

/**
 * The rig page's Activity section: who added, changed or removed which load, and when, newest
 * first, grouped by day in the user's zone. Mount it with `<RigActivity client:load rigId={id} clock={…} />`.
 */
function RigActivity({ rigId, clock, units = 'metric' }: { rigId: string; clock?: ZoneClock | null; units?: Units }) {
  const zone = useUserZone(clock);
  const q = useInfiniteQuery(activityQuery(rigId));
  const qc = useQueryClient();
  // Every load write adds an entry: when the rig's load list changes on this page, read the trail again.
  useEffect(() => {
    const loadsHash = hashKey(loadKeys.list(rigId));
    return qc.getQueryCache().subscribe((event) => {
      if (event.type === 'updated' && event.action.type === 'success' && event.query.queryHash === loadsHash) {
        void qc.invalidateQueries({ queryKey: activityKeys.rig(rigId) });
      }
    });
  }, [qc, rigId]);
  const items = q.data?.pages.flatMap((p) => p.items) ?? [];
  const days: { day: string; first: string; items: ActivityDto[] }[] = [];
  for (const e of items) {
    const day = formatInstant(e.at, zone, 'dayKey');
    const last = days[days.length - 1];
    if (last && last.day === day) last.items.push(e);
    else days.push({ day, first: e.at, items: [e] });
  }
  return (
    <section className="card p-5 sm:p-6" aria-labelledby="activity-h">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="activity-h" className="text-xl">Activity</h2>
        <button type="button" className="btn btn-quiet min-h-0 px-3 py-1 text-sm" onClick={() => void q.refetch()} disabled={q.isFetching}>{q.isFetching ? 'Refreshing…' : 'Refresh'}</button>
      </div>
      <p className="mt-1 text-slate-text">Who added, changed or removed which load, and when.</p>
      {q.isPending ? (
        <LoadingState label="Loading activity…" />
      ) : q.isError ? (
        q.error instanceof ApiError && q.error.status === 403 ? (
          <p className="mt-3 text-slate-text">A rig’s activity is shown to its crew only.</p>
        ) : (
          <ErrorState error={q.error} title="The activity could not be loaded." onRetry={() => void q.refetch()} />
        )
      ) : items.length === 0 ? (
        <div className="mt-4"><EmptyState title="No changes yet">Adding, editing or removing a load shows up here, with who did it.</EmptyState></div>
      ) : (
        <>
          <ol className="mt-4 space-y-5" aria-label="Load activity, newest first">
            {days.map((d) => (
              <li key={d.day}>
                <h3 className="mb-2 text-sm font-extrabold uppercase tracking-wide text-slate-text">{formatInstant(d.first, zone, 'dayDate')}</h3>
                <ul className="space-y-2 border-l-2 border-sand-dark pl-3">{d.items.map((e) => <Entry key={e.id} e={e} zone={zone} units={units} />)}</ul>
              </li>
            ))}
          </ol>
          {q.hasNextPage ? (
            <button type="button" className="btn btn-quiet mt-4" onClick={() => void q.fetchNextPage()} disabled={q.isFetchingNextPage}>{q.isFetchingNextPage ? 'Loading…' : 'Show older'}</button>
          ) : null}
        </>
      )}
    </section>
  );
}

export default withQueryClient(RigActivity);
