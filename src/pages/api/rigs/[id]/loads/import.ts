import { z } from 'zod';
import { rigAccess } from '../../../../../server/access';
import { parseLoadsCsv } from '../../../../../server/csv';
import { db } from '../../../../../server/db';
import { HttpError } from '../../../../../server/errors';
import { json, parseWith, readJson, readLimited, requireUser, route } from '../../../../../server/http';
import { countLoads, importLoads } from '../../../../../server/loads';
import { LIMITS } from '../../../../../engine/schema';

const MAX_CSV_BYTES = 1024 * 1024;
const tooLarge = () => new HttpError('payload_too_large', 'The CSV is larger than 1 MB.');

/** UTF-8, or else Windows-1252: what a spreadsheet on Windows saves as "CSV" (so "Señora" survives). */
function decodeText(bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('windows-1252').decode(bytes);
  }
}

/** The CSV text of the request: a `text/csv` body, or JSON `{ "csv": "…" }`; at most 1 MB either way. */
async function readCsv(request: Request): Promise<string> {
  const type = (request.headers.get('content-type') ?? '').trim().toLowerCase();
  if (/^application\/json\b/.test(type)) {
    // JSON escaping can double the size of a 1 MB file; the text itself is checked below.
    const { csv } = parseWith(z.object({ csv: z.string({ error: 'Send the CSV text as a string.' }) }), await readJson(request, 3 * MAX_CSV_BYTES));
    if (new TextEncoder().encode(csv).byteLength > MAX_CSV_BYTES) throw tooLarge();
    return csv;
  }
  if (/^(text\/csv|application\/csv|text\/plain)\b/.test(type)) {
    return decodeText(await readLimited(request, MAX_CSV_BYTES, tooLarge));
  }
  throw new HttpError('unsupported_media_type', 'Send the CSV as text/csv, or as JSON { "csv": "…" }.', [
    { path: '(headers).content-type', message: `expected text/csv or application/json, got ${type ? `"${type.slice(0, 60)}"` : 'none'}` },
  ]);
}

/**
 * Imports loads from CSV. `?preview=1` only reads the file: `{ rows, errors }`. Otherwise any error
 * refuses the whole file (400, issues `line 4.watts`) and nothing is saved; else every load is added
 * in one transaction: 201 `{ imported, loads }`.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  const text = await readCsv(ctx.request);
  const { rows, errors } = parseLoadsCsv(text, LIMITS.maxLoads - (await countLoads(db, rig.id)));
  const preview = ['1', 'true', 'yes'].includes(ctx.url.searchParams.get('preview') ?? '');
  if (preview) return json({ rows: rows.map((r) => ({ line: r.line, ...r.load })), errors });
  if (errors.length) {
    const lines = [...new Set(errors.map((e) => e.line))];
    throw new HttpError(
      'invalid_request',
      `Nothing was imported: ${lines.length === 1 ? `line ${lines[0]} needs` : `${lines.length} lines need`} fixing.`,
      errors.map((e) => ({ path: e.column ? `line ${e.line}.${e.column}` : `line ${e.line}`, message: e.message })),
      { errors },
    );
  }
  const loads = await importLoads(db, rig.id, user.id, rows.map((r) => r.load));
  return json({ imported: loads.length, loads }, 201);
});
