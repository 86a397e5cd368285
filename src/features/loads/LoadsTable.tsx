import { useMemo, useState } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { LoadDto } from '../../domain/loads/loads.schema';
import { loadingFallback, withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { isConflict, isNotFound } from '../../lib/query-client';
import { formatAh, formatNumber, formatWatts, formatWh, nominalVoltsOf } from '../../lib/format';
import { formatTemp, toUnits, type Units } from '../../lib/units';
import { rigQuery } from '../rigs/rigs.queries';
import { CataloguePicker } from './CataloguePicker';
import { CsvImport } from './CsvImport';
import { dailyTotals, loadWhPerDay, whToAh, type EnergyRig } from '../../domain/loads/energy';
import { LoadEditor } from './LoadEditor';
import { blankLoad, loadToForm, type LoadFormOutput } from '../../domain/loads/load-form';
import { createLoad, deleteLoad, loadsCsvUrl, updateLoad } from './loads.api';
import { loadKeys, loadsQuery } from './loads.queries';
import { describeWindows } from '../../domain/loads/windows';
import { bankAmpsOfAc, wattsToAmps } from '../../domain/loads/draw';
import { DEFAULT_INVERTER_EFFICIENCY_PCT } from '../../domain/loads/energy';

type SortKey = 'added' | 'name' | 'watts' | 'supply' | 'duty' | 'wh';
const SORTS: { key: SortKey; label: string }[] = [
  { key: 'added', label: 'List order' },
  { key: 'name', label: 'Name' },
  { key: 'watts', label: 'Draw' },
  { key: 'supply', label: 'AC/DC' },
  { key: 'duty', label: 'Duty' },
  { key: 'wh', label: 'Energy a day' },
];

const DAYS_LABEL = { all: '', camp: 'camp days', drive: 'drive days' } as const;

// One table, stacked into cards below md: each cell shows its column name before it.
const TD = 'px-3 py-2 align-top max-md:flex max-md:flex-col max-md:p-0 max-md:text-left max-md:before:text-xs max-md:before:font-bold max-md:before:uppercase max-md:before:tracking-wide max-md:before:text-slate-text max-md:before:content-[attr(data-label)]';

/** The Loads section of a rig: the crew's shared load table with daily estimates, catalogue and CSV import/export. */
function LoadsTable({ rigId, units: unitsProp }: { rigId: string; units: Units }) {
  const units = toUnits(unitsProp);
  const qc = useQueryClient();
  const rig = useQuery(rigQuery(rigId));
  const loads = useQuery(loadsQuery(rigId));
  const [panel, setPanel] = useState<null | 'new' | 'catalogue' | 'csv'>(null);
  const [editing, setEditing] = useState<string | null>(null);
  const [sort, setSort] = useState<{ key: SortKey; dir: 'asc' | 'desc' }>({ key: 'added', dir: 'asc' });
  const [status, setStatus] = useState<string | null>(null);
  const [confirmDelete, setConfirmDelete] = useState<string | null>(null);
  const [rowMessage, setRowMessage] = useState<{ id: string; text: string } | null>(null);

  const energyRig: EnergyRig | null = rig.data ? { nominalVolts: nominalVoltsOf(rig.data.bank), inverter: rig.data.inverter } : null;

  const rows = useMemo(() => {
    const list = (loads.data ?? []).map((l, i) => ({ load: l, index: i, wh: energyRig ? loadWhPerDay(l, energyRig) : 0 }));
    const dir = sort.dir === 'asc' ? 1 : -1;
    const by: Record<SortKey, (a: (typeof list)[number], b: (typeof list)[number]) => number> = {
      added: (a, b) => (a.load.position ?? a.index) - (b.load.position ?? b.index),
      name: (a, b) => a.load.name.localeCompare(b.load.name),
      watts: (a, b) => a.load.watts * a.load.quantity - b.load.watts * b.load.quantity,
      supply: (a, b) => a.load.supply.localeCompare(b.load.supply),
      duty: (a, b) => a.load.dutyPct - b.load.dutyPct,
      wh: (a, b) => a.wh - b.wh,
    };
    return [...list].sort((a, b) => by[sort.key](a, b) * dir || a.index - b.index);
  }, [loads.data, sort, energyRig?.nominalVolts, energyRig?.inverter]);

  if (rig.isPending || loads.isPending) return <LoadingState label="Loading the loads…" />;
  if (rig.isError) return <ErrorState title="Could not load this rig." error={rig.error} onRetry={() => void rig.refetch()} />;
  if (loads.isError) return <ErrorState title="Could not load the load list." error={loads.error} onRetry={() => void loads.refetch()} />;

  const er = energyRig!;
  // A crew viewer reads the list; owners and editors change it.
  const canEdit = rig.data.canEdit !== false;
  const totals = dailyTotals(loads.data, er);
  const hasDriveOnly = loads.data.some((l) => l.days !== 'all');
  const key = loadKeys.list(rigId);
  const setList = (fn: (old: LoadDto[]) => LoadDto[]) => qc.setQueryData<LoadDto[]>(key, (old) => fn(old ?? []));
  const replace = (row: LoadDto) => setList((old) => old.map((l) => (l.id === row.id ? row : l)));

  const add = async (values: LoadFormOutput) => {
    const created = await createLoad(rigId, values);
    setList((old) => [...old, created]);
    setStatus(`Added ${created.name}.`);
  };

  const toggleSort = (k: SortKey) => setSort((s) => (s.key === k ? { key: k, dir: s.dir === 'asc' ? 'desc' : 'asc' } : { key: k, dir: k === 'wh' || k === 'watts' ? 'desc' : 'asc' }));

  const remove = async (l: LoadDto, version = l.version) => {
    setRowMessage(null);
    try {
      await deleteLoad(l.id, version);
      setList((old) => old.filter((x) => x.id !== l.id));
      setConfirmDelete(null);
      setStatus(`Deleted ${l.name}.`);
    } catch (e) {
      if (isConflict(e)) {
        const current = e.current<LoadDto>();
        if (current) replace(current);
        setRowMessage({ id: l.id, text: 'Someone changed this load since you loaded the list; the row now shows their version. Delete it anyway?' });
      } else if (isNotFound(e)) {
        setList((old) => old.filter((x) => x.id !== l.id));
        setStatus(`${l.name} was already deleted.`);
      } else setRowMessage({ id: l.id, text: e instanceof Error ? e.message : 'Could not delete the load.' });
    }
  };

  const header = (k: SortKey, label: string, className = '') => (
    <th scope="col" aria-sort={sort.key === k ? (sort.dir === 'asc' ? 'ascending' : 'descending') : undefined} className={`px-3 py-2 ${className}`}>
      <button type="button" onClick={() => toggleSort(k)} className="inline-flex items-center gap-1 whitespace-nowrap font-extrabold hover:text-ember-deep">
        {label}
        <span aria-hidden="true" className="text-xs">{sort.key === k ? (sort.dir === 'asc' ? '▲' : '▼') : '↕'}</span>
      </button>
    </th>
  );

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-xl">Loads</h2>
          <p className="text-slate-text">
            {loads.data.length ? (
              <>
                About <strong className="text-dusk">{formatWh(totals.camp.wh)}</strong> · <strong className="text-dusk">{formatAh(totals.camp.ah)}</strong> on a camp day at {formatNumber(er.nominalVolts, 1)} V
              </>
            ) : (
              'Shared by everyone in the crew.'
            )}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {canEdit ? (<>
          <button type="button" className="btn btn-primary" onClick={() => { setPanel('catalogue'); setStatus(null); }} aria-expanded={panel === 'catalogue'}>+ From the catalogue</button>
          <button type="button" className="btn btn-quiet" onClick={() => { setPanel('new'); setStatus(null); }} aria-expanded={panel === 'new'}>+ Add a load</button>
          <button type="button" className="btn btn-quiet" onClick={() => { setPanel('csv'); setStatus(null); }} aria-expanded={panel === 'csv'}>Import CSV</button>
          </>) : null}
          {loads.data.length ? <a className="btn btn-quiet" href={loadsCsvUrl(rigId)} download>Export CSV</a> : null}
        </div>
      </div>

      {!canEdit ? <p className="text-sm text-slate-text">You can view this list. A crew owner or editor can change it.</p> : null}
      <p role="status" aria-live="polite" className={status ? 'font-semibold text-moss-deep' : 'sr-only'}>{status ?? ''}</p>

      {panel === 'new' ? (
        <LoadEditor idPrefix="new-load" initial={blankLoad()} units={units} rig={er} title="New load" submitLabel="Add load"
          save={async (v) => { await add(v); setPanel(null); }} onCancel={() => setPanel(null)} />
      ) : null}
      {panel === 'catalogue' ? <CataloguePicker units={units} rig={er} add={add} onClose={() => setPanel(null)} /> : null}
      {panel === 'csv' ? (
        <CsvImport rigId={rigId} onClose={() => setPanel(null)} onImported={(n, removed) => {
          void qc.invalidateQueries({ queryKey: key });
          setPanel(null);
          setStatus(removed > 0 ? `Replaced ${removed} ${removed === 1 ? 'load' : 'loads'} with the ${n} imported.` : `Imported ${n} ${n === 1 ? 'load' : 'loads'}.`);
        }} />
      ) : null}

      {loads.data.length === 0 ? (
        <EmptyState title="No loads yet">
          <p>List every appliance with its draw and when it runs — and the standby draw that runs all the time, the one people forget. Start from the catalogue of typical appliances, add your own, or import a CSV.</p>
        </EmptyState>
      ) : (
        <>
          <div className="flex items-center gap-2 md:hidden">
            <label htmlFor="loads-sort" className="text-sm font-bold">Sort by</label>
            <select id="loads-sort" className="field-input w-auto min-h-[40px] py-1" value={`${sort.key}:${sort.dir}`} onChange={(e) => { const [k, d] = e.target.value.split(':'); setSort({ key: k as SortKey, dir: d as 'asc' | 'desc' }); }}>
              {SORTS.flatMap((s) => [
                <option key={`${s.key}:asc`} value={`${s.key}:asc`}>{s.label}{s.key === 'added' ? '' : ' ↑'}</option>,
                ...(s.key === 'added' ? [] : [<option key={`${s.key}:desc`} value={`${s.key}:desc`}>{s.label} ↓</option>]),
              ])}
            </select>
          </div>
          <div id="loads-table-box" className="md:overflow-x-auto md:rounded-[14px] md:bg-card md:shadow-soft">
          <table className="w-full max-md:block" aria-label="Loads">
            <thead className="max-md:hidden">
              <tr className="border-b-2 border-sand-dark bg-sand/60 text-left text-sm">
                {header('name', 'Load')}
                {header('watts', 'Draw', 'text-right')}
                {header('supply', 'Supply')}
                <th scope="col" className="px-3 py-2 font-extrabold">When</th>
                {header('duty', 'Duty', 'text-right')}
                <th scope="col" className="px-3 py-2 font-extrabold">Temperature</th>
                {header('wh', 'Wh/day', 'text-right')}
                <th scope="col" className="px-3 py-2 text-right font-extrabold">Ah/day</th>
                <th scope="col" className="px-3 py-2"><span className="sr-only">Actions</span></th>
              </tr>
            </thead>
            <tbody className="max-md:block max-md:space-y-3">
              {rows.map(({ load: l, wh }) =>
                editing === l.id ? (
                  <tr key={l.id} className="max-md:block">
                    <td colSpan={9} className="p-2 max-md:block max-md:p-0">
                      <LoadEditor
                        idPrefix={`load-${l.id}`}
                        initial={loadToForm(l)}
                        units={units}
                        rig={er}
                        title={`Edit ${l.name}`}
                        submitLabel="Save load"
                        save={async (v, version) => {
                          const saved = await updateLoad(l.id, { ...v, version: version ?? l.version });
                          replace(saved);
                          setEditing(null);
                          setStatus(`Saved ${saved.name}.`);
                        }}
                        onCancel={() => setEditing(null)}
                        onTakeTheirs={(current) => {
                          replace(current);
                          setEditing(null);
                          setStatus(`Showing the other version of ${current.name}.`);
                        }}
                        addAsNew={async (v) => {
                          setList((old) => old.filter((x) => x.id !== l.id));
                          await add(v);
                          setEditing(null);
                        }}
                      />
                    </td>
                  </tr>
                ) : (
                  <tr key={l.id} className="border-b border-sand-dark last:border-0 max-md:grid max-md:grid-cols-2 max-md:gap-x-4 max-md:gap-y-2 max-md:rounded-[14px] max-md:border-0 max-md:bg-card max-md:p-4 max-md:shadow-soft" data-load-row={l.name}>
                    <td className="px-3 py-2 align-top max-md:col-span-2 max-md:block max-md:p-0 md:min-w-40">
                      <span className="font-bold">{l.name}</span>
                      {l.standby ? <span className="ml-2 rounded-full bg-sand-dark px-2 py-0.5 text-xs font-bold">standby</span> : null}
                      {l.note ? <span className="block text-sm text-slate-text">{l.note}</span> : null}
                      {l.addedBy ? <span className="block text-xs text-slate-text">added by {l.addedBy.name}</span> : null}
                    </td>
                    <td data-label="Draw" className={`${TD} text-right tabular-nums md:min-w-40`}>
                      <span className="md:whitespace-nowrap">{l.quantity !== 1 ? `${l.quantity} × ` : ''}{formatNumber(l.watts, 1)} W</span>
                      <span className="block text-sm text-slate-text">
                        {l.supply === 'ac'
                          ? `≈ ${formatNumber(bankAmpsOfAc(l.watts, er.nominalVolts, er.inverter?.efficiencyPct ?? DEFAULT_INVERTER_EFFICIENCY_PCT), 1)} A from the bank`
                          : `${formatNumber(wattsToAmps(l.watts, 'dc', er.nominalVolts, 120), 2)} A at ${formatNumber(er.nominalVolts, 1)} V`}
                      </span>
                      {l.surgeWatts ? <span className="block text-sm text-slate-text">surge {formatWatts(l.surgeWatts)}</span> : null}
                    </td>
                    <td data-label="Supply" className={TD}>{l.supply === 'ac' ? 'AC' : 'DC'}<span className="block text-sm text-slate-text">{l.location === 'outside' ? 'outside' : 'cabin'}</span></td>
                    <td data-label="When" className={`${TD} md:min-w-36`}>{l.standby ? 'always' : describeWindows(l.windows)}{DAYS_LABEL[l.days] ? `, ${DAYS_LABEL[l.days]}` : ''}</td>
                    <td data-label="Duty" className={`${TD} text-right tabular-nums md:whitespace-nowrap`}>{formatNumber(l.dutyPct)} %</td>
                    <td data-label="Temperature" className={`${TD} max-md:col-span-2 ${l.response === 'none' ? 'max-md:hidden' : ''}`}>{l.response === 'none' ? '—' : l.response === 'cooling' ? 'cooling' : `heating below ${formatTemp(l.setpointC, units)}`}</td>
                    <td data-label="Wh/day" className={`${TD} text-right font-bold tabular-nums md:whitespace-nowrap`}>{formatWh(wh)}</td>
                    <td data-label="Ah/day" className={`${TD} text-right tabular-nums md:whitespace-nowrap`}>{formatAh(whToAh(wh, er.nominalVolts))}</td>
                    <td className="px-3 py-2 align-top max-md:col-span-2 max-md:block max-md:p-0">
                      {rowMessage?.id === l.id ? <p role="alert" className="mb-2 text-sm font-semibold text-alert">{rowMessage.text}</p> : null}
                      {!canEdit ? null : confirmDelete === l.id ? (
                        <span className="flex flex-wrap justify-end gap-2">
                          <button type="button" className="btn btn-primary min-h-[36px] px-3 py-1 text-sm" onClick={() => void remove(l, (loads.data.find((x) => x.id === l.id) ?? l).version)}>Delete</button>
                          <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => { setConfirmDelete(null); setRowMessage(null); }}>Keep</button>
                        </span>
                      ) : (
                        <span className="flex flex-wrap justify-end gap-2">
                          <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => { setEditing(l.id); setStatus(null); }} aria-label={`Edit ${l.name}`}>Edit</button>
                          <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => setConfirmDelete(l.id)} aria-label={`Delete ${l.name}`}>Delete</button>
                        </span>
                      )}
                    </td>
                  </tr>
                ),
              )}
            </tbody>
          </table>
          </div>

          <div className="card p-4" aria-label="Daily totals">
            <dl className="grid gap-x-6 gap-y-1 sm:grid-cols-[auto_1fr]">
              <dt className="font-bold">Camp day</dt>
              <dd className="tabular-nums"><strong>{formatWh(totals.camp.wh)}</strong> · <strong>{formatAh(totals.camp.ah)}</strong> at {formatNumber(er.nominalVolts, 1)} V{totals.camp.inverterIdleWh > 0 ? ` (incl. inverter idle ${formatWh(totals.camp.inverterIdleWh)})` : ''}</dd>
              {hasDriveOnly ? (
                <>
                  <dt className="font-bold">Drive day</dt>
                  <dd className="tabular-nums"><strong>{formatWh(totals.drive.wh)}</strong> · <strong>{formatAh(totals.drive.ah)}</strong></dd>
                </>
              ) : null}
            </dl>
            <p className="field-hint mt-2">
              Estimates before temperature response: a fridge runs more in heat and a furnace blower more in the cold. The forecast works that out hour by hour from each day’s weather.
            </p>
          </div>
        </>
      )}
    </div>
  );
}

export default withQueryClient(LoadsTable, { fallback: loadingFallback('Loading the loads…') });
