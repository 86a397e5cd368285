// Reading an uploaded monitor log inside the worker pool: decode, check the caps line by line,
// detect (or apply the sent mapping) and parse. Pure: the bytes come in, plain data goes out (no
// HttpError crosses the thread; the caller turns a refusal into one). Readings travel back as
// typed arrays, which move between threads without copying.
import { previewLog, type LogPreview } from '../../domain/monitor/monitor';
import type { ColumnMapping } from '../../domain/monitor/monitor.schema';
import type { BankLimits, Sample } from '../../domain/monitor/parse';
import { decodeCsvBytes } from '../upload';

/** The longest line a monitor log may have (a real export's lines are well under 200 characters). */
export const MAX_LINE_CHARS = 4096;
/** The most columns a line may have. */
export const MAX_COLUMNS = 64;
/** Rows and readings shown in a preview, and the largest preview answer. */
export const PREVIEW_ROWS = 8;
export const MAX_PREVIEW_JSON_BYTES = 1024 * 1024;
const MAX_CELL_CHARS = 200;

export interface MonitorLogTask {
  bytes: Uint8Array;
  mapping: ColumnMapping | null;
  timeZone: string;
  limits: BankLimits | null;
  /** true for a save: the readings come back too. */
  withSamples: boolean;
}

export interface PackedSamples {
  t: Float64Array;
  volts: Float64Array;
  amps: Float64Array;
  socPct: Float64Array;
  tempC: Float64Array;
}

export type MonitorLogOutcome =
  | { ok: false; code: 'invalid_request' | 'unsupported_media_type'; message: string; issues: { path: string; message: string }[] }
  | { ok: true; preview: LogPreview; parsedOk: boolean; samples: PackedSamples | null };

const refuse = (message: string, path: string, issue: string, code: 'invalid_request' | 'unsupported_media_type' = 'invalid_request'): MonitorLogOutcome => ({
  ok: false,
  code,
  message,
  issues: [{ path, message: issue }],
});

/** The first line over MAX_LINE_CHARS, or over MAX_COLUMNS cells for any of the delimiters a log may use. */
function capsProblem(text: string): MonitorLogOutcome | null {
  let line = 1;
  let start = 0;
  const counts = { 44: 0, 59: 0, 9: 0, 124: 0 } as Record<number, number>;
  for (let i = 0; i <= text.length; i++) {
    const c = i < text.length ? text.charCodeAt(i) : 10;
    if (c === 10) {
      if (i - start > MAX_LINE_CHARS) {
        return refuse(`Line ${line} is longer than ${MAX_LINE_CHARS} characters; a monitor log has one reading per line. Export the log as CSV again.`, `line ${line}`, `longer than ${MAX_LINE_CHARS} characters`);
      }
      for (const d of [44, 59, 9, 124]) {
        if (counts[d]! + 1 > MAX_COLUMNS) {
          return refuse(`Line ${line} has more than ${MAX_COLUMNS} columns; a monitor log has a handful (time, voltage, current, SOC, temperature).`, `line ${line}`, `more than ${MAX_COLUMNS} columns`);
        }
        counts[d] = 0;
      }
      line++;
      start = i + 1;
    } else if (c in counts) counts[c]! += 1;
  }
  return null;
}

const clip = (s: string) => (s.length > MAX_CELL_CHARS ? `${s.slice(0, MAX_CELL_CHARS)}…` : s);

/** The preview cut to its caps: a few rows, short cells, and an answer under 1 MB. */
function capped(preview: LogPreview): LogPreview {
  const out: LogPreview = {
    ...preview,
    headers: preview.headers.slice(0, MAX_COLUMNS).map(clip),
    rows: preview.rows.slice(0, PREVIEW_ROWS).map((r) => r.slice(0, MAX_COLUMNS).map(clip)),
    sample: preview.sample.slice(0, PREVIEW_ROWS),
    errors: preview.errors.map((e) => ({ ...e, column: e.column === null ? null : clip(e.column), message: clip(e.message) })),
  };
  while (out.errors.length > 1 && JSON.stringify(out).length > MAX_PREVIEW_JSON_BYTES) out.errors = out.errors.slice(0, Math.floor(out.errors.length / 2));
  return out;
}

function pack(samples: Sample[]): PackedSamples {
  const n = samples.length;
  const p: PackedSamples = { t: new Float64Array(n), volts: new Float64Array(n), amps: new Float64Array(n), socPct: new Float64Array(n), tempC: new Float64Array(n) };
  samples.forEach((s, i) => {
    p.t[i] = s.t;
    p.volts[i] = s.volts ?? NaN;
    p.amps[i] = s.amps ?? NaN;
    p.socPct[i] = s.socPct ?? NaN;
    p.tempC[i] = s.tempC ?? NaN;
  });
  return p;
}

/** Readings back from their typed arrays (NaN = not measured). */
export function unpack(p: PackedSamples): Sample[] {
  const v = (x: number) => (Number.isNaN(x) ? null : x);
  return Array.from(p.t, (t, i) => ({ t, volts: v(p.volts[i]!), amps: v(p.amps[i]!), socPct: v(p.socPct[i]!), tempC: v(p.tempC[i]!) }));
}

/** Decodes, checks the caps, detects or applies the mapping and parses the whole file. */
export function readMonitorLog(task: MonitorLogTask): MonitorLogOutcome {
  const decoded = decodeCsvBytes(task.bytes);
  if (!decoded.ok) {
    const empty = task.bytes.byteLength === 0 || /empty/.test(decoded.message);
    return refuse(decoded.message, 'file', empty ? 'the file is empty' : 'not a text CSV', empty ? 'invalid_request' : 'unsupported_media_type');
  }
  const problem = capsProblem(decoded.text);
  if (problem) return problem;
  const { preview, parsed } = previewLog(decoded.text, { timeZone: task.timeZone, mapping: task.mapping, limits: task.limits });
  return { ok: true, preview: capped(preview), parsedOk: parsed !== null, samples: task.withSamples && parsed && preview.errorCount === 0 ? pack(parsed.samples) : null };
}
