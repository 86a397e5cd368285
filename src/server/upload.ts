import { z } from 'zod';
import { HttpError, type Issue } from './errors';
import { parseWith, readJson, readLimited } from './http';

// Reading an uploaded file, for both imports (monitor logs and the loads CSV): the request body
// (a multipart form, or a text or JSON body), the one text decoder, the `?preview=1` switch and
// the issues of a file refused line by line.

export type Decoded = { ok: true; text: string } | { ok: false; message: string };

const startsWith = (b: Uint8Array, sig: number[]) => sig.every((x, i) => b[i] === x);

/**
 * Bytes as text: UTF-16 by its byte-order mark, else UTF-8, else Windows-1252 (what a spreadsheet
 * on Windows saves as "CSV", so "Señora" survives). The byte-order mark is dropped and every line
 * ends in "\n".
 */
export function decodeText(bytes: Uint8Array): string {
  let text: string;
  if (startsWith(bytes, [0xff, 0xfe])) text = new TextDecoder('utf-16le').decode(bytes.subarray(2));
  else if (startsWith(bytes, [0xfe, 0xff])) text = new TextDecoder('utf-16be').decode(bytes.subarray(2));
  else {
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      text = new TextDecoder('windows-1252').decode(bytes);
    }
  }
  // Each replacement would copy the whole text: only when there is something to replace.
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return text.includes('\r') ? text.replace(/\r\n?/g, '\n') : text;
}

/** A monitor's file as text, or why it is not a text CSV (empty, a workbook, a PDF, an image, binary). */
export function decodeCsvBytes(bytes: Uint8Array): Decoded {
  if (bytes.byteLength === 0) return { ok: false, message: 'The file is empty.' };
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04])) {
    return { ok: false, message: 'This is a spreadsheet workbook or a zip archive, not a CSV. Export the log as CSV (comma- or semicolon-separated text) and upload that.' };
  }
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0])) {
    return { ok: false, message: 'This is an older spreadsheet workbook (.xls), not a CSV. Save it as CSV text and upload that.' };
  }
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46])) return { ok: false, message: 'This is a PDF, not a CSV. Upload the monitor’s CSV export.' };
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47]) || startsWith(bytes, [0xff, 0xd8, 0xff])) {
    return { ok: false, message: 'This is an image, not a CSV. Upload the monitor’s CSV export.' };
  }
  const utf16 = startsWith(bytes, [0xff, 0xfe]) || startsWith(bytes, [0xfe, 0xff]);
  // A NUL byte never appears in a text CSV in the 8-bit encodings.
  if (!utf16 && bytes.subarray(0, 64 * 1024).includes(0)) return { ok: false, message: 'This file is binary, not a text CSV. Upload the monitor’s CSV export.' };
  const text = decodeText(bytes);
  if (text.trim() === '') return { ok: false, message: 'The file is empty: it has no lines with readings.' };
  return { ok: true, text };
}

/** A file sent in a multipart form, with the form's text fields. */
export interface FileUpload {
  fileName: string;
  bytes: Uint8Array;
  fields: Map<string, string>;
}

export interface MultipartRules {
  maxFileBytes: number;
  /** The whole body: the file plus its fields and framing. */
  maxBodyBytes: number;
  tooLarge: () => HttpError;
  /** The sentence for a body that is not a multipart form. */
  sendAs: string;
  /** The name when the file has none. */
  defaultName: string;
}

/** The multipart form of the request: the file in the field `file` and the text fields. */
export async function readMultipart(request: Request, rules: MultipartRules): Promise<FileUpload> {
  const type = (request.headers.get('content-type') ?? '').trim();
  if (!/^multipart\/form-data\b/i.test(type)) {
    throw new HttpError('unsupported_media_type', rules.sendAs, [{ path: '(headers).content-type', message: `expected multipart/form-data, got ${type ? `"${type.slice(0, 60)}"` : 'none'}` }]);
  }
  const body = await readLimited(request, rules.maxBodyBytes, rules.tooLarge);
  let form: FormData;
  try {
    form = await new Response(Buffer.from(body), { headers: { 'content-type': type } }).formData();
  } catch {
    throw new HttpError('invalid_request', 'The upload could not be read as a form; send it again.', [{ path: '(body)', message: 'not a readable multipart form' }]);
  }
  const file = form.get('file');
  if (file === null || typeof file === 'string') throw new HttpError('invalid_request', 'Choose the CSV file to upload.', [{ path: 'file', message: 'no file was sent' }]);
  if (file.size > rules.maxFileBytes) throw rules.tooLarge();
  const fields = new Map<string, string>();
  for (const [k, v] of form.entries()) if (typeof v === 'string') fields.set(k, v);
  return { fileName: file.name || rules.defaultName, bytes: new Uint8Array(await file.arrayBuffer()), fields };
}

const CRLF = Buffer.from('\r\n');
const HEADER_END = Buffer.from('\r\n\r\n');
/** The most bytes of one part's headers (a browser sends a few hundred). */
const MAX_PART_HEADER_BYTES = 16 * 1024;

function headerParam(header: string, name: string): string | null {
  const m = new RegExp(`;\\s*${name}=(?:"((?:[^"\\\\]|\\\\.)*)"|([^;\\s]*))`, 'i').exec(header);
  if (!m) return null;
  // Browsers (and undici) write ", CR and LF in a quoted name as %22, %0D and %0A.
  if (m[1] !== undefined) return m[1].replace(/%22/g, '"').replace(/%0D/gi, '\r').replace(/%0A/gi, '\n').replace(/\\(.)/g, '$1');
  return m[2] ?? '';
}

/**
 * The multipart form in `body` taken apart where it lies: the file comes back as a view into
 * `body` (no copy of the file is made), the text fields as strings. The same answers as
 * readMultipart: a body that is not a form, no file, a file over the limit.
 */
export function multipartInPlace(body: Uint8Array, contentType: string, rules: MultipartRules): FileUpload {
  const unreadable = () =>
    new HttpError('invalid_request', 'The upload could not be read as a form; send it again.', [{ path: '(body)', message: 'not a readable multipart form' }]);
  if (!/^multipart\/form-data\b/i.test(contentType.trim())) {
    throw new HttpError('unsupported_media_type', rules.sendAs, [{ path: '(headers).content-type', message: `expected multipart/form-data, got ${contentType ? `"${contentType.slice(0, 60)}"` : 'none'}` }]);
  }
  const boundary = headerParam(contentType, 'boundary');
  if (!boundary || boundary.length > 200) throw unreadable();
  const buf = Buffer.from(body.buffer, body.byteOffset, body.byteLength);
  const dash = Buffer.from(`--${boundary}`);
  const between = Buffer.from(`\r\n--${boundary}`);
  let at = buf.indexOf(dash);
  if (at < 0) throw unreadable();
  at += dash.length;
  const fields = new Map<string, string>();
  let file: { name: string; bytes: Uint8Array } | null = null;
  for (;;) {
    if (buf[at] === 0x2d && buf[at + 1] === 0x2d) break; // "--": the closing delimiter
    if (buf.indexOf(CRLF, at) !== at) throw unreadable();
    const headStart = at + 2;
    const headEnd = buf.indexOf(HEADER_END, headStart);
    if (headEnd < 0 || headEnd - headStart > MAX_PART_HEADER_BYTES) throw unreadable();
    const head = buf.toString('utf8', headStart, headEnd);
    const dataStart = headEnd + 4;
    const dataEnd = buf.indexOf(between, dataStart);
    if (dataEnd < 0) throw unreadable();
    const disposition = /^content-disposition:(.*)$/im.exec(head)?.[1] ?? '';
    const name = headerParam(disposition, 'name');
    const fileName = headerParam(disposition, 'filename');
    if (name === 'file' && fileName !== null && !file) {
      if (dataEnd - dataStart > rules.maxFileBytes) throw rules.tooLarge();
      file = { name: fileName, bytes: body.subarray(dataStart, dataEnd) };
    } else if (name !== null && fileName === null) {
      fields.set(name, buf.toString('utf8', dataStart, dataEnd));
    }
    at = dataEnd + between.length;
  }
  if (!file) throw new HttpError('invalid_request', 'Choose the CSV file to upload.', [{ path: 'file', message: 'no file was sent' }]);
  return { fileName: file.name || rules.defaultName, bytes: file.bytes, fields };
}

/** CSV text from a `text/csv` (or text/plain) body, or JSON `{ "csv": "…" }`; at most `maxBytes` of text either way. */
export async function readCsvBody(request: Request, maxBytes: number, tooLarge: () => HttpError): Promise<string> {
  const type = (request.headers.get('content-type') ?? '').trim().toLowerCase();
  if (/^application\/json\b/.test(type)) {
    // JSON escaping can double the size of the file; the text itself is checked below.
    const { csv } = parseWith(z.object({ csv: z.string({ error: 'Send the CSV text as a string.' }) }), await readJson(request, 3 * maxBytes));
    if (new TextEncoder().encode(csv).byteLength > maxBytes) throw tooLarge();
    return csv;
  }
  if (/^(text\/csv|application\/csv|text\/plain)\b/.test(type)) return decodeText(await readLimited(request, maxBytes, tooLarge));
  throw new HttpError('unsupported_media_type', 'Send the CSV as text/csv, or as JSON { "csv": "…" }.', [
    { path: '(headers).content-type', message: `expected text/csv or application/json, got ${type ? `"${type.slice(0, 60)}"` : 'none'}` },
  ]);
}

/** `?preview=1` (or true/yes): read the file and answer what it holds, saving nothing. */
export function wantsPreview(url: URL): boolean {
  return ['1', 'true', 'yes'].includes(url.searchParams.get('preview') ?? '');
}

/** Problems of a file by line (and column): issue paths `line 12` or `line 12.Voltage (V)`. */
export function lineIssues(errors: { line: number; column: string | null; message: string }[]): Issue[] {
  return errors.map((e) => ({ path: e.column ? `line ${e.line}.${e.column}` : `line ${e.line}`, message: e.message }));
}
