// Plain fetchers for trips, place search and time zones; hooks live in trips.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { TripDto, TripInput, TripPatch } from '../../domain/trips/trips.schema';
import type { Place } from '../../server/places';

/** The trips on the user's crews' rigs (one rig's with `rigId`). */
export const fetchTrips = (rigId?: string) => apiFetch<TripDto[]>(`/api/trips${rigId ? `?rigId=${encodeURIComponent(rigId)}` : ''}`);

/** One trip. */
export const fetchTrip = (id: string) => apiFetch<TripDto>(`/api/trips/${encodeURIComponent(id)}`);

/** Saves a new trip. */
export const createTrip = (input: TripInput) => apiFetch<TripDto>('/api/trips', { method: 'POST', json: input });

/** Saves changes on top of the version read; a stale version is a 409 carrying the current trip. */
export const updateTrip = (id: string, patch: TripPatch) => apiFetch<TripDto>(`/api/trips/${encodeURIComponent(id)}`, { method: 'PATCH', json: patch });

/** Deletes a trip as of the version read. */
export const deleteTrip = (id: string, version: number) => apiFetch<void>(`/api/trips/${encodeURIComponent(id)}?version=${version}`, { method: 'DELETE' });

// A place is the server module's type (type-only import: nothing of the server reaches the bundle).
export type { Place };

/** Places whose name starts with `q`, most populous first. */
export const fetchPlaces = (q: string, signal?: AbortSignal) => apiFetch<Place[]>(`/api/places?q=${encodeURIComponent(q)}`, { signal });

/** The IANA time zone at a point. */
export const fetchTimeZone = (lat: number, lon: number) => apiFetch<{ timeZone: string }>(`/api/timezone?lat=${lat}&lon=${lon}`);
