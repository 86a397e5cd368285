import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { Forecast, ResolvedPlan } from '../engine';
import { bandTask, buildBand, type Band, type WeatherSources } from '../domain/weather/band';
import type { StopLike } from '../domain/weather/weather';
import type { TripDto } from '../domain/trips/trips.schema';
import { env } from './env';
import { fillTripWeather, type TripWeather } from './weather';
import { weatherBandInPool } from './workers/pool';

// The weather a forecast run uses: every stop-day the camper did not type is filled from the
// weather service (the forecast for a near trip, the median past year for a far one); typed days
// win. The trip itself is never changed: only the plan the engine runs gets the filled days.

/** The trip's weather for a run: the trip with filled stops (for the engine only), and each day's source. */
export async function weatherForRun(db: Kysely<DB>, trip: TripDto): Promise<{ trip: TripDto; fill: TripWeather; sources: WeatherSources }> {
  const stops = trip.stops as unknown as StopLike[];
  const fill = await fillTripWeather(db, stops, {
    forecastUrl: env.WEATHER_FORECAST_URL,
    archiveUrl: env.WEATHER_ARCHIVE_URL,
    timeoutMs: env.WEATHER_TIMEOUT_MS,
  });
  const filled = { ...trip, stops: trip.stops.map((s, i) => ({ ...s, weather: fill.stops[i]?.weather ?? s.weather })) } as TripDto;
  const sources: WeatherSources = {
    kind: fill.kind,
    status: fill.status,
    message: fill.message,
    medianYear: fill.medianYear,
    stops: fill.stops.map((s) => ({ name: s.name, days: s.days })),
  };
  return { trip: filled, fill, sources };
}

/**
 * "How sure is this?": a far trip re-run once per past year, a near trip with skies two oktas
 * better and worse; the runs happen in the worker pool. Null when there is nothing to vary (every
 * day typed or assumed, or fewer than two past years).
 */
export async function bandFor(typedTrip: TripDto, fill: TripWeather, plan: ResolvedPlan, result: Forecast): Promise<Band | null> {
  // The camper's own stops (typed days only), not the filled ones.
  const stops = typedTrip.stops as unknown as StopLike[];
  const times = result.hourly.map((r) => r.time);
  // The worker builds the plans: handing over ten built plans cost the request thread several ms.
  const band = bandTask(plan, stops, fill);
  if (!band) return null;
  const outcomes = await weatherBandInPool(band.task);
  return buildBand(band.task.kind, band.labels, outcomes, times);
}
