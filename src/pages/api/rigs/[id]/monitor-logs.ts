import { rigAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { json, requireUser, route } from '../../../../server/http';
import { listLogs, previewUpload, readLogUpload, saveUpload } from '../../../../server/monitor-logs';
import { wantsPreview } from '../../../../server/upload';

export const prerender = false;

/** The rig's monitor logs, newest first. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'read');
  return json(await listLogs(db, rig.id));
});

/**
 * Uploads a monitor log (multipart: `file`, `mapping`, `timeZone`, `name`). `?preview=1` reads it
 * without saving: the detected (or sent) column mapping, the first readings and every problem by
 * line and column. Otherwise the confirmed `mapping` is required; any problem refuses the whole
 * file (400, issues `line 12.Voltage (V)`), else the file and its readings are saved in one
 * transaction: 201 with the log.
 */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'write', 'rig');
  const upload = await readLogUpload(ctx.request);
  if (wantsPreview(ctx.url)) return json(await previewUpload(rig, upload));
  return json(await saveUpload(db, { rig, userId: user.id }, upload), 201);
});
