import { useEffect, useMemo, useState, useSyncExternalStore } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { isConflict } from '../../lib/query-client';
import { checkInInputSchema, type CheckInDto, type CheckInOutcome, type PreviousOutcome } from '../../domain/checkins/checkins.schema';
import { restingAdvice } from '../../domain/checkins/ocv';
import { EmptyState, ErrorState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import { noBasisText, storedOnPhone } from '../offline/stored';
import SocChart from '../forecast/SocChart';
import { forecastQueries } from '../forecast/forecast.queries';
import { formatRowTime } from '../../lib/format';
import type { ForecastListItem } from '../trip-forecasts/trip-forecasts.api';
import { tripForecastQueries } from '../trip-forecasts/trip-forecasts.queries';
import { discard, enqueue, flushOutbox, listQueued, onOutboxChange, type QueuedCheckIn } from '../offline/outbox';
import { deleteCheckIn } from './checkins.api';
import { checkInKeys, checkInQueries } from './checkins.queries';
import { outcomeSentence } from '../../domain/checkins/sentence';
import { computeCheckIn, fromHour, localInputToIso, newCheckInId, nowInputValue, type Basis } from '../../domain/checkins/checkins';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';

interface Props {
  tripId: string;
  canEdit: boolean;
  /** The check-ins and saved forecasts as the page read them on the server. */
  initial?: { checkIns: CheckInDto[]; forecasts: ForecastListItem[] };
}

/** At-camp check-ins of a trip: a reading re-forecasts the rest of the trip, with or without signal. */
export default function CheckIns(props: Props) {
  return (
    <IslandQueryProvider>
      <Inner {...props} />
    </IslandQueryProvider>
  );
}

/** A check-in as the list shows it: stored on the server, or still on the phone. */
interface Entry {
  id: string;
  at: string;
  source: 'soc' | 'volts';
  socPct: number | null;
  restingVolts: number | null;
  outcome: CheckInOutcome | null;
  previous: PreviousOutcome | null;
  note: string | null;
  forecastId: string | null;
  status: 'saved' | 'waiting' | 'refused';
  version?: number;
  error?: string | null;
  issues?: { path: string; message: string }[];
}

function fromServer(c: CheckInDto): Entry {
  return { ...c, status: 'saved' };
}

function fromQueue(q: QueuedCheckIn): Entry {
  return {
    id: q.id,
    at: q.body.at,
    source: q.body.restingVolts !== undefined ? 'volts' : 'soc',
    socPct: q.local?.socPct ?? q.body.socPct ?? null,
    restingVolts: q.body.restingVolts ?? null,
    outcome: q.local?.outcome ?? null,
    previous: q.local?.previous ?? null,
    note: q.local?.note ?? null,
    forecastId: q.body.forecastId ?? null,
    status: q.state,
    error: q.lastError,
    issues: q.issues,
  };
}

const subscribeOnline = (cb: () => void) => {
  window.addEventListener('online', cb);
  window.addEventListener('offline', cb);
  return () => {
    window.removeEventListener('online', cb);
    window.removeEventListener('offline', cb);
  };
};

function useOnline(): boolean {
  return useSyncExternalStore(subscribeOnline, () => navigator.onLine, () => true);
}

/** The pages the service worker says it keeps (null until it has answered). */
function useOfflinePages(): string[] | null {
  const [pages, setPages] = useState<string[] | null>(null);
  useEffect(() => {
    const check = () => {
      try {
        const raw = document.documentElement.dataset.offlinePages;
        setPages(raw ? (JSON.parse(raw) as string[]) : null);
      } catch {
        setPages(null);
      }
    };
    check();
    window.addEventListener('sunreckon:offline-ready', check);
    return () => window.removeEventListener('sunreckon:offline-ready', check);
  }, []);
  return pages;
}

function useOfflineReady(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => {
    const check = () => setReady(document.documentElement.dataset.offlineReady === 'true');
    check();
    window.addEventListener('sunreckon:offline-ready', check);
    return () => window.removeEventListener('sunreckon:offline-ready', check);
  }, []);
  return ready;
}

function Inner({ tripId, canEdit, initial }: Props) {
  const qc = useQueryClient();
  const online = useOnline();
  const offlineReady = useOfflineReady();
  const offlinePages = useOfflinePages();
  const list = useQuery({ ...checkInQueries.list(tripId), initialData: initial?.checkIns });
  const forecasts = useQuery({ ...tripForecastQueries.list(tripId), initialData: initial?.forecasts });
  const latestId = forecasts.data?.[0]?.id ?? null;
  const latest = useQuery({ ...forecastQueries.detail(latestId ?? ''), enabled: latestId !== null });
  const basis: Basis | null = latest.data ? { forecastId: latest.data.id, name: latest.data.name, plan: latest.data.plan, forecast: latest.data.forecast } : null;

  // What waits on this phone for this trip.
  const [queued, setQueued] = useState<QueuedCheckIn[]>([]);
  useEffect(() => {
    let alive = true;
    const load = () =>
      listQueued(tripId)
        .then((q) => alive && setQueued(q))
        .catch(() => undefined);
    load();
    const off = onOutboxChange((e) => {
      if (e.tripId !== tripId) return;
      if (e.type === 'sent' && e.checkIn) {
        qc.setQueryData<CheckInDto[]>(checkInKeys.list(tripId), (old) => (old ? [e.checkIn!, ...old.filter((c) => c.id !== e.checkIn!.id)] : [e.checkIn!]));
        qc.invalidateQueries({ queryKey: checkInKeys.list(tripId) });
      }
      load();
    });
    return () => {
      alive = false;
      off();
    };
  }, [tripId, qc]);

  const entries = useMemo(() => {
    const saved = (list.data ?? []).map(fromServer);
    const ids = new Set(saved.map((e) => e.id));
    const waiting = queued.filter((q) => !ids.has(q.id)).map(fromQueue);
    return [...waiting, ...saved].sort((a, b) => Date.parse(b.at) - Date.parse(a.at));
  }, [list.data, queued]);

  const [justMade, setJustMade] = useState<string | null>(null);
  const featured = entries.find((e) => e.id === justMade) ?? entries[0] ?? null;

  const remove = useMutation({
    mutationFn: (e: Entry) => deleteCheckIn(e.id, e.version ?? 1),
    onSettled: () => qc.invalidateQueries({ queryKey: checkInKeys.list(tripId) }),
  });

  return (
    <div className="space-y-4">
      <p className="text-sm text-slate-text" data-testid="offline-status">
        {storedOnPhone({
          online,
          pages: offlinePages,
          savedCopy: offlineReady && offlinePages === null,
          tripId,
          latest: forecasts.data?.[0] ? { id: forecasts.data[0].id, name: forecasts.data[0].name } : null,
          forecastCount: forecasts.data?.length ?? 0,
        })}
      </p>
      {canEdit ? <CheckInForm tripId={tripId} basis={basis} basisLoading={forecasts.isPending || (latestId !== null && latest.isPending)} forecastCount={forecasts.data?.length ?? 0} onMade={setJustMade} /> : null}

      {featured ? <Featured entry={featured} basis={basis} /> : null}

      {list.isError && !list.data ? <ErrorState error={list.error} title="Couldn't load the check-ins." onRetry={() => list.refetch()} /> : null}
      {entries.length === 0 && !list.isPending ? (
        <EmptyState title="No check-ins yet">
          {canEdit ? 'At camp, type what the battery monitor shows to see the rest of the trip from there.' : 'Check-ins your crew makes at camp show here.'}
        </EmptyState>
      ) : null}
      {entries.length > 0 ? (
        <ul className="space-y-2" aria-label="Check-ins" data-testid="check-in-list">
          {entries.map((e) => (
            <EntryRow key={e.id} entry={e} canEdit={canEdit} onDelete={() => remove.mutate(e)} deleting={remove.isPending && remove.variables?.id === e.id} />
          ))}
        </ul>
      ) : null}
      {remove.isError ? (
        <p role="alert" className="caution text-sm">
          {isConflict(remove.error) ? 'Someone changed that check-in meanwhile; the list is up to date now.' : remove.error.message}
        </p>
      ) : null}
    </div>
  );
}

function CheckInForm({ tripId, basis, basisLoading, forecastCount, onMade }: { tripId: string; basis: Basis | null; basisLoading: boolean; forecastCount: number; onMade: (id: string) => void }) {
  const [when, setWhen] = useState('');
  const [mode, setMode] = useState<'soc' | 'volts'>('soc');
  const [value, setValue] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  useEffect(() => setWhen(nowInputValue()), []);
  const chem = basis?.plan.bank.chemistry;

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    const at = localInputToIso(when);
    const n = Number(value.replace(',', '.'));
    const next: Record<string, string> = {};
    if (!at) next.at = 'Enter the date and time of the reading.';
    if (value.trim() === '' || !Number.isFinite(n)) next.value = mode === 'soc' ? 'Enter the state of charge in %, e.g. 64.' : 'Enter the resting voltage in volts, e.g. 12.45.';
    const id = newCheckInId();
    const body = { id, at: at ?? '', ...(mode === 'soc' ? { socPct: n } : { restingVolts: n }), ...(basis ? { forecastId: basis.forecastId } : {}) };
    if (Object.keys(next).length === 0) {
      const parsed = checkInInputSchema.safeParse(body);
      if (!parsed.success) {
        for (const i of parsed.error.issues) {
          const key = i.path[0] === 'at' ? 'at' : 'value';
          next[key] ??= i.path[0] === 'socPct' ? `State of charge ${i.message}.` : i.path[0] === 'restingVolts' ? `Resting voltage ${i.message}.` : i.message;
        }
      }
    }
    let local: QueuedCheckIn['local'] = null;
    if (Object.keys(next).length === 0 && basis) {
      const r = computeCheckIn(basis, at!, mode === 'soc' ? { socPct: n } : { restingVolts: n });
      if (!r.ok) next[r.path === 'at' ? 'at' : 'value'] = r.message;
      else local = { socPct: r.socPct, outcome: r.outcome, previous: r.previous, note: r.note };
    }
    setErrors(next);
    if (Object.keys(next).length) return;
    setBusy(true);
    try {
      // On the phone first (durable), then sent; if sending fails it simply waits there.
      await enqueue({ id, tripId, body, local });
      onMade(id);
      setValue('');
      void flushOutbox();
    } catch {
      setErrors({ value: 'This phone could not keep the check-in (storage is full or blocked). Free some space and try again.' });
    } finally {
      setBusy(false);
    }
  }

  const err = (k: string) => (errors[k] ? <p id={`checkin-${k}-error`} className="field-error" role="alert">{errors[k]}</p> : null);
  return (
    <form className="card space-y-4 p-4" onSubmit={submit} noValidate aria-labelledby="checkin-form-title">
      <h3 id="checkin-form-title" className="text-lg">Check in at camp</h3>
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <label htmlFor="checkin-at" className="field-label">Time of the reading</label>
          <input id="checkin-at" type="datetime-local" className="field-input" value={when} onChange={(e) => setWhen(e.target.value)} aria-invalid={errors.at ? true : undefined} aria-describedby={errors.at ? 'checkin-at-error' : 'checkin-at-hint'} />
          {errors.at ? err('at') : <p id="checkin-at-hint" className="field-hint mt-1">Your phone’s clock. The forecast restarts at the start of that hour.</p>}
        </div>
        <fieldset>
          <legend className="field-label">What you read</legend>
          <div className="flex flex-wrap gap-2">
            {(['soc', 'volts'] as const).map((m) => (
              <label key={m} className={`flex min-h-[44px] cursor-pointer items-center gap-2 rounded-[10px] border-[1.5px] px-3 ${mode === m ? 'border-ember bg-[#fbf1e6]' : 'border-sand-dark bg-white'}`}>
                <input type="radio" name="checkin-mode" value={m} checked={mode === m} onChange={() => setMode(m)} className="accent-ember" />
                {m === 'soc' ? 'State of charge (%)' : 'Resting voltage (V)'}
              </label>
            ))}
          </div>
        </fieldset>
      </div>
      <div>
        <label htmlFor="checkin-value" className="field-label">{mode === 'soc' ? 'State of charge, %' : 'Resting voltage, V'}</label>
        <input
          id="checkin-value"
          className="field-input max-w-[12rem] tabular-nums"
          inputMode="decimal"
          autoComplete="off"
          placeholder={mode === 'soc' ? 'e.g. 64' : 'e.g. 12.45'}
          value={value}
          onChange={(e) => setValue(e.target.value)}
          aria-invalid={errors.value ? true : undefined}
          aria-describedby={errors.value ? 'checkin-value-error' : 'checkin-value-hint'}
        />
        {errors.value ? (
          err('value')
        ) : (
          <p id="checkin-value-hint" className="field-hint mt-1">
            {mode === 'soc' ? 'The SOC your battery monitor or BMS shows.' : chem ? restingAdvice(chem) : 'A resting voltage needs the bank idle — no charging, loads off — for a while: a few hours for lead-acid.'}
          </p>
        )}
      </div>
      {mode === 'volts' && chem === 'lifepo4' ? (
        <p className="caution text-sm">This rig’s bank is LiFePO4: its voltage is nearly flat over most of its charge, so the SOC from a battery monitor gives a far better check-in.</p>
      ) : null}
      {!basis && !basisLoading ? <p className="text-sm text-slate-text">{noBasisText(forecastCount)}</p> : null}
      <button type="submit" className="btn btn-primary" disabled={busy}>
        {busy ? 'Checking in…' : 'Check in'}
      </button>
    </form>
  );
}

/** A reading at or below the floor: the bank is cut off from the first hour. */
function cutNow(o: CheckInOutcome): boolean {
  return o.firstCutoffAt !== null && o.firstCutoffAt === o.startAt && o.startSocPct <= o.floorSocPct;
}

/** What the saved forecast said, in short. */
function verdictOf(o: PreviousOutcome): string {
  return o.firstCutoffAt ? `Runs out ${formatRowTime(o.firstCutoffAt)}` : `Makes it — lowest ${o.minSocPct.toFixed(0)} % on ${formatRowTime(o.minSocAt)}`;
}

/** What the re-forecast says, from its computed outcome (cutoff, reconnect, next cutoff, unmet Wh). */
function saysOf(o: CheckInOutcome): string {
  return outcomeSentence(o, formatRowTime, o.cutoffStop);
}

function hoursBetween(a: string, b: string): number {
  return Math.round((Date.parse(a) - Date.parse(b)) / 3_600_000);
}

/** The new cutoff beside the old one, in words. */
function comparison(o: CheckInOutcome, p: PreviousOutcome | null): string | null {
  if (!p) return null;
  if (cutNow(o)) return p.firstCutoffAt ? `“${p.name}” had the bank run out ${formatRowTime(p.firstCutoffAt)}; it is already at its floor.` : `“${p.name}” said the bank makes it; it is already at its floor.`;
  if (o.firstCutoffAt && p.firstCutoffAt) {
    const h = hoursBetween(o.firstCutoffAt, p.firstCutoffAt);
    if (h === 0) return `The same hour as “${p.name}”.`;
    return `${Math.abs(h)} hour${Math.abs(h) === 1 ? '' : 's'} ${h < 0 ? 'earlier' : 'later'} than “${p.name}” said.`;
  }
  if (o.firstCutoffAt) return `“${p.name}” said the bank makes it; from this reading it does not.`;
  if (p.firstCutoffAt) return `“${p.name}” said the bank runs out; from this reading it makes it.`;
  const d = o.minSocPct - p.minSocPct;
  return `Both make it; the lowest point is ${Math.abs(d).toFixed(0)} points ${d < 0 ? 'lower' : 'higher'} than “${p.name}” said.`;
}

function readingText(e: Entry): string {
  if (e.source === 'volts') return `${e.restingVolts?.toFixed(2)} V at rest${e.socPct !== null ? ` (≈ ${e.socPct.toFixed(0)} %)` : ''}`;
  return `${e.socPct?.toFixed(e.socPct % 1 ? 1 : 0)} %`;
}

function Featured({ entry, basis }: { entry: Entry; basis: Basis | null }) {
  const o = entry.outcome;
  // The chart of the rest of the trip, worked out on the phone when its saved forecast is here.
  const chart = useMemo(() => {
    if (!o || !basis || entry.forecastId !== basis.forecastId || entry.socPct === null) return null;
    const r = computeCheckIn(basis, entry.at, entry.source === 'volts' && entry.restingVolts !== null ? { restingVolts: entry.restingVolts } : { socPct: entry.socPct });
    if (!r.ok) return null;
    const old = fromHour(basis.forecast, r.outcome.startAt);
    return { forecast: r.forecast, compare: old ? { name: basis.name, forecast: old, plan: basis.plan } : null };
  }, [o, basis, entry]);

  return (
    <section className="card space-y-3 p-4" aria-labelledby="checkin-latest-title" data-testid="check-in-result">
      <h3 id="checkin-latest-title" className="text-lg">
        From your reading of {readingText(entry)}, {formatRowTime(o?.startAt ?? entry.at)}
      </h3>
      {o ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <div className={`rounded-xl p-3 ${o.firstCutoffAt ? 'bg-[#fbe9df]' : 'bg-[#e6efe7]'}`}>
            <p className="text-xs font-bold uppercase tracking-wide text-slate-text">Now</p>
            <p className="text-lg font-extrabold" data-testid="new-cutoff">{saysOf(o)}</p>
          </div>
          <div className="rounded-xl bg-sand p-3">
            <p className="text-xs font-bold uppercase tracking-wide text-slate-text">{entry.previous ? `Saved forecast “${entry.previous.name}”` : 'Saved forecast'}</p>
            <p className="text-lg font-extrabold" data-testid="old-cutoff">{entry.previous ? verdictOf(entry.previous) : 'None saved for this trip'}</p>
          </div>
        </div>
      ) : (
        <p className="text-slate-text">Waiting for the signal: the re-forecast is worked out when this check-in reaches the server.</p>
      )}
      {o ? <p className="font-semibold">{comparison(o, entry.previous)}</p> : null}
      {entry.note ? <p className="caution text-sm">{entry.note}</p> : null}
      {entry.status !== 'saved' ? <StatusLine entry={entry} /> : null}
      {chart ? (
        <SocChart forecast={chart.forecast} plan={basis!.plan} name="From this reading" compare={chart.compare} height={220} showSummary={false} />
      ) : null}
      <p className="text-xs text-slate-text">Estimates from the same model as the forecast, restarted at your reading.</p>
    </section>
  );
}

function StatusLine({ entry }: { entry: Entry }) {
  if (entry.status === 'waiting') {
    return (
      <p className="text-sm font-semibold text-slate-text" data-testid="check-in-waiting">
        Saved on this phone — it will be sent when the signal is back.
      </p>
    );
  }
  return (
    <div className="caution text-sm" role="alert">
      <p className="font-bold">The server did not take this check-in: {entry.error}</p>
      {entry.issues?.length ? (
        <ul className="list-inside list-disc">
          {entry.issues.map((i) => (
            <li key={i.path + i.message}>
              <strong>{i.path}</strong>: {i.message}
            </li>
          ))}
        </ul>
      ) : null}
      <button type="button" className="btn btn-quiet mt-2" onClick={() => void discard(entry.id)}>
        Discard it
      </button>
    </div>
  );
}

function EntryRow({ entry, canEdit, onDelete, deleting }: { entry: Entry; canEdit: boolean; onDelete: () => void; deleting: boolean }) {
  const o = entry.outcome;
  const badge = entry.status === 'saved' ? null : entry.status === 'waiting' ? { text: 'On this phone, waiting to send', cls: 'bg-sun text-dusk' } : { text: 'Not taken', cls: 'bg-alert text-white' };
  return (
    <li className="card flex flex-col gap-2 p-3 sm:flex-row sm:items-center" data-status={entry.status} data-testid="check-in-row">
      <div className="min-w-0 flex-1">
        <p className="font-bold">
          {readingText(entry)} · {formatRowTime(o?.startAt ?? entry.at)}
        </p>
        <p className="text-sm text-slate-text">{o ? saysOf(o) : 'Re-forecast when it reaches the server.'}</p>
      </div>
      {badge ? <span className={`self-start rounded-full px-3 py-1 text-sm font-bold sm:self-center ${badge.cls}`}>{badge.text}</span> : null}
      {canEdit && entry.status === 'saved' ? (
        <AskFirst className="self-start sm:self-center" buttonClassName="btn btn-quiet self-start text-sm sm:self-center" label={deleting ? 'Deleting…' : 'Delete'} ariaLabel="Delete this check-in" question="Delete this check-in and its re-forecast?" confirmLabel="Delete" onConfirm={onDelete} busy={deleting} />
      ) : null}
    </li>
  );
}
