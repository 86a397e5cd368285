import { rigAccess } from '../../../../../server/access';
import { parseLoadsCsv } from '../../../../../domain/loads/loads-csv';
import { db } from '../../../../../server/db';
import { HttpError } from '../../../../../server/errors';
import { json, requireUser, route } from '../../../../../server/http';
import { countLoads, importLoads } from '../../../../../server/loads';
import { LIMITS } from '../../../../../engine';
import { lineIssues, readCsvBody, wantsPreview } from '../../../../../server/upload';

const MAX_CSV_BYTES = 1024 * 1024;
const tooLarge = () => new HttpError('payload_too_large', 'The CSV is larger than 1 MB.');

/**
 * Imports loads from CSV. `?preview=1` only reads the file: `{ rows, errors }`. Otherwise any error
 * refuses the whole file (400, issues `line 4.watts`) and nothing is saved; else every load is added
 * in one transaction: 201 `{ imported, loads }`.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  const text = await readCsvBody(ctx.request, MAX_CSV_BYTES, tooLarge);
  const { rows, errors } = parseLoadsCsv(text, LIMITS.maxLoads - (await countLoads(db, rig.id)));
  if (wantsPreview(ctx.url)) return json({ rows: rows.map((r) => ({ line: r.line, ...r.load })), errors });
  if (errors.length) {
    const lines = [...new Set(errors.map((e) => e.line))];
    throw new HttpError(
      'invalid_request',
      `Nothing was imported: ${lines.length === 1 ? `line ${lines[0]} needs` : `${lines.length} lines need`} fixing.`,
      lineIssues(errors),
      { errors },
    );
  }
  const loads = await importLoads(db, rig.id, user.id, rows.map((r) => r.load));
  return json({ imported: loads.length, loads }, 201);
});
