import { queryOptions } from '@tanstack/react-query';
import { fetchPlaces, fetchTimeZone, fetchTrip, fetchTrips } from './trips.api';

/** Query keys of trips, places and time zones. */
export const tripKeys = {
  all: ['trips'] as const,
  list: (rigId?: string) => [...tripKeys.all, 'list', rigId ?? 'all'] as const,
  detail: (id: string) => [...tripKeys.all, 'detail', id] as const,
  places: (q: string) => ['places', q.trim().toLowerCase()] as const,
  timeZone: (lat: number, lon: number) => ['timezone', lat, lon] as const,
};

export const tripsQuery = (rigId?: string) => queryOptions({ queryKey: tripKeys.list(rigId), queryFn: () => fetchTrips(rigId) });

export const tripQuery = (id: string) => queryOptions({ queryKey: tripKeys.detail(id), queryFn: () => fetchTrip(id) });

/** Place search results never change for a query: cache them for the session. */
export const placesQuery = (q: string) =>
  queryOptions({ queryKey: tripKeys.places(q), queryFn: ({ signal }) => fetchPlaces(q.trim(), signal), staleTime: Infinity, gcTime: 10 * 60_000 });

export const timeZoneQuery = (lat: number, lon: number) =>
  queryOptions({ queryKey: tripKeys.timeZone(lat, lon), queryFn: () => fetchTimeZone(lat, lon), staleTime: Infinity });
