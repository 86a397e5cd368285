import { queryOptions } from '@tanstack/react-query';
import { fetchCheckIns } from './checkins.api';

export const checkInKeys = {
  all: ['check-ins'] as const,
  list: (tripId: string) => [...checkInKeys.all, tripId] as const,
};

export const checkInQueries = {
  list: (tripId: string) => queryOptions({ queryKey: checkInKeys.list(tripId), queryFn: ({ signal }) => fetchCheckIns(tripId, signal) }),
};
