import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { HttpError } from '../../../../server/errors';
import { forecastCsv } from '../../../../domain/forecasts/hourly-csv';
import { forecastTripId, getForecast } from '../../../../server/forecasts';
import { requireUser, route } from '../../../../server/http';

export const prerender = false;

/** The saved forecast's hourly series as a CSV download. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const notFound = new HttpError('not_found', "There is no saved forecast with this id among your crews' trips.");
  const tripId = await forecastTripId(db, ctx.params.id!);
  if (!tripId) throw notFound;
  await tripAccess(db, user, tripId, 'read').catch((e) => {
    throw e instanceof HttpError && e.code === 'not_found' ? notFound : e;
  });
  const f = await getForecast(db, ctx.params.id!);
  if (!f) throw notFound;
  const slug = f.name.replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '').toLowerCase() || 'forecast';
  return new Response(forecastCsv(f.forecast), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${slug}-hourly.csv"`,
      'cache-control': 'no-store',
    },
  });
});
