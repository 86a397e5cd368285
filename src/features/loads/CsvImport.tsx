import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { LOAD_CSV_COLUMNS } from '../../domain/loads/loads.schema';
import { ApiError, isConflict } from '../../lib/query-client';
import { formatNumber } from '../../lib/format';
import { importCsv, previewCsv, type CsvLineError, type CsvPreview } from './loads.api';
import { describeWindows } from '../../domain/loads/windows';
import { countLoads, importButtonLabel, type ImportMode } from '../../domain/loads/import-choice';

const EXAMPLE = `${LOAD_CSV_COLUMNS.join(',')}
Reading lights,1.5,4,dc,18-23,100,all,none,18,false,
Furnace blower,60,1,dc,18-8,100,all,heating,18,false,thermostat in the hall`;

/**
 * Import a load list from CSV: check it first (a preview with each line's problems), choose whether it
 * adds to the list or replaces it (replacing lists what goes and asks once more), then save all or nothing.
 */
export function CsvImport({ rigId, onImported, onClose }: { rigId: string; onImported: (imported: number, removed: number) => void; onClose: () => void }) {
  const [csv, setCsv] = useState('');
  const [mode, setMode] = useState<ImportMode>('add');
  const [preview, setPreview] = useState<CsvPreview | null>(null);
  const [checked, setChecked] = useState<{ text: string; mode: ImportMode } | null>(null);
  const [confirming, setConfirming] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  const check = useMutation({
    mutationFn: (v: { text: string; mode: ImportMode }) => previewCsv(rigId, v.text, v.mode),
    onMutate: () => setConfirming(false),
    onSuccess: (p, v) => {
      setPreview(p);
      setChecked(v);
    },
    onError: (e) => {
      setPreview(null);
      setProblem(e instanceof ApiError ? describeApiError(e) : 'Could not check the file. Try again.');
    },
  });
  const save = useMutation({
    mutationFn: (v: { text: string; mode: ImportMode; listVersion: string }) => importCsv(rigId, v.text, v.mode, v.listVersion),
    onSuccess: (r) => onImported(r.imported, r.removed),
    onError: (e, v) => {
      setConfirming(false);
      if (isConflict(e)) {
        // The list changed since the check: check again, so the list of what goes is the list as it is now.
        setProblem('Someone changed the load list since you checked the file; nothing was removed or imported. Here is what replacing it would remove now.');
        check.mutate({ text: v.text, mode: v.mode });
        return;
      }
      setProblem(e instanceof ApiError ? describeApiError(e) : 'Could not import the file. Nothing was saved; try again.');
    },
  });

  const errorsByLine = new Map<number, CsvLineError[]>();
  for (const e of preview?.errors ?? []) errorsByLine.set(e.line, [...(errorsByLine.get(e.line) ?? []), e]);
  const stale = preview !== null && (checked?.text !== csv || checked?.mode !== mode);
  const checkedLines = (checked?.text ?? '').split(/\r?\n/);
  const canImport = preview !== null && !stale && preview.errors.length === 0 && preview.rows.length > 0;
  const removing = preview?.list.loads ?? [];
  const runCheck = (m: ImportMode = mode) => {
    setProblem(null);
    check.mutate({ text: csv, mode: m });
  };
  const doImport = () => {
    if (!preview) return;
    if (mode === 'replace' && removing.length > 0 && !confirming) return setConfirming(true);
    setProblem(null);
    save.mutate({ text: csv, mode, listVersion: preview.list.version });
  };

  return (
    <section aria-labelledby="csv-heading" className="rounded-xl border-2 border-sand-dark bg-white p-3 sm:p-4">
      <div className="flex items-baseline justify-between gap-2">
        <h3 id="csv-heading" className="text-base font-extrabold">Import loads from CSV</h3>
        <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onClose}>Close</button>
      </div>
      <p className="field-hint">
        One load per line with the columns <code className="break-all">{LOAD_CSV_COLUMNS.join(',')}</code>. Windows are hours like <code>18-23;6-8</code>.
        Nothing is saved until you check the file and import it.
      </p>
      <div className="mt-3 grid gap-3">
        <div>
          <label className="field-label" htmlFor="csv-file">CSV file</label>
          <input
            id="csv-file"
            type="file"
            accept=".csv,text/csv"
            className="block w-full text-sm file:mr-3 file:rounded-lg file:border-0 file:bg-sand file:px-3 file:py-2 file:font-bold"
            onChange={async (e) => {
              const f = e.target.files?.[0];
              if (!f) return;
              if (f.size > 256 * 1024) return setProblem('That file is larger than 256 KB; a load list is usually a few KB. Check it is the right file.');
              setCsv(await f.text());
              setPreview(null);
              setConfirming(false);
            }}
          />
        </div>
        <div>
          <label className="field-label" htmlFor="csv-text">Or paste the CSV</label>
          <textarea id="csv-text" rows={5} className="field-input font-mono text-sm" value={csv} placeholder={EXAMPLE} onChange={(e) => { setCsv(e.target.value); setConfirming(false); }} spellCheck={false} />
        </div>
      </div>
      <fieldset className="mt-3">
        <legend className="field-label">What the import does</legend>
        <div className="flex flex-wrap gap-x-5 gap-y-1">
          {(
            [
              ['add', 'Add to the list', 'The file’s loads go after the loads already listed.'],
              ['replace', 'Replace the list', 'The loads listed now are removed and the file’s loads take their place.'],
            ] as const
          ).map(([value, label, hint]) => (
            <div key={value} className="max-w-xs py-1">
              <label className="flex min-h-[40px] items-center gap-2 font-bold">
                <input
                  type="radio"
                  name="csv-mode"
                  value={value}
                  className="accent-ember"
                  checked={mode === value}
                  aria-describedby={`csv-mode-${value}-hint`}
                  onChange={() => {
                    setMode(value);
                    setConfirming(false);
                    // A checked file is checked again: the room left and what would be removed differ by mode.
                    if (preview && checked?.text === csv) runCheck(value);
                  }}
                />
                {label}
              </label>
              <p id={`csv-mode-${value}-hint`} className="pl-6 text-sm text-slate-text">{hint}</p>
            </div>
          ))}
        </div>
      </fieldset>
      {problem ? <p role="alert" className="caution mt-3 font-semibold text-alert">{problem}</p> : null}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn btn-quiet" disabled={!csv.trim() || check.isPending} onClick={() => runCheck()}>
          {check.isPending ? 'Checking…' : 'Check the file'}
        </button>
        {confirming ? null : (
          <button type="button" className="btn btn-primary" disabled={!canImport || save.isPending} onClick={doImport}>
            {save.isPending
              ? 'Importing…'
              : preview && !stale && preview.errors.length === 0
                ? importButtonLabel(mode, preview.rows.length, removing.length)
                : 'Import'}
          </button>
        )}
      </div>
      {stale ? <p className="field-hint mt-2">{checked?.text !== csv ? 'The text changed since the check' : 'The choice changed since the check'}: check it again before importing.</p> : null}
      {confirming && preview && !stale ? (
        <div role="alertdialog" aria-labelledby="csv-replace-heading" aria-describedby="csv-replace-what" className="caution mt-3">
          <p id="csv-replace-heading" className="font-bold text-alert">Replace the whole load list?</p>
          <p id="csv-replace-what" className="mt-1 text-sm">
            These {countLoads(removing.length)} will be removed for everyone in the crew, and the file’s {countLoads(preview.rows.length)} added in their place:
          </p>
          <ul className="mt-1 list-disc pl-5 text-sm" aria-label="Loads that will be removed">
            {removing.map((l) => <li key={l.id}>{l.name}</li>)}
          </ul>
          <div className="mt-2 flex flex-wrap gap-2">
            <button type="button" className="btn btn-primary min-h-[36px] px-3 py-1 text-sm" disabled={save.isPending} onClick={doImport}>
              {save.isPending ? 'Replacing…' : 'Replace the list'}
            </button>
            <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => setConfirming(false)}>Keep the list</button>
          </div>
        </div>
      ) : null}
      {preview && !stale && mode === 'add' && preview.alreadyListed.length > 0 ? (
        <div role="status" className="caution mt-3 text-sm">
          <p className="font-bold">
            {preview.alreadyListed.length === preview.rows.length ? 'Every load in this file is' : `${countLoads(preview.alreadyListed.length)} in this file ${preview.alreadyListed.length === 1 ? 'is' : 'are'}`} already in the list by name:
            {' '}{preview.alreadyListed.slice(0, 6).map((r) => r.name).join(', ')}{preview.alreadyListed.length > 6 ? `, and ${preview.alreadyListed.length - 6} more` : ''}.
          </p>
          <p>Adding gives two of each. To start over from the file instead, choose “Replace the list”.</p>
        </div>
      ) : null}

      {preview && !stale ? (
        <div className="mt-4" aria-live="polite">
          {preview.errors.length ? (
            <div role="alert" className="caution">
              <p className="font-bold text-alert">
                {preview.errors.length} {preview.errors.length === 1 ? 'problem' : 'problems'} — fix {errorsByLine.size === 1 ? 'this line' : 'these lines'} and check again. Nothing was saved.
              </p>
              <ul className="mt-1 list-disc pl-5 text-sm">
                {preview.errors.map((e, i) => (
                  <li key={i}>Line {e.line}{e.column ? `, ${e.column}` : ''}: {e.message}</li>
                ))}
              </ul>
            </div>
          ) : (
            <p className="font-bold text-moss-deep">
              All {preview.rows.length} lines read cleanly. Check the preview, then {mode === 'replace' ? `replace the list${removing.length ? ` (${countLoads(removing.length)} now)` : ''}` : 'add them to the list'}.
            </p>
          )}
          <div className="mt-2 overflow-x-auto">
            <table className="w-full text-sm" aria-label="CSV preview">
              <thead>
                <tr className="border-b-2 border-sand-dark text-left">
                  <th className="py-1 pr-2">Line</th><th className="py-1 pr-2">Name</th><th className="py-1 pr-2 text-right">W</th><th className="py-1 pr-2 text-right">Qty</th>
                  <th className="py-1 pr-2 max-sm:hidden">Supply</th><th className="py-1 pr-2">When</th><th className="py-1 text-right max-sm:hidden">Duty</th>
                </tr>
              </thead>
              <tbody>
                {previewLines(preview).map(({ line, row }) => {
                  const errs = errorsByLine.get(line) ?? [];
                  if (errs.length) {
                    return (
                      <tr key={line} className="border-b border-sand-dark bg-[#fbe9e4] align-top">
                        <td className="py-1 pr-2 tabular-nums">{line}</td>
                        <td colSpan={6} className="py-1">
                          <code className="block break-all text-xs">{checkedLines[line - 1] ?? ''}</code>
                          <span className="font-semibold text-alert">{errs.map((e) => `${e.column ? `${e.column}: ` : ''}${e.message}`).join('; ')}</span>
                        </td>
                      </tr>
                    );
                  }
                  return (
                    <tr key={line} className="border-b border-sand-dark">
                      <td className="py-1 pr-2 tabular-nums">{line}</td>
                      <td className="py-1 pr-2">{row?.name ?? '—'}</td>
                      <td className="py-1 pr-2 text-right tabular-nums">{typeof row?.watts === 'number' ? formatNumber(row.watts, 1) : '—'}</td>
                      <td className="py-1 pr-2 text-right tabular-nums">{row?.quantity ?? 1}</td>
                      <td className="py-1 pr-2 max-sm:hidden">{row?.supply ? row.supply.toUpperCase() : 'DC'}</td>
                      <td className="py-1 pr-2">{row?.windows ? describeWindows(row.windows as [number, number][]) : 'all day'}</td>
                      <td className="py-1 text-right tabular-nums max-sm:hidden">{typeof row?.dutyPct === 'number' ? `${formatNumber(row.dutyPct)} %` : '100 %'}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        </div>
      ) : null}
    </section>
  );
}

/** Lines of the preview in order: readable rows and lines that only have errors. Line 1 is the header. */
function previewLines(p: CsvPreview) {
  const byLine = new Map<number, CsvPreview['rows'][number] | null>();
  p.rows.forEach((row, i) => byLine.set(typeof row.line === 'number' ? row.line : i + 2, row));
  for (const e of p.errors) if (!byLine.has(e.line)) byLine.set(e.line, null);
  return [...byLine.entries()].sort((a, b) => a[0] - b[0]).map(([line, row]) => ({ line, row }));
}

function describeApiError(e: ApiError): string {
  if (!e.issues.length) return e.message;
  return `${e.message} ${e.issues.map((i) => `${i.path.replace(/^line (\d+)\./, 'Line $1, ')}: ${i.message}`).join('; ')}`;
}
