import { forecastCsv } from '../../../../domain/forecasts/hourly-csv';
import { db } from '../../../../server/db';
import { forecastAccess, savedForecast } from '../../../../server/forecasts';
import { requireUser, route } from '../../../../server/http';
import { toUnits } from '../../../../lib/units';

export const prerender = false;

/** The saved forecast's hourly series as a CSV download, temperatures in the user's units (°F columns named ambientF, batteryF). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  await forecastAccess(db, user, ctx.params.id!, 'read');
  const f = await savedForecast(db, ctx.params.id!);
  const slug = f.name.replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '').toLowerCase() || 'forecast';
  return new Response(forecastCsv(f.forecast, toUnits((user as { units?: unknown }).units)), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${slug}-hourly.csv"`,
      'cache-control': 'no-store',
    },
  });
});
