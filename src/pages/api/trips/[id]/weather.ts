import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { env } from '../../../../server/env';
import { json, requireUser, route } from '../../../../server/http';
import { fillTripWeather } from '../../../../server/weather';
import type { StopLike } from '../../../../domain/weather/weather';

export const prerender = false;

/**
 * The trip's weather per stop-day from the weather service (cached): each day's source (typed,
 * forecast, past-year or assumed), the engine-ready entries, every past year for the band, and a
 * message when the service could not help. Reads only: the trip itself is never changed.
 */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'read');
  const stops = JSON.parse(trip.stops) as StopLike[];
  const fill = await fillTripWeather(db, stops, {
    forecastUrl: env.WEATHER_FORECAST_URL,
    archiveUrl: env.WEATHER_ARCHIVE_URL,
    timeoutMs: env.WEATHER_TIMEOUT_MS,
  });
  return json({ tripId: trip.id, ...fill });
});
