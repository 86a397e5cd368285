import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { Forecast, Plan, ResolvedPlan } from '../engine';
import { buildBand, shiftSky, type Band, type WeatherSources } from '../domain/weather/band';
import { mergeStop, type StopLike, type WeatherEntry } from '../domain/weather/weather';
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

function withWeather(plan: ResolvedPlan, weather: WeatherEntry[][]): Plan {
  return { ...plan, stops: plan.stops.map((s, i) => ({ ...s, weather: weather[i] ?? s.weather })) } as unknown as Plan;
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
  if (fill.kind === 'far' && fill.pastYears.length >= 2) {
    const years = [...fill.pastYears].sort((a, b) => a.year - b.year);
    const plans = years.map((y) => withWeather(plan, stops.map((_, i) => mergeStop(stops, i, [], y.stops[i] ?? []).weather)));
    const outcomes = await weatherBandInPool(plans);
    return buildBand('years', years.map((y) => ({ label: String(y.year), year: y.year })), outcomes, times);
  }
  const fetched = plan.stops.some((s) => (s.weather as WeatherEntry[]).some((w) => w.source === 'forecast' || w.source === 'past-year'));
  if (!fetched) return null;
  const shifted = (steps: number) => withWeather(plan, plan.stops.map((s) => (s.weather as WeatherEntry[]).map((w) => shiftSky(w, steps))));
  const outcomes = await weatherBandInPool([shifted(2), plan as unknown as Plan, shifted(-2)]);
  return buildBand(
    'skies',
    [
      { label: 'two steps cloudier', year: null },
      { label: 'as forecast', year: null },
      { label: 'two steps clearer', year: null },
    ],
    outcomes,
    times,
  );
}
