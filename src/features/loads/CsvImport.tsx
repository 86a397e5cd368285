import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { LOAD_CSV_COLUMNS } from '../../domain/loads/loads.schema';
import { ApiError } from '../../lib/query-client';
import { formatNumber } from '../../lib/format';
import { importCsv, previewCsv, type CsvLineError, type CsvPreview } from './loads.api';
import { describeWindows } from '../../domain/loads/windows';

const EXAMPLE = `${LOAD_CSV_COLUMNS.join(',')}
Reading lights,1.5,4,dc,18-23,100,all,none,18,false,
Furnace blower,60,1,dc,18-8,100,all,heating,18,false,thermostat in the hall`;

/** Import a load list from CSV: check it first (a preview with each line's problems), then save all or nothing. */
export function CsvImport({ rigId, onImported, onClose }: { rigId: string; onImported: (n: number) => void; onClose: () => void }) {
  const [csv, setCsv] = useState('');
  const [preview, setPreview] = useState<CsvPreview | null>(null);
  const [checkedText, setCheckedText] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  const check = useMutation({
    mutationFn: (text: string) => previewCsv(rigId, text),
    onMutate: () => setProblem(null),
    onSuccess: (p, text) => {
      setPreview(p);
      setCheckedText(text);
    },
    onError: (e) => {
      setPreview(null);
      setProblem(e instanceof ApiError ? describeApiError(e) : 'Could not check the file. Try again.');
    },
  });
  const save = useMutation({
    mutationFn: (text: string) => importCsv(rigId, text),
    onSuccess: (r) => onImported(r.imported),
    onError: (e) => setProblem(e instanceof ApiError ? describeApiError(e) : 'Could not import the file. Nothing was saved; try again.'),
  });

  const errorsByLine = new Map<number, CsvLineError[]>();
  for (const e of preview?.errors ?? []) errorsByLine.set(e.line, [...(errorsByLine.get(e.line) ?? []), e]);
  const stale = preview !== null && checkedText !== csv;
  const checkedLines = (checkedText ?? '').split(/\r?\n/);
  const canImport = preview !== null && !stale && preview.errors.length === 0 && preview.rows.length > 0;

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
            }}
          />
        </div>
        <div>
          <label className="field-label" htmlFor="csv-text">Or paste the CSV</label>
          <textarea id="csv-text" rows={5} className="field-input font-mono text-sm" value={csv} placeholder={EXAMPLE} onChange={(e) => setCsv(e.target.value)} spellCheck={false} />
        </div>
      </div>
      {problem ? <p role="alert" className="caution mt-3 font-semibold text-alert">{problem}</p> : null}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn btn-quiet" disabled={!csv.trim() || check.isPending} onClick={() => check.mutate(csv)}>
          {check.isPending ? 'Checking…' : 'Check the file'}
        </button>
        <button type="button" className="btn btn-primary" disabled={!canImport || save.isPending} onClick={() => save.mutate(csv)}>
          {save.isPending
            ? 'Importing…'
            : preview && !stale && preview.errors.length === 0
              ? `Import ${preview.rows.length} ${preview.rows.length === 1 ? 'load' : 'loads'}`
              : 'Import'}
        </button>
      </div>
      {stale ? <p className="field-hint mt-2">The text changed since the check: check it again before importing.</p> : null}

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
            <p className="font-bold text-moss-deep">All {preview.rows.length} lines read cleanly. Check the preview, then import.</p>
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
