// Reading an uploaded monitor log inside the worker pool: decode, check the caps line by line,
// detect (or apply the sent mapping) and parse. Pure: the bytes come in, plain data goes out (no
// HttpError crosses the thread; the caller turns a refusal into one). Readings travel back as
// typed arrays, which move between threads without copying.
import { isValidTimeZone } from '../../engine';
import { previewLog, type LogPreview } from '../../domain/monitor/monitor';
import { mappingSchema, type ColumnMapping } from '../../domain/monitor/monitor.schema';
import type { BankLimits, Sample } from '../../domain/monitor/parse';
import { HttpError, type ErrorCode } from '../errors';
import { zodIssues } from '../http';
import { decodeCsvBytes, multipartInPlace, type MultipartRules } from '../upload';

/** The longest line a monitor log may have (a real export's lines are well under 200 characters). */
export const MAX_LINE_CHARS = 4096;
/** The most columns a line may have. */
export const MAX_COLUMNS = 64;
/** Rows and readings shown in a preview, and the largest preview answer. */
export const PREVIEW_ROWS = 8;
export const MAX_PREVIEW_JSON_BYTES = 1024 * 1024;
const MAX_CELL_CHARS = 200;

/** The largest monitor log accepted (the CSV itself), and the whole multipart body around it. */
export const MAX_FILE_BYTES = 10 * 1024 * 1024;
export const MAX_BODY_BYTES = MAX_FILE_BYTES + 256 * 1024;
const ALLOWED_EXTENSIONS = /\.(csv|txt|tsv|log|dat)$/i;

/** The 413 of an upload over 10 MB. */
export const tooLarge = () =>
  new HttpError('payload_too_large', 'The file is larger than 10 MB. Export a shorter stretch of the log (a trip at a time).', [
    { path: 'file', message: 'at most 10 MB' },
  ]);
export const SEND_AS = 'Send the log as a file upload (multipart/form-data) with the CSV in the field "file".';

const UPLOAD_RULES: MultipartRules = {
  maxFileBytes: MAX_FILE_BYTES,
  maxBodyBytes: MAX_BODY_BYTES,
  tooLarge,
  sendAs: SEND_AS,
  defaultName: 'monitor-log.csv',
};

export interface MonitorLogTask {
  /** The multipart body as received (read within MAX_BODY_BYTES on the request thread) and its Content-Type. */
  body: Uint8Array;
  contentType: string;
  limits: BankLimits | null;
  /** true for a save: the readings and the file come back too. */
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
  | { ok: false; code: ErrorCode; message: string; issues: { path: string; message: string }[]; extra?: Record<string, unknown> }
  | {
      ok: true;
      preview: LogPreview;
      samples: PackedSamples | null;
      fileName: string;
      /** The name typed for the log, if any. */
      name: string | null;
      /** The mapping sent with the upload (a save needs one). */
      mapping: ColumnMapping | null;
      /** The file as uploaded (a save stores it). */
      file: Uint8Array | null;
      fileBytes: number;
    };

const refuse = (message: string, path: string, issue: string, code: ErrorCode = 'invalid_request'): MonitorLogOutcome => ({
  ok: false,
  code,
  message,
  issues: [{ path, message: issue }],
});

function mappingFrom(raw: string | undefined): ColumnMapping | null {
  if (raw === undefined || raw.trim() === '') return null;
  let data: unknown;
  try {
    data = JSON.parse(raw);
  } catch {
    throw new HttpError('invalid_request', 'The column mapping is not valid JSON.', [{ path: 'mapping', message: 'not valid JSON' }]);
  }
  const r = mappingSchema.safeParse(data);
  if (!r.success)
    throw new HttpError('invalid_request', `The column mapping needs fixing: ${r.error.issues[0]?.message}`, zodIssues(r.error, 'mapping'));
  return r.data;
}

/** The first line over MAX_LINE_CHARS, or over MAX_COLUMNS cells for any of the delimiters a log may use. */
function capsProblem(text: string): MonitorLogOutcome | null {
  let line = 1;
  let start = 0;
  const counts = { 44: 0, 59: 0, 9: 0, 124: 0 } as Record<number, number>;
  for (let i = 0; i <= text.length; i++) {
    const c = i < text.length ? text.charCodeAt(i) : 10;
    if (c === 10) {
      if (i - start > MAX_LINE_CHARS) {
        return refuse(
          `Line ${line} is longer than ${MAX_LINE_CHARS} characters; a monitor log has one reading per line. Export the log as CSV again.`,
          `line ${line}`,
          `longer than ${MAX_LINE_CHARS} characters`,
        );
      }
      for (const d of [44, 59, 9, 124]) {
        if (counts[d]! + 1 > MAX_COLUMNS) {
          return refuse(
            `Line ${line} has more than ${MAX_COLUMNS} columns; a monitor log has a handful (time, voltage, current, SOC, temperature).`,
            `line ${line}`,
            `more than ${MAX_COLUMNS} columns`,
          );
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
  while (out.errors.length > 1 && JSON.stringify(out).length > MAX_PREVIEW_JSON_BYTES)
    out.errors = out.errors.slice(0, Math.floor(out.errors.length / 2));
  return out;
}

function pack(samples: Sample[]): PackedSamples {
  const n = samples.length;
  const p: PackedSamples = {
    t: new Float64Array(n),
    volts: new Float64Array(n),
    amps: new Float64Array(n),
    socPct: new Float64Array(n),
    tempC: new Float64Array(n),
  };
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

/**
 * Reads the multipart form, checks the file's name, mapping and time zone, decodes it, checks the
 * caps, detects or applies the mapping and parses the whole file. A refusal comes back as data.
 */
export async function readMonitorLog(task: MonitorLogTask): Promise<MonitorLogOutcome> {
  try {
    // The body moved here from the request thread; the file is a view into it, never copied.
    const upload = multipartInPlace(task.body, task.contentType, UPLOAD_RULES);
    if (!ALLOWED_EXTENSIONS.test(upload.fileName) && /\.[a-z0-9]{1,5}$/i.test(upload.fileName)) {
      return refuse(
        `"${upload.fileName.slice(0, 80)}" is not a CSV. Export the monitor's log as CSV (.csv or .txt) and upload that.`,
        'file',
        'expected a .csv, .tsv or .txt file',
        'unsupported_media_type',
      );
    }
    const decoded = decodeCsvBytes(upload.bytes);
    if (!decoded.ok) {
      const empty = upload.bytes.byteLength === 0 || /empty/.test(decoded.message);
      return refuse(
        decoded.message,
        'file',
        empty ? 'the file is empty' : 'not a text CSV',
        empty ? 'invalid_request' : 'unsupported_media_type',
      );
    }
    const mapping = mappingFrom(upload.fields.get('mapping'));
    const timeZone = upload.fields.get('timeZone')?.trim() || mapping?.timeZone || 'UTC';
    if (!isValidTimeZone(timeZone))
      return refuse('The time zone is not one we know.', 'timeZone', 'must be an IANA time zone such as America/Denver');
    const problem = capsProblem(decoded.text);
    if (problem) return problem;
    const { preview, parsed } = previewLog(decoded.text, { timeZone, mapping, limits: task.limits });
    const keep = task.withSamples && parsed !== null && preview.errorCount === 0;
    return {
      ok: true,
      preview: capped(preview),
      samples: keep ? pack(parsed.samples) : null,
      fileName: upload.fileName,
      name: upload.fields.get('name')?.trim() || null,
      mapping,
      file: keep ? upload.bytes : null,
      fileBytes: upload.bytes.byteLength,
    };
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, code: e.code, message: e.message, issues: e.issues, extra: e.extra };
    throw e;
  }
}
