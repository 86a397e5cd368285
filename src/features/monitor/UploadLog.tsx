import { useEffect, useRef, useState } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ApiError } from '../../lib/query-client';
import { ErrorState } from '../../components/ui/States';
import type { DetectedMapping } from '../../domain/monitor/detect';
import { mappingSchema, TIME_FORMATS, type Delimiter, type TimeFormat } from '../../domain/monitor/monitor.schema';
import { timeExample } from '../../domain/monitor/time';
import { previewLog, saveLog, type PreviewAnswer } from './monitor.api';
import { monitorKeys } from './monitor.queries';
import { formatBytes, formatReadingTime } from '../../lib/format';
import { tempUnit, toDisplayTemp, type Units } from '../../lib/units';

/** The browser's own IANA zone (the camper's, usually), for a new upload. */
function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}

const MAX_BYTES = 10 * 1024 * 1024;
const DELIMITER_NAMES: Record<Delimiter, string> = { ',': 'Comma ,', ';': 'Semicolon ;', '\t': 'Tab', '|': 'Bar |' };
const FORMAT_NAMES: Record<TimeFormat, string> = {
  iso: 'Year-month-day',
  dmy: 'Day first',
  mdy: 'Month first',
  ymd: 'Year/month/day',
  'epoch-s': 'Seconds since 1970',
  'epoch-ms': 'Milliseconds since 1970',
};

/** Step 1 and 2 of a monitor-log upload: read the file, confirm or change the columns, save. */
export default function UploadLog({ rigId, onSaved, units = 'metric' }: { rigId: string; onSaved: (id: string) => void; units?: Units }) {
  const qc = useQueryClient();
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [timeZone, setTimeZone] = useState('UTC');
  const [mapping, setMapping] = useState<DetectedMapping | null>(null);
  const [preview, setPreview] = useState<PreviewAnswer | null>(null);
  const inputRef = useRef<HTMLInputElement>(null);
  useEffect(() => setTimeZone(browserTimeZone()), []);

  const read = useMutation({
    mutationFn: (v: { file: File; mapping: DetectedMapping | null; timeZone: string }) => previewLog(rigId, v.file, v.timeZone, v.mapping),
    onSuccess: (p) => {
      setPreview(p);
      setMapping(p.mapping);
    },
  });
  const save = useMutation({
    mutationFn: () => saveLog(rigId, file!, mappingSchema.parse(mapping)),
    onSuccess: (log) => {
      qc.invalidateQueries({ queryKey: monitorKeys.list(rigId) });
      onSaved(log.id);
      setFile(null);
      setPreview(null);
      setMapping(null);
      if (inputRef.current) inputRef.current.value = '';
    },
  });

  // A changed column choice is read again (after a pause, so typing a header line does not send every key).
  const [edited, setEdited] = useState(0);
  useEffect(() => {
    if (!edited || !file || !mapping) return;
    const t = setTimeout(() => read.mutate({ file, mapping, timeZone: mapping.timeZone }), 450);
    return () => clearTimeout(t);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [edited]);

  const change = (m: DetectedMapping) => {
    setMapping(m);
    setEdited((n) => n + 1);
  };

  const choose = (f: File | null) => {
    setPreview(null);
    setMapping(null);
    save.reset();
    if (!f) return setFile(null);
    if (f.size > MAX_BYTES) {
      setFile(null);
      setFileError(`This file is ${formatBytes(f.size)}; at most 10 MB. Export a shorter stretch of the log (a trip at a time).`);
      return;
    }
    if (f.size === 0) {
      setFile(null);
      setFileError('This file is empty.');
      return;
    }
    setFileError(null);
    setFile(f);
    read.mutate({ file: f, mapping: null, timeZone });
  };

  const checked = mapping ? mappingSchema.safeParse(mapping) : null;
  const mappingIssues = checked && !checked.success ? checked.error.issues.map((i) => `${i.path.join('.') || 'mapping'}: ${i.message}`) : [];
  const canSave = Boolean(file && preview && checked?.success && preview.errorCount === 0 && !read.isPending);

  return (
    <section className="card space-y-4 p-4" aria-labelledby="upload-log-title">
      <div>
        <h3 id="upload-log-title" className="text-lg">Upload a monitor log</h3>
        <p className="text-sm text-slate-text">The CSV your battery monitor (shunt) or BMS exports: time, voltage, current, state of charge, temperature. Up to 10 MB. Nothing is saved until you confirm the columns.</p>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <label htmlFor="log-file" className="field-label">CSV file</label>
          <input
            ref={inputRef}
            id="log-file"
            type="file"
            accept=".csv,.txt,.tsv,text/csv,text/plain"
            className="field-input file:mr-3 file:rounded-lg file:border-0 file:bg-sand file:px-3 file:py-1.5 file:font-bold"
            onChange={(e) => choose(e.target.files?.[0] ?? null)}
            aria-invalid={fileError ? true : undefined}
            aria-describedby={fileError ? 'log-file-error' : undefined}
          />
          {fileError ? <p id="log-file-error" className="field-error" role="alert">{fileError}</p> : null}
        </div>
        <div>
          <label htmlFor="log-tz" className="field-label">Time zone of the log’s clock</label>
          <input
            id="log-tz"
            className="field-input"
            value={mapping?.timeZone ?? timeZone}
            onChange={(e) => (mapping ? change({ ...mapping, timeZone: e.target.value.trim() }) : setTimeZone(e.target.value.trim()))}
            aria-describedby="log-tz-hint"
          />
          <p id="log-tz-hint" className="field-hint mt-1">An IANA zone such as America/Denver. Times without an offset are read in it, and “night” is 01:00–05:00 there.</p>
        </div>
      </div>

      {read.isPending ? <p role="status" className="text-slate-text">Reading the file…</p> : null}
      {read.isError ? <ErrorState error={read.error} title="The file could not be read." /> : null}
      {read.error instanceof ApiError && read.error.issues.length ? <IssueList issues={read.error.issues.map((i) => `${i.path}: ${i.message}`)} /> : null}

      {preview && mapping ? (
        <>
          <Detected preview={preview} />
          <MappingForm mapping={mapping} headers={preview.headers} onChange={change} />
          {mappingIssues.length ? <IssueList issues={mappingIssues} /> : null}
          <PreviewTable preview={preview} timeZone={mapping.timeZone} units={units} />
          <div className="flex flex-wrap items-center gap-3">
            <button type="button" className="btn btn-primary" disabled={!canSave || save.isPending} onClick={() => save.mutate()}>
              {save.isPending ? 'Saving…' : `Save this log (${preview.count.toLocaleString('en-GB')} readings)`}
            </button>
            {!canSave && preview.errorCount > 0 ? <span className="text-sm font-semibold text-alert">Fix the problems above (or the column choices) to save.</span> : null}
          </div>
          {save.isError ? <ErrorState error={save.error} title="The log was not saved." /> : null}
          {save.error instanceof ApiError && save.error.issues.length ? <IssueList issues={save.error.issues.slice(0, 20).map((i) => `${i.path}: ${i.message}`)} /> : null}
        </>
      ) : null}
    </section>
  );
}

function IssueList({ issues }: { issues: string[] }) {
  return (
    <ul className="caution list-inside list-disc text-sm" role="alert">
      {issues.map((i) => (
        <li key={i}>{i}</li>
      ))}
    </ul>
  );
}

function Detected({ preview }: { preview: PreviewAnswer }) {
  if (!preview.notes.length && !preview.warnings.length) return null;
  return (
    <div className="rounded-xl bg-sand p-3 text-sm">
      <p className="font-bold">{preview.detected ? 'How we read it — check and change anything that is wrong:' : 'Read with your column choices:'}</p>
      <ul className="mt-1 list-inside list-disc">
        {[...preview.notes, ...preview.warnings].map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
    </div>
  );
}

function ColumnSelect({ id, label, value, headers, onChange, optional = true }: { id: string; label: string; value: number | null; headers: string[]; onChange: (v: number | null) => void; optional?: boolean }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">{label}</label>
      <select id={id} className="field-input" value={value === null ? '' : String(value)} onChange={(e) => onChange(e.target.value === '' ? null : Number(e.target.value))}>
        {optional ? <option value="">— none —</option> : <option value="" disabled>Choose a column</option>}
        {headers.map((h, i) => (
          <option key={i} value={i}>{`${i + 1} · ${h}`}</option>
        ))}
      </select>
    </div>
  );
}

function Choice<T extends string>({ id, label, value, options, onChange }: { id: string; label: string; value: T; options: [T, string][]; onChange: (v: T) => void }) {
  return (
    <div>
      <label htmlFor={id} className="field-label">{label}</label>
      <select id={id} className="field-input" value={value} onChange={(e) => onChange(e.target.value as T)}>
        {options.map(([v, l]) => (
          <option key={v} value={v}>{l}</option>
        ))}
      </select>
    </div>
  );
}

/** Every choice of the mapping, each a labelled control. */
function MappingForm({ mapping: m, headers, onChange }: { mapping: DetectedMapping; headers: string[]; onChange: (m: DetectedMapping) => void }) {
  const time = m.time ?? { column: 0, dateColumn: null, format: 'iso' as TimeFormat };
  return (
    <fieldset className="space-y-4 rounded-xl border-[1.5px] border-sand-dark p-3">
      <legend className="px-1 font-bold">Columns</legend>
      <div className="grid gap-3 sm:grid-cols-3">
        <Choice id="map-delimiter" label="Separator" value={m.delimiter} options={(Object.keys(DELIMITER_NAMES) as Delimiter[]).map((d) => [d, DELIMITER_NAMES[d]])} onChange={(delimiter) => onChange({ ...m, delimiter })} />
        <Choice id="map-decimal" label="Decimal mark" value={m.decimal} options={[['.', 'Point 12.8'], [',', 'Comma 12,8']]} onChange={(decimal) => onChange({ ...m, decimal })} />
        <div>
          <label htmlFor="map-header" className="field-label">Header on line</label>
          <input id="map-header" className="field-input" inputMode="numeric" value={String(m.headerLine)} onChange={(e) => onChange({ ...m, headerLine: Math.max(0, Math.min(1000, Math.floor(Number(e.target.value) || 0))) })} aria-describedby="map-header-hint" />
          <p id="map-header-hint" className="field-hint mt-1">0 when the file has no header row.</p>
        </div>
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <ColumnSelect id="map-time" label="Time" value={m.time ? m.time.column : null} headers={headers} optional={false} onChange={(c) => onChange({ ...m, time: c === null ? null : { ...time, column: c } })} />
        <ColumnSelect id="map-date" label="Date (when in its own column)" value={m.time?.dateColumn ?? null} headers={headers} onChange={(c) => onChange({ ...m, time: { ...time, dateColumn: c } })} />
        <Choice id="map-format" label="Time format" value={time.format} options={TIME_FORMATS.map((f) => [f, `${FORMAT_NAMES[f]} — ${timeExample(f)}`])} onChange={(format) => onChange({ ...m, time: { ...time, format } })} />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="grid grid-cols-[1fr_auto] gap-2">
          <ColumnSelect id="map-voltage" label="Voltage" value={m.voltage?.column ?? null} headers={headers} onChange={(c) => onChange({ ...m, voltage: c === null ? null : { column: c, unit: m.voltage?.unit ?? 'V' } })} />
          <Choice id="map-voltage-unit" label="Unit" value={m.voltage?.unit ?? 'V'} options={[['V', 'V'], ['mV', 'mV']]} onChange={(unit) => m.voltage && onChange({ ...m, voltage: { ...m.voltage, unit } })} />
        </div>
        <div className="grid grid-cols-[1fr_auto] gap-2">
          <ColumnSelect id="map-soc" label="State of charge" value={m.soc?.column ?? null} headers={headers} onChange={(c) => onChange({ ...m, soc: c === null ? null : { column: c, unit: m.soc?.unit ?? '%' } })} />
          <Choice id="map-soc-unit" label="Unit" value={m.soc?.unit ?? '%'} options={[['%', '%'], ['‰', '‰']]} onChange={(unit) => m.soc && onChange({ ...m, soc: { ...m.soc, unit } })} />
        </div>
        <div className="grid grid-cols-[1fr_auto] gap-2">
          <ColumnSelect id="map-current" label="Current" value={m.current?.column ?? null} headers={headers} onChange={(c) => onChange({ ...m, current: c === null ? null : { column: c, unit: m.current?.unit ?? 'A', sign: m.current?.sign ?? 'charge-positive' } })} />
          <Choice id="map-current-unit" label="Unit" value={m.current?.unit ?? 'A'} options={[['A', 'A'], ['mA', 'mA']]} onChange={(unit) => m.current && onChange({ ...m, current: { ...m.current, unit } })} />
        </div>
        <div className="grid grid-cols-[1fr_auto] gap-2">
          <ColumnSelect id="map-temp" label="Temperature (optional)" value={m.temperature?.column ?? null} headers={headers} onChange={(c) => onChange({ ...m, temperature: c === null ? null : { column: c, unit: m.temperature?.unit ?? 'C' } })} />
          <Choice id="map-temp-unit" label="Unit" value={m.temperature?.unit ?? 'C'} options={[['C', '°C'], ['F', '°F']]} onChange={(unit) => m.temperature && onChange({ ...m, temperature: { ...m.temperature, unit } })} />
        </div>
      </div>
      {m.current ? (
        <fieldset>
          <legend className="field-label">A positive current means</legend>
          <div className="flex flex-wrap gap-2">
            {(
              [
                ['charge-positive', 'Charging (the draw is negative)'],
                ['discharge-positive', 'The draw (charging is negative)'],
              ] as const
            ).map(([v, l]) => (
              <label key={v} className={`flex min-h-[44px] cursor-pointer items-center gap-2 rounded-[10px] border-[1.5px] px-3 text-sm ${m.current!.sign === v ? 'border-ember bg-[#fbf1e6]' : 'border-sand-dark bg-white'}`}>
                <input type="radio" name="map-sign" value={v} checked={m.current!.sign === v} onChange={() => onChange({ ...m, current: { ...m.current!, sign: v } })} className="accent-ember" />
                {l}
              </label>
            ))}
          </div>
        </fieldset>
      ) : null}
    </fieldset>
  );
}

function PreviewTable({ preview, timeZone, units }: { preview: PreviewAnswer; timeZone: string; units: Units }) {
  const n = (x: number | null, d: number) => (x === null ? '—' : x.toFixed(d));
  return (
    <div className="space-y-2">
      <p className="text-sm font-semibold" data-testid="preview-summary">
        {preview.count > 0 && preview.from !== null && preview.to !== null
          ? `${preview.count.toLocaleString('en-GB')} readings from ${formatReadingTime(preview.from, timeZone, true)} to ${formatReadingTime(preview.to, timeZone, true)}.`
          : 'No readings could be read yet.'}
      </p>
      {preview.sample.length ? (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="First readings (scrolls sideways)">
          <table className="w-full min-w-[32rem] text-left text-sm">
            <caption className="sr-only">The first readings as they will be saved</caption>
            <thead>
              <tr className="border-b border-sand-dark">
                <th scope="col" className="py-1 pr-3">Line</th>
                <th scope="col" className="py-1 pr-3">Time</th>
                <th scope="col" className="py-1 pr-3 text-right">Volts</th>
                <th scope="col" className="py-1 pr-3 text-right">Amps (+ charging)</th>
                <th scope="col" className="py-1 pr-3 text-right">SOC %</th>
                <th scope="col" className="py-1 text-right">{tempUnit(units)}</th>
              </tr>
            </thead>
            <tbody>
              {preview.sample.slice(0, 6).map((s) => (
                <tr key={s.line} className="border-b border-sand">
                  <td className="py-1 pr-3 text-slate-text">{s.line}</td>
                  <td className="py-1 pr-3">{formatReadingTime(s.t, timeZone)}</td>
                  <td className="py-1 pr-3 text-right">{n(s.volts, 2)}</td>
                  <td className="py-1 pr-3 text-right">{s.amps === null ? '—' : `${s.amps > 0 ? '+' : ''}${s.amps.toFixed(2)}`}</td>
                  <td className="py-1 pr-3 text-right">{n(s.socPct, 1)}</td>
                  <td className="py-1 text-right">{n(s.tempC === null ? null : toDisplayTemp(s.tempC, units), 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {preview.errorCount > 0 ? (
        <div className="caution text-sm" role="alert" data-testid="preview-errors">
          <p className="font-bold">
            {preview.errorCount === 1 ? '1 problem' : `${preview.errorCount.toLocaleString('en-GB')} problems`} — nothing is saved until they are fixed:
          </p>
          <ul className="mt-1 list-inside list-disc">
            {preview.errors.slice(0, 12).map((e) => (
              <li key={`${e.line}-${e.column}-${e.message}`}>
                Line {e.line}
                {e.column ? `, ${e.column}` : ''}: {e.message}
              </li>
            ))}
          </ul>
          {preview.errorCount > 12 ? <p className="mt-1">…and {(preview.errorCount - 12).toLocaleString('en-GB')} more.</p> : null}
        </div>
      ) : null}
    </div>
  );
}
