import { useMemo, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ApiError, isConflict } from '../../lib/query-client';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import type { Plan } from '../../engine';
import { parasiticWorking, plannedNightDraw, readParasiticWatts, type NightBaseline } from '../../domain/monitor/baseline';
import type { MonitorLogDetail } from '../../domain/monitor/monitor.schema';
import { overlaySoc } from '../../domain/monitor/overlay';
import { dayLedger } from '../../domain/monitor/ledger';
import type { LoadDto } from '../../domain/loads/loads.schema';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import { forecastQueries } from '../forecast/forecast.queries';
import { formatRowTime } from '../../lib/format';
import { createLoad, updateLoad } from '../loads/loads.api';
import { loadKeys, loadsQuery } from '../loads/loads.queries';
import { deleteLog, fetchReadings, originalUrl } from './monitor.api';
import { monitorKeys, monitorQueries } from './monitor.queries';
import { formatBytes, formatDay, formatReadingTime } from '../../lib/format';
import MeasuredChart from './MeasuredChart';
import { formatTemp, tempUnit, toDisplayTemp, type Units } from '../../lib/units';
import { at } from '../../lib/invariant';

/** One saved log: what it tells about the rig, and how it compares with a saved forecast. */
export default function LogView({ id, rig, onDeleted, units = 'metric' }: { id: string; rig: RigDto; onDeleted: () => void; units?: Units }) {
  const qc = useQueryClient();
  const q = useQuery(monitorQueries.detail(id));
  const remove = useMutation({
    mutationFn: (version: number) => deleteLog(id, version),
    onSuccess: () => {
      qc.invalidateQueries({ queryKey: monitorKeys.list(rig.id) });
      onDeleted();
    },
  });
  if (q.isPending) return <LoadingState label="Reading the log…" />;
  if (q.isError) return <ErrorState error={q.error} title="Couldn't load this log." onRetry={() => q.refetch()} />;
  const d = q.data;
  return (
    <article className="space-y-4" aria-labelledby={`log-${d.id}-title`} data-testid="log-view">
      <header className="card flex flex-col gap-2 p-4 sm:flex-row sm:items-center">
        <div className="min-w-0 flex-1">
          <h3 id={`log-${d.id}-title`} className="truncate text-lg">{d.name}</h3>
          <p className="text-sm text-slate-text">
            {d.sampleCount.toLocaleString('en-GB')} readings, {formatReadingTime(Date.parse(d.startedAt), d.timeZone)} to {formatReadingTime(Date.parse(d.endedAt), d.timeZone, true)} ({d.timeZone}) · {formatBytes(d.bytes)}
          </p>
        </div>
        <div className="flex gap-2"><a className="btn btn-quiet text-sm" href={originalUrl(d.id)} download>Download the file</a>
        {rig.canEdit ? (
          <AskFirst buttonClassName="btn btn-quiet text-sm" label={remove.isPending ? 'Deleting…' : 'Delete'} ariaLabel={`Delete the log ${d.name}`} question={`Delete the log “${d.name}” and its readings?`} confirmLabel="Delete" onConfirm={() => remove.mutate(d.version)} busy={remove.isPending} />
        ) : null}
        </div>
      </header>
      {remove.isError ? <ErrorState error={remove.error} title="The log was not deleted." /> : null}
      <NightDraw log={d} rig={rig} units={units} />
      <Days log={d} rig={rig} />
      <AgainstForecast log={d} />
      <Readings log={d} units={units} />
    </article>
  );
}

function w(x: number): string {
  return `${Math.round(x)} W`;
}

function NightDraw({ log, rig, units }: { log: MonitorLogDetail; rig: RigDto; units: Units }) {
  const b = log.baseline;
  return (
    <section className="card space-y-3 p-4" aria-labelledby={`night-${log.id}`}>
      <h4 id={`night-${log.id}`} className="text-base font-extrabold">Night-time draw</h4>
      {b.ok ? <Baseline baseline={b.baseline} log={log} rig={rig} units={units} /> : <p className="text-slate-text">{b.reason}</p>}
    </section>
  );
}

function Baseline({ baseline, log, rig, units }: { baseline: NightBaseline; log: MonitorLogDetail; rig: RigDto; units: Units }) {
  const nominal = rig.bank.nominalVolts ?? (rig.bank.chemistry === 'lifepo4' ? 12.8 : 12);
  const measuredW = baseline.drawA * nominal;
  const loads = useQuery(loadsQuery(rig.id));
  return (
    <>
      <p data-testid="baseline-text">
        Between {String(baseline.fromHour).padStart(2, '0')}:00 and {String(baseline.toHour).padStart(2, '0')}:00, when no solar charges, the bank gave a median <strong>{baseline.drawA.toFixed(2)} A</strong> ({w(measuredW)} at {nominal} V) over {baseline.nights.length} night{baseline.nights.length === 1 ? '' : 's'}.
        {baseline.excludedCharging > 0 ? ` ${baseline.excludedCharging} readings while something was charging were left out.` : ''}
      </p>
      {baseline.nights.length > 1 ? (
        <ul className="flex flex-wrap gap-2 text-sm" aria-label="Each night">
          {baseline.nights.map((n) => (
            <li key={n.date} className="rounded-full bg-sand px-3 py-1 tabular-nums">
              {formatDay(n.date)}: {n.drawA.toFixed(2)} A
            </li>
          ))}
        </ul>
      ) : null}
      {loads.data ? <Parasitic baseline={baseline} log={log} rig={rig} loads={loads.data} nominal={nominal} units={units} /> : loads.isError ? <ErrorState error={loads.error} title="Couldn't load the rig's loads." /> : null}
    </>
  );
}

function Parasitic({ baseline, log, rig, loads, nominal, units }: { baseline: NightBaseline; log: MonitorLogDetail; rig: RigDto; loads: LoadDto[]; nominal: number; units: Units }) {
  const qc = useQueryClient();
  const target = loads.find((l) => l.standby) ?? null;
  const others = loads.filter((l) => l.id !== target?.id);
  const ambient = log.nightTempC ?? 20;
  const planned = useMemo(
    () =>
      plannedNightDraw(
        {
          bank: rig.bank as Plan['bank'],
          inverter: rig.inverter as Plan['inverter'] | null,
          loads: others.map((l) => ({ name: l.name, watts: l.watts, quantity: l.quantity, supply: l.supply, windows: l.windows, dutyPct: l.dutyPct, days: l.days, response: l.response, setpointC: l.setpointC })),
        },
        ambient,
        baseline.fromHour,
        baseline.toHour,
      ),
    [rig, others, ambient, baseline],
  );
  const working = parasiticWorking(baseline, nominal, planned);
  const suggestion = working.parasiticW;
  const [watts, setWatts] = useState<string | null>(null);
  const value = watts ?? String(suggestion);
  const [zeroOk, setZeroOk] = useState(false);
  const [done, setDone] = useState<{ text: string; undo: (() => void) | null } | null>(null);
  const [fieldError, setFieldError] = useState<string | null>(null);
  const [askZero, setAskZero] = useState(false);
  const note = `From the monitor log "${log.name}": ${working.text} between ${String(baseline.fromHour).padStart(2, '0')}:00 and ${String(baseline.toHour).padStart(2, '0')}:00.`.slice(0, 500);

  const save = useMutation({
    mutationFn: async (v: { watts: number; version?: number }) =>
      target
        ? updateLoad(target.id, { watts: v.watts, quantity: 1, dutyPct: 100, windows: [[0, 24]], days: 'all', note, version: v.version ?? target.version })
        : createLoad(rig.id, { name: 'Parasitic standby draw', watts: v.watts, standby: true, note }),
    onSuccess: (l) => {
      // The old standby load stays in the rig's activity (watts before → after); one click puts it back.
      const before = target;
      setDone({
        text: `Saved: “${l.name}” now draws ${l.watts} W all day, every day${before ? ` (it was ${before.watts} W)` : ''}. Forecasts run from now on use it.`,
        undo: before
          ? () =>
              undo.mutate({
                id: l.id,
                version: l.version,
                body: { watts: before.watts, quantity: before.quantity, dutyPct: before.dutyPct, windows: before.windows, days: before.days, note: before.note ?? '' },
              })
          : null,
      });
      qc.invalidateQueries({ queryKey: loadKeys.list(rig.id) });
    },
  });
  const undo = useMutation({
    mutationFn: (v: { id: string; version: number; body: Omit<Parameters<typeof updateLoad>[1], 'version'> }) => updateLoad(v.id, { ...v.body, version: v.version }),
    onSuccess: (l) => {
      setDone({ text: `Put back: “${l.name}” draws ${l.watts} W again.`, undo: null });
      qc.invalidateQueries({ queryKey: loadKeys.list(rig.id) });
    },
  });

  const submit = (version?: number) => {
    const r = readParasiticWatts(value, zeroOk);
    if (!r.ok) {
      setFieldError(r.message);
      if (r.needsConfirm) setAskZero(true);
      return;
    }
    setFieldError(null);
    setDone(null);
    save.mutate({ watts: r.watts, version });
  };
  const theirs = isConflict(save.error) ? save.error.current<LoadDto>() : undefined;
  const serverIssue = save.error instanceof ApiError && save.error.status !== 409 ? save.error.issues.find((i) => i.path === 'watts')?.message : undefined;

  return (
    <div className="space-y-3 rounded-xl bg-sand p-3" data-testid="parasitic">
      <dl className="grid grid-cols-2 gap-2 text-sm sm:max-w-md" data-testid="night-numbers">
        <div className="rounded-lg bg-white/70 p-2">
          <dt className="text-slate-text">Night baseline (measured)</dt>
          <dd className="text-lg font-extrabold tabular-nums">{w(working.measuredW)}</dd>
        </div>
        <div className="rounded-lg bg-white/70 p-2">
          <dt className="text-slate-text">Parasitic (unexplained)</dt>
          <dd className="text-lg font-extrabold tabular-nums">{w(working.parasiticW)}</dd>
        </div>
      </dl>
      <p className="text-sm">
        Your load list schedules <strong>{w(planned.watts)}</strong> in those hours without {target ? `“${target.name}”` : 'a standby load'} (CPAP, furnace, fridge and the like, at {formatTemp(planned.ambientC, units)}{log.nightTempC === null ? ', as the log has no temperature' : ', the log’s night temperature'}).{' '}
        {suggestion > 0 ? (
          <>The rest is draw the list does not explain: detectors, control boards, radio memory, an inverter left on.</>
        ) : (
          <>The list already explains the night draw; no parasitic draw is missing.</>
        )}
      </p>
      <p className="text-sm tabular-nums" data-testid="parasitic-working">{working.text}</p>
      {rig.canEdit ? (
        <form
          className="flex flex-col gap-3 sm:flex-row sm:items-end"
          onSubmit={(e) => {
            e.preventDefault();
            submit();
          }}
        >
          <div>
            <label htmlFor={`parasitic-${log.id}`} className="field-label">Parasitic draw, W</label>
            <input id={`parasitic-${log.id}`} className="field-input max-w-[10rem] tabular-nums" inputMode="decimal" value={value} onChange={(e) => setWatts(e.target.value)} aria-invalid={fieldError || serverIssue ? true : undefined} aria-describedby={fieldError || serverIssue ? `parasitic-${log.id}-error` : undefined} />
            {fieldError || serverIssue ? <p id={`parasitic-${log.id}-error`} className="field-error" role="alert">{fieldError ?? `Parasitic draw ${serverIssue}`}</p> : null}
            {askZero ? (
              <label className="mt-2 flex items-start gap-2 text-sm">
                <input type="checkbox" checked={zeroOk} onChange={(e) => setZeroOk(e.target.checked)} className="mt-1" />
                <span>Yes, this rig draws nothing with everything off</span>
              </label>
            ) : null}
          </div>
          <button type="submit" className="btn btn-primary" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : 'Use this as the rig’s parasitic draw'}
          </button>
        </form>
      ) : null}
      <p className="text-xs text-slate-text">{target ? `Updates the standby load “${target.name}” (now ${target.watts} W).` : 'Adds a standby load “Parasitic standby draw” to the rig’s loads.'} An estimate: pick a log from nights with the furnace off for the cleanest reading.</p>
      {theirs ? (
        <ConflictNotice what="load" theirs={theirs} busy={save.isPending} onKeepMine={() => submit(theirs.version)} onTakeTheirs={() => { save.reset(); qc.invalidateQueries({ queryKey: loadKeys.list(rig.id) }); }}>
          <p className="mt-1 text-sm">Theirs: {theirs.name}, {theirs.watts} W.</p>
        </ConflictNotice>
      ) : null}
      {save.isError && !theirs && !serverIssue ? <ErrorState error={save.error} title="The parasitic draw was not saved." /> : null}
      {done ? (
        <div role="status" className="flex flex-wrap items-center gap-2">
          <p className="font-semibold text-moss-deep">{done.text}</p>
          {done.undo ? (
            <button type="button" className="btn btn-quiet text-sm" disabled={undo.isPending} onClick={done.undo}>
              {undo.isPending ? 'Putting back…' : 'Undo'}
            </button>
          ) : null}
        </div>
      ) : null}
      {undo.isError ? <ErrorState error={undo.error} title="The old standby load was not put back." /> : null}
    </div>
  );
}

/** Each day's energy into and out of the bank as measured, with the forecast's for the same day as a tick. */
function Days({ log, rig }: { log: MonitorLogDetail; rig: RigDto }) {
  const fid = log.forecasts[0]?.id ?? null;
  const f = useQuery({ ...forecastQueries.detail(fid ?? ''), enabled: fid !== null && log.has.amps });
  const nominal = rig.bank.nominalVolts ?? (rig.bank.chemistry === 'lifepo4' ? 12.8 : 12);
  const ledger = useMemo(() => dayLedger(log.days, nominal, f.data ? f.data.forecast.days : null), [log.days, nominal, f.data]);
  if (!log.has.amps) return null;
  const pct = (wh: number) => `${Math.min(100, (wh / ledger.maxWh) * 100).toFixed(1)}%`;
  const kwh = (wh: number) => `${Math.round(wh).toLocaleString('en-GB')} Wh`;
  const withForecast = ledger.days.some((d) => d.forecast);
  return (
    <section className="card space-y-3 p-4" aria-labelledby={`days-${log.id}`}>
      <h4 id={`days-${log.id}`} className="text-base font-extrabold">Energy in and out, day by day</h4>
      {ledger.days.length === 0 ? (
        <p className="text-slate-text">Too few readings to add up a day.</p>
      ) : (
        <>
          <p className="text-sm text-slate-text">
            Measured amp-hours at the bank’s {nominal} V.{' '}
            {withForecast && f.data ? <>The orange mark on each bar is what “{f.data.name}” expected that day.</> : fid ? null : 'No saved forecast covers these days to compare with.'}
          </p>
          <ol className="space-y-3" data-testid="day-ledger">
            {ledger.days.map((d) => (
              <li key={d.date} className="space-y-1">
                <p className="flex flex-wrap items-baseline justify-between gap-x-3 text-sm">
                  <strong>{formatDay(d.date)}</strong>
                  <span className={`font-semibold ${d.netWh < 0 ? 'text-alert' : 'text-moss-deep'}`}>
                    {d.netWh >= 0 ? `Gained ${kwh(d.netWh)}` : `Drew down ${kwh(-d.netWh)}`}
                    {d.hoursCovered < 23.9 ? <span className="font-normal text-slate-text"> · {d.hoursCovered} h logged</span> : null}
                  </span>
                </p>
                {([
                  ['In', d.inWh, d.forecast?.inWh, 'bg-sun'],
                  ['Out', d.outWh, d.forecast?.outWh, 'bg-slate'],
                ] as const).map(([label, wh, expected, colour]) => (
                  <div key={label} className="text-sm tabular-nums">
                    <p className="flex justify-between gap-2">
                      <span className="text-slate-text">{label}</span>
                      <span>
                        {kwh(wh)}
                        {expected !== undefined ? <span className="text-slate-text"> · expected {kwh(expected)}</span> : null}
                      </span>
                    </p>
                    <span className="relative mt-0.5 block h-3 rounded-full bg-sand" aria-hidden="true">
                      <span className={`absolute inset-y-0 left-0 rounded-full ${colour}`} style={{ width: pct(wh) }} />
                      {expected !== undefined ? <span className="absolute -inset-y-1 w-1 rounded bg-ember-deep" style={{ left: pct(expected) }} /> : null}
                    </span>
                  </div>
                ))}
              </li>
            ))}
          </ol>
        </>
      )}
    </section>
  );
}

function AgainstForecast({ log }: { log: MonitorLogDetail }) {
  const [picked, setPicked] = useState<string | null>(null);
  const fid = picked ?? log.forecasts[0]?.id ?? null;
  const f = useQuery({ ...forecastQueries.detail(fid ?? ''), enabled: fid !== null && log.has.soc });
  const overlay = useMemo(() => (f.data ? overlaySoc(f.data.forecast, log.series) : null), [f.data, log.series]);
  let body: React.ReactNode;
  if (!log.has.soc) body = <p className="text-slate-text">This log has no state-of-charge column, so it cannot be laid over a forecast.</p>;
  else if (log.forecasts.length === 0) body = <p className="text-slate-text">No saved forecast of this rig covers these dates. Run a forecast of the trip the log is from, then come back.</p>;
  else if (f.isPending) body = <LoadingState label="Loading the forecast…" />;
  else if (f.isError) body = <ErrorState error={f.error} title="Couldn't load that forecast." />;
  else if (overlay && f.data) {
    const fc = f.data.forecast;
    const rowTime = (row: number) => formatRowTime(at(fc.hourly, row, 'forecast hour').time);
    const summary =
      overlay.matched === 0
        ? 'The log has no state-of-charge readings within half an hour of this forecast’s hours.'
        : `Over ${overlay.matched} hours the measured state of charge ran ${Math.abs(overlay.meanDiffPct ?? 0).toFixed(1)} points ${(overlay.meanDiffPct ?? 0) < 0 ? 'below' : 'above'} the forecast on average` +
          (overlay.worst && overlay.worst.diffPct > 0 ? `; the biggest shortfall was ${overlay.worst.diffPct.toFixed(1)} points at ${rowTime(overlay.worst.row)}` : '') +
          (overlay.measuredMin ? `. Lowest measured: ${overlay.measuredMin.socPct.toFixed(0)} % at ${rowTime(overlay.measuredMin.row)}.` : '.');
    body = <MeasuredChart forecast={fc} overlay={overlay} name={f.data.name} summary={summary} />;
  }
  return (
    <section className="card space-y-3 p-4" aria-labelledby={`against-${log.id}`}>
      <div className="flex flex-col gap-2 sm:flex-row sm:items-end">
        <h4 id={`against-${log.id}`} className="flex-1 text-base font-extrabold">Measured against a forecast</h4>
        {log.forecasts.length > 1 ? (
          <div>
            <label htmlFor={`pick-${log.id}`} className="field-label">Saved forecast</label>
            <select id={`pick-${log.id}`} className="field-input" value={fid ?? ''} onChange={(e) => setPicked(e.target.value)}>
              {log.forecasts.map((o) => (
                <option key={o.id} value={o.id}>{`${o.tripName} — ${o.name} (${o.overlapHours} h shared)`}</option>
              ))}
            </select>
          </div>
        ) : null}
      </div>
      {body}
    </section>
  );
}

const PAGE = 24;

/** The readings as stored, a page at a time (the server never sends them all at once). */
function Readings({ log, units }: { log: MonitorLogDetail; units: Units }) {
  // Cursors of the pages seen so far: [null] is the first page; the last entry is the page shown.
  const [cursors, setCursors] = useState<(number | null)[]>([null]);
  const after = cursors.at(-1) ?? null;
  const page = useQuery({
    queryKey: [...monitorKeys.detail(log.id), 'readings', after, PAGE],
    queryFn: ({ signal }) => fetchReadings(log.id, after, PAGE, signal),
    staleTime: Infinity,
    placeholderData: (prev) => prev,
  });
  const n = cursors.length;
  const first = (n - 1) * PAGE + 1;
  return (
    <details className="card p-4" aria-labelledby={`readings-${log.id}`}>
      <summary className="cursor-pointer">
        <h4 id={`readings-${log.id}`} className="inline text-base font-extrabold">Each reading ({log.sampleCount.toLocaleString('en-GB')})</h4>
      </summary>
      <div className="mt-3 space-y-3">
      {page.isError ? (
        <ErrorState error={page.error} title="Couldn't load these readings." onRetry={() => page.refetch()} />
      ) : !page.data ? (
        <LoadingState label="Loading readings…" />
      ) : (
        <>
          <p className="text-sm text-slate-text" aria-live="polite" data-testid="readings-range">
            Readings {first.toLocaleString('en-GB')}–{(first + page.data.items.length - 1).toLocaleString('en-GB')} of {log.sampleCount.toLocaleString('en-GB')}
          </p>
          <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Readings (scrolls sideways)">
            <table className="w-full min-w-[22rem] text-sm tabular-nums" data-testid="readings-table">
              <thead>
                <tr className="border-b border-sand-dark text-left">
                  <th scope="col" className="py-1 pr-3">Time ({log.timeZone})</th>
                  {log.has.volts ? <th scope="col" className="py-1 pr-3 text-right">V</th> : null}
                  {log.has.amps ? <th scope="col" className="py-1 pr-3 text-right">A</th> : null}
                  {log.has.soc ? <th scope="col" className="py-1 pr-3 text-right">SOC %</th> : null}
                  {log.has.temperature ? <th scope="col" className="py-1 text-right">{tempUnit(units)}</th> : null}
                </tr>
              </thead>
              <tbody>
                {page.data.items.map((r) => (
                  <tr key={r.t} className="border-b border-sand">
                    <th scope="row" className="py-1 pr-3 text-left font-normal">{formatReadingTime(r.t, log.timeZone, true)}</th>
                    {log.has.volts ? <td className="py-1 pr-3 text-right">{r.volts?.toFixed(2) ?? '–'}</td> : null}
                    {log.has.amps ? <td className="py-1 pr-3 text-right">{r.amps?.toFixed(2) ?? '–'}</td> : null}
                    {log.has.soc ? <td className="py-1 pr-3 text-right">{r.socPct?.toFixed(1) ?? '–'}</td> : null}
                    {log.has.temperature ? <td className="py-1 text-right">{typeof r.tempC === 'number' ? toDisplayTemp(r.tempC, units).toFixed(1) : '–'}</td> : null}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="flex gap-2">
            <button type="button" className="btn btn-quiet text-sm" disabled={n === 1 || page.isFetching} onClick={() => setCursors((c) => c.slice(0, -1))}>
              Earlier readings
            </button>
            <button
              type="button"
              className="btn btn-quiet text-sm"
              disabled={page.data.next === null || page.isFetching}
              onClick={() => {
                const next = page.data?.next;
                if (next !== null && next !== undefined) setCursors((c) => [...c, next]);
              }}
            >
              Later readings
            </button>
          </div>
        </>
      )}
      </div>
    </details>
  );
}
