import { rigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { HttpError, type Issue } from '../../../../server/errors';
import { json, readLimited, requireUser, route, zodIssues } from '../../../../server/http';
import { createLog, listLogs } from '../../../../server/monitor-logs';
import { isValidTimeZone } from '../../../../engine/tz';
import { mappingSchema, type ColumnMapping } from '../../../../monitor/mapping';
import { previewLog } from '../../../../monitor/preview';
import { decodeCsvBytes } from '../../../../monitor/text';

export const prerender = false;

/** The largest monitor log accepted (the CSV itself). */
const MAX_FILE_BYTES = 10 * 1024 * 1024;
/** The multipart body may carry the mapping and a little framing on top of the file. */
const MAX_BODY_BYTES = MAX_FILE_BYTES + 256 * 1024;
const ALLOWED_EXTENSIONS = /\.(csv|txt|tsv|log|dat)$/i;

const tooLarge = () => new HttpError('payload_too_large', 'The file is larger than 10 MB. Export a shorter stretch of the log (a trip at a time).', [{ path: 'file', message: 'at most 10 MB' }]);

interface Upload {
  fileName: string;
  bytes: Uint8Array;
  fields: Map<string, string>;
}

/** The multipart form: a `file` (the CSV) and text fields (`mapping`, `timeZone`, `name`). */
async function readUpload(request: Request): Promise<Upload> {
  const type = (request.headers.get('content-type') ?? '').trim();
  if (!/^multipart\/form-data\b/i.test(type)) {
    throw new HttpError('unsupported_media_type', 'Send the log as a file upload (multipart/form-data) with the CSV in the field "file".', [
      { path: '(headers).content-type', message: `expected multipart/form-data, got ${type ? `"${type.slice(0, 60)}"` : 'none'}` },
    ]);
  }
  const body = await readLimited(request, MAX_BODY_BYTES, tooLarge);
  let form: FormData;
  try {
    form = await new Response(Buffer.from(body), { headers: { 'content-type': type } }).formData();
  } catch {
    throw new HttpError('invalid_request', 'The upload could not be read as a form; send it again.', [{ path: '(body)', message: 'not a readable multipart form' }]);
  }
  const file = form.get('file');
  if (file === null || typeof file === 'string') throw new HttpError('invalid_request', 'Choose the CSV file to upload.', [{ path: 'file', message: 'no file was sent' }]);
  if (file.size > MAX_FILE_BYTES) throw tooLarge();
  const fields = new Map<string, string>();
  for (const [k, v] of form.entries()) if (typeof v === 'string') fields.set(k, v);
  return { fileName: file.name || 'monitor-log.csv', bytes: new Uint8Array(await file.arrayBuffer()), fields };
}

function mappingFrom(raw: string | undefined): ColumnMapping | null {
  if (raw === undefined || raw.trim() === '') return null;
  let data: unknown;
  try {
    data = JSON.parse(raw);
  } catch {
    throw new HttpError('invalid_request', 'The column mapping is not valid JSON.', [{ path: 'mapping', message: 'not valid JSON' }]);
  }
  const r = mappingSchema.safeParse(data);
  if (!r.success) throw new HttpError('invalid_request', `The column mapping needs fixing: ${r.error.issues[0]?.message}`, zodIssues(r.error, 'mapping'));
  return r.data;
}

function lineIssues(errors: { line: number; column: string | null; message: string }[]): Issue[] {
  return errors.map((e) => ({ path: e.column ? `line ${e.line}.${e.column}` : `line ${e.line}`, message: e.message }));
}

/** The rig's monitor logs, newest first. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(await listLogs(db, rig.id));
});

/**
 * Uploads a monitor log. `?preview=1` reads it without saving: the detected (or sent) column
 * mapping, the first readings and every problem by line and column. Otherwise the confirmed
 * `mapping` is required; any problem refuses the whole file (400, issues `line 12.Voltage (V)`),
 * else the file and its readings are saved in one transaction: 201 with the log.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write', 'rig');
  const upload = await readUpload(ctx.request);
  if (!ALLOWED_EXTENSIONS.test(upload.fileName) && /\.[a-z0-9]{1,5}$/i.test(upload.fileName)) {
    throw new HttpError('unsupported_media_type', `"${upload.fileName.slice(0, 80)}" is not a CSV. Export the monitor's log as CSV (.csv or .txt) and upload that.`, [{ path: 'file', message: 'expected a .csv, .tsv or .txt file' }]);
  }
  const decoded = decodeCsvBytes(upload.bytes);
  if (!decoded.ok) {
    const empty = upload.bytes.byteLength === 0 || /empty/.test(decoded.message);
    throw new HttpError(empty ? 'invalid_request' : 'unsupported_media_type', decoded.message, [{ path: 'file', message: empty ? 'the file is empty' : 'not a text CSV' }]);
  }
  const mapping = mappingFrom(upload.fields.get('mapping'));
  const timeZone = upload.fields.get('timeZone')?.trim() || mapping?.timeZone || 'UTC';
  if (!isValidTimeZone(timeZone)) throw new HttpError('invalid_request', 'The time zone is not one we know.', [{ path: 'timeZone', message: 'must be an IANA time zone such as America/Denver' }]);
  const bank = JSON.parse(rig.bank) as { chemistry: string; capacityAh: number; nominalVolts?: number };
  const limits = { nominalVolts: bank.nominalVolts ?? (bank.chemistry === 'lifepo4' ? 12.8 : 12), capacityAh: bank.capacityAh };
  const { preview, parsed } = previewLog(decoded.text, { timeZone, mapping, limits });

  if (['1', 'true', 'yes'].includes(ctx.url.searchParams.get('preview') ?? '')) return json({ ...preview, fileName: upload.fileName, bytes: upload.bytes.byteLength });

  if (!mapping) throw new HttpError('invalid_request', 'Confirm the column mapping before saving: send it in the field "mapping".', [{ path: 'mapping', message: 'send the confirmed column mapping' }]);
  if (preview.errorCount > 0 || !parsed) {
    const lines = [...new Set(preview.errors.map((e) => e.line))];
    const what = preview.errorCount === 1 ? `line ${lines[0]} needs` : `${preview.errorCount} problems on ${lines.length}${preview.errors.length < preview.errorCount ? '+' : ''} lines need`;
    throw new HttpError('invalid_request', `Nothing was saved: ${what} fixing.`, lineIssues(preview.errors), { errors: preview.errors, errorCount: preview.errorCount });
  }
  const name = (upload.fields.get('name')?.trim() || upload.fileName).slice(0, 120);
  const log = await createLog(db, { rigId: rig.id, crewId: rig.crew_id, userId: user.id, name, original: upload.bytes, mapping, samples: parsed.samples });
  return json({ ...log, warnings: preview.warnings }, 201);
});
