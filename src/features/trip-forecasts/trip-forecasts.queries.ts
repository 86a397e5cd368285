import { queryOptions } from '@tanstack/react-query';
import { fetchTripForecasts } from './trip-forecasts.api';

export const tripForecastKeys = {
  all: ['trip-forecasts'] as const,
  list: (tripId: string) => [...tripForecastKeys.all, tripId] as const,
};

export const tripForecastQueries = {
  list: (tripId: string) => queryOptions({ queryKey: tripForecastKeys.list(tripId), queryFn: ({ signal }) => fetchTripForecasts(tripId, signal) }),
};
