import { rigAccess } from '../../../../server/access';
import { formatLoadsCsv } from '../../../../domain/loads/loads-csv';
import { db } from '../../../../server/db';
import { requireUser, route } from '../../../../server/http';
import { listLoads } from '../../../../server/loads';

/** A file name for the rig's loads: its name in plain letters, digits and dashes. */
function fileName(rigName: string): string {
  const slug = rigName.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60);
  return `${slug || 'rig'}-loads.csv`;
}

/** The rig's loads as CSV (the import's columns); a UTF-8 BOM so spreadsheets read accents right. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { rig } = await rigAccess(db, user, ctx.params.id!, 'read');
  const csv = formatLoadsCsv(await listLoads(db, rig.id));
  return new Response('\uFEFF' + csv, {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${fileName(rig.name)}"`,
      'cache-control': 'no-store',
    },
  });
});
