// Plain fetchers of a trip's watch (issue #20): its state, runs and notice; turning it on or off;
// following it by e-mail.
import { apiFetch } from '../../lib/query-client';

export type { TripWatch, WatchNotice, WatchRun, WatchVerdict } from '../../domain/watch/view';
import type { TripWatch } from '../../domain/watch/view';

const base = (tripId: string) => `/api/trips/${encodeURIComponent(tripId)}/watch`;

export const fetchWatch = (tripId: string, signal?: AbortSignal) => apiFetch<TripWatch>(base(tripId), { signal });

export const setWatchEnabled = (tripId: string, enabled: boolean) =>
  apiFetch<TripWatch>(base(tripId), { method: 'PUT', json: { enabled } });

export const setWatchFollowing = (tripId: string, following: boolean) =>
  apiFetch<TripWatch>(`${base(tripId)}/follow`, { method: 'PUT', json: { following } });
