import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { rigQuery } from '../rigs/rigs.queries';
import { formatReadingTime } from '../../lib/format';
import LogView from './LogView';
import { monitorQueries } from './monitor.queries';
import UploadLog from './UploadLog';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import type { Units } from '../../lib/units';

/** The rig's Logs section: battery-monitor uploads and what they tell about the rig. */
export default function MonitorLogs({ rigId, units = 'metric' }: { rigId: string; units?: Units }) {
  return (
    <IslandQueryProvider>
      <Inner rigId={rigId} units={units} />
    </IslandQueryProvider>
  );
}

function Inner({ rigId, units }: { rigId: string; units: Units }) {
  const rig = useQuery(rigQuery(rigId));
  const logs = useQuery(monitorQueries.list(rigId));
  const [selected, setSelected] = useState<string | null>(null);
  const current = logs.data?.find((l) => l.id === selected)?.id ?? logs.data?.[0]?.id ?? null;

  if (rig.isPending || logs.isPending) return <LoadingState label="Loading the logs…" />;
  if (rig.isError) return <ErrorState error={rig.error} title="Couldn't load the rig." onRetry={() => rig.refetch()} />;
  if (logs.isError) return <ErrorState error={logs.error} title="Couldn't load the logs." onRetry={() => logs.refetch()} />;

  return (
    <div className="space-y-5">
      <div>
        <h2 className="text-xl">Logs</h2>
        <p className="mt-1 text-slate-text">Your battery monitor knows what really happened. Upload its log after a trip to lay it over a forecast, read the night-time draw and each day’s amp-hours, and correct the rig’s parasitic draw.</p>
      </div>
      {rig.data.canEdit ? <UploadLog rigId={rigId} onSaved={setSelected} units={units} /> : null}
      {logs.data.length === 0 ? (
        <EmptyState title="No monitor logs yet">{rig.data.canEdit ? 'Upload a CSV export from your battery monitor above.' : 'Logs your crew uploads show here.'}</EmptyState>
      ) : (
        <>
          {logs.data.length > 1 ? (
            <nav aria-label="Uploaded logs">
              <ul className="flex flex-wrap gap-2">
                {logs.data.map((l) => (
                  <li key={l.id}>
                    <button type="button" aria-pressed={l.id === current} onClick={() => setSelected(l.id)} className={`rounded-full border-[1.5px] px-3 py-1.5 text-sm font-bold ${l.id === current ? 'border-ember bg-[#fbf1e6]' : 'border-sand-dark bg-card'}`}>
                      {l.name} · {formatReadingTime(Date.parse(l.startedAt), l.timeZone)}
                    </button>
                  </li>
                ))}
              </ul>
            </nav>
          ) : null}
          {current ? <LogView key={current} id={current} rig={rig.data} onDeleted={() => setSelected(null)} units={units} /> : null}
        </>
      )}
    </div>
  );
}
