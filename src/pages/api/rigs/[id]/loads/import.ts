import { rigAccess } from '../../../../../server/access';
import { parseLoadsCsv } from '../../../../../domain/loads/loads-csv';
import { namesAlreadyListed } from '../../../../../domain/loads/import-choice';
import { db } from '../../../../../server/db';
import { HttpError } from '../../../../../server/errors';
import { json, requireUser, route } from '../../../../../server/http';
import { importLoads, loadList, replaceLoads } from '../../../../../server/loads';
import { LIMITS } from '../../../../../engine';
import { lineIssues, readCsvBody, wantsPreview } from '../../../../../server/upload';

const MAX_CSV_BYTES = 1024 * 1024;
const tooLarge = () => new HttpError('payload_too_large', 'The CSV is larger than 1 MB.');

function modeOf(url: URL): 'add' | 'replace' {
  const mode = url.searchParams.get('mode') ?? 'add';
  if (mode === 'add' || mode === 'replace') return mode;
  throw new HttpError('invalid_request', 'Choose whether the import adds to the list or replaces it.', [{ path: 'mode', message: 'must be add or replace' }]);
}

/**
 * Imports loads from CSV, adding them to the list (`?mode=add`, the default) or replacing the whole
 * list (`?mode=replace&listVersion=…`, the list's version from the preview; a changed list is a 409).
 * `?preview=1` only reads the file: `{ rows, errors, list: { version, loads }, alreadyListed }`.
 * Otherwise any error refuses the whole file (400, issues `line 4.watts`) and nothing is saved or
 * removed; else it all happens in one transaction: 201 `{ imported, removed, loads }`.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write');
  const mode = modeOf(ctx.url);
  const listVersion = ctx.url.searchParams.get('listVersion');
  if (mode === 'replace' && !wantsPreview(ctx.url) && !listVersion) {
    throw new HttpError('invalid_request', 'Send the version of the list you checked, so nothing someone else added is removed unseen.', [
      { path: 'listVersion', message: 'Send the list version from the check.' },
    ]);
  }
  const text = await readCsvBody(ctx.request, MAX_CSV_BYTES, tooLarge);
  const list = await loadList(db, rig.id);
  const room = mode === 'replace' ? LIMITS.maxLoads : LIMITS.maxLoads - list.loads.length;
  const { rows, errors } = parseLoadsCsv(text, room);
  if (wantsPreview(ctx.url)) {
    return json({
      rows: rows.map((r) => ({ line: r.line, ...r.load })),
      errors,
      list: { version: list.version, loads: list.loads.map((l) => ({ id: l.id, name: l.name, version: l.version })) },
      alreadyListed: namesAlreadyListed(rows.map((r) => ({ line: r.line, name: r.load.name })), list.loads),
    });
  }
  if (errors.length) {
    const lines = [...new Set(errors.map((e) => e.line))];
    throw new HttpError(
      'invalid_request',
      `Nothing was imported${mode === 'replace' ? ' and nothing removed' : ''}: ${lines.length === 1 ? `line ${lines[0]} needs` : `${lines.length} lines need`} fixing.`,
      lineIssues(errors),
      { errors },
    );
  }
  const inputs = rows.map((r) => r.load);
  if (mode === 'replace') {
    const { removed, loads } = await replaceLoads(db, rig.id, user.id, listVersion!, inputs);
    return json({ imported: loads.length, removed, loads }, 201);
  }
  const loads = await importLoads(db, rig.id, user.id, inputs);
  return json({ imported: loads.length, removed: 0, loads }, 201);
});
