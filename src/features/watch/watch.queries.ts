import { queryOptions } from '@tanstack/react-query';
import { fetchWatch } from './watch.api';

export const watchKeys = {
  all: ['trip-watch'] as const,
  trip: (tripId: string) => [...watchKeys.all, tripId] as const,
};

export const watchQueries = {
  trip: (tripId: string) => queryOptions({ queryKey: watchKeys.trip(tripId), queryFn: ({ signal }) => fetchWatch(tripId, signal) }),
};
