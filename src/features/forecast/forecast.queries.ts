// Query keys and options of the forecast area.
import { queryOptions } from '@tanstack/react-query';
import { fetchForecast } from './forecast.api';

export const forecastKeys = {
  all: ['forecasts'] as const,
  details: () => [...forecastKeys.all, 'detail'] as const,
  detail: (id: string) => [...forecastKeys.details(), id] as const,
};

/** A saved forecast never changes once stored, so it stays fresh for the page's life. */
export const forecastQueries = {
  detail: (id: string) =>
    queryOptions({
      queryKey: forecastKeys.detail(id),
      queryFn: ({ signal }) => fetchForecast(id, signal),
      staleTime: Infinity,
    }),
};
