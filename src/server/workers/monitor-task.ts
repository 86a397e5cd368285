// Reading an uploaded monitor log inside the worker pool: decode, check the caps line by line,
// detect (or apply the sent mapping) and parse. The bytes come in, plain data goes out (no
// HttpError crosses the thread; the caller turns a refusal into one). Readings never leave the
// thread: a save writes them to the database from here.
import { isValidTimeZone } from '../../engine';
import { previewLog, refusalMessage, type LogPreview } from '../../domain/monitor/monitor';
import { mappingSchema, type ColumnMapping } from '../../domain/monitor/monitor.schema';
import type { BankLimits, Sample } from '../../domain/monitor/parse';
import { HttpError, type ErrorCode } from '../errors';
import { zodIssues } from '../http';
import { decodeCsvBytes, lineIssues, multipartInPlace, type MultipartRules } from '../upload';
import { insertLog, threadDb, type DbTarget } from './log-store';

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
  /** true for a save: every reading is kept (a preview keeps the first and counts the rest). */
  withSamples: boolean;
}

export type MonitorLogOutcome =
  | { ok: false; code: ErrorCode; message: string; issues: { path: string; message: string }[]; extra?: Record<string, unknown> }
  | {
      ok: true;
      preview: LogPreview;
      fileName: string;
      /** The name typed for the log, if any. */
      name: string | null;
      /** The mapping sent with the upload. */
      mapping: ColumnMapping | null;
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

type Read =
  | { ok: false; outcome: MonitorLogOutcome }
  | { ok: true; preview: LogPreview; samples: Sample[] | null; fileName: string; name: string | null; mapping: ColumnMapping | null; file: Uint8Array; fileBytes: number };

/**
 * Reads the multipart form, checks the file's name, mapping and time zone, decodes it, checks the
 * caps, detects or applies the mapping and parses the file line by line (keeping every reading only
 * for a save). A refusal comes back as data.
 */
function readUpload(task: MonitorLogTask): Read {
  try {
    // The body moved here from the request thread; the file is a view into it, never copied.
    const upload = multipartInPlace(task.body, task.contentType, UPLOAD_RULES);
    if (!ALLOWED_EXTENSIONS.test(upload.fileName) && /\.[a-z0-9]{1,5}$/i.test(upload.fileName)) {
      return {
        ok: false,
        outcome: refuse(
          `"${upload.fileName.slice(0, 80)}" is not a CSV. Export the monitor's log as CSV (.csv or .txt) and upload that.`,
          'file',
          'expected a .csv, .tsv or .txt file',
          'unsupported_media_type',
        ),
      };
    }
    const decoded = decodeCsvBytes(upload.bytes);
    if (!decoded.ok) {
      const empty = upload.bytes.byteLength === 0 || /empty/.test(decoded.message);
      return {
        ok: false,
        outcome: refuse(decoded.message, 'file', empty ? 'the file is empty' : 'not a text CSV', empty ? 'invalid_request' : 'unsupported_media_type'),
      };
    }
    const mapping = mappingFrom(upload.fields.get('mapping'));
    const timeZone = upload.fields.get('timeZone')?.trim() || mapping?.timeZone || 'UTC';
    if (!isValidTimeZone(timeZone))
      return { ok: false, outcome: refuse('The time zone is not one we know.', 'timeZone', 'must be an IANA time zone such as America/Denver') };
    const problem = capsProblem(decoded.text);
    if (problem) return { ok: false, outcome: problem };
    const { preview, parsed } = previewLog(decoded.text, { timeZone, mapping, limits: task.limits, keepAll: task.withSamples });
    const keep = task.withSamples && parsed !== null && preview.errorCount === 0;
    return {
      ok: true,
      preview: capped(preview),
      samples: keep ? parsed.samples : null,
      fileName: upload.fileName,
      name: upload.fields.get('name')?.trim() || null,
      mapping,
      file: upload.bytes,
      fileBytes: upload.bytes.byteLength,
    };
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, outcome: { ok: false, code: e.code, message: e.message, issues: e.issues, extra: e.extra } };
    throw e;
  }
}

/** A preview: what the file holds read with the sent (or detected) mapping; nothing is kept. */
export async function readMonitorLog(task: MonitorLogTask): Promise<MonitorLogOutcome> {
  const r = readUpload({ ...task, withSamples: false });
  if (!r.ok) return r.outcome;
  return { ok: true, preview: r.preview, fileName: r.fileName, name: r.name, mapping: r.mapping, fileBytes: r.fileBytes };
}

export interface SaveLogTask extends Omit<MonitorLogTask, 'withSamples'> {
  db: DbTarget;
  rigId: string;
  crewId: string;
  userId: string;
}

export type SaveLogOutcome =
  | { ok: false; code: ErrorCode; message: string; issues: { path: string; message: string }[]; extra?: Record<string, unknown> }
  | { ok: true; id: string; warnings: string[] };

/**
 * A save, all of it here: the file read with the confirmed mapping, then the file, its readings and
 * their overview written in one transaction on this thread's own connection. Any problem refuses
 * the whole file (issues `line 12.Voltage (V)`).
 */
export async function saveMonitorLog(task: SaveLogTask): Promise<SaveLogOutcome> {
  const r = readUpload({ ...task, withSamples: true });
  if (!r.ok) return r.outcome as SaveLogOutcome;
  if (!r.mapping) {
    return {
      ok: false,
      code: 'invalid_request',
      message: 'Confirm the column mapping before saving: send it in the field "mapping".',
      issues: [{ path: 'mapping', message: 'send the confirmed column mapping' }],
    };
  }
  if (r.preview.errorCount > 0 || !r.samples || r.samples.length === 0) {
    return {
      ok: false,
      code: 'invalid_request',
      message: refusalMessage(r.preview),
      issues: lineIssues(r.preview.errors),
      extra: { errors: r.preview.errors, errorCount: r.preview.errorCount },
    };
  }
  const id = await insertLog(threadDb(task.db), {
    rigId: task.rigId,
    crewId: task.crewId,
    userId: task.userId,
    name: (r.name || r.fileName).slice(0, 120),
    original: r.file,
    mapping: r.mapping,
    samples: r.samples,
  });
  return { ok: true, id, warnings: r.preview.warnings };
}
