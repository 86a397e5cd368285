// Plain fetchers for a trip's check-ins (sending one goes through the outbox, src/features/offline/outbox.ts).
import type { CheckInDto } from '../../domain/checkins/checkins.schema';
import { apiFetch } from '../../lib/query-client';

export const fetchCheckIns = (tripId: string, signal?: AbortSignal) => apiFetch<CheckInDto[]>(`/api/trips/${encodeURIComponent(tripId)}/check-ins`, { signal });

/** Removes a check-in as of the version read. */
export const deleteCheckIn = (id: string, version: number) => apiFetch<void>(`/api/check-ins/${encodeURIComponent(id)}?version=${version}`, { method: 'DELETE' });
