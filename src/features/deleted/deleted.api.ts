// Plain fetchers for deleting and restoring rigs and trips (hooks live in the islands).
import { apiFetch } from '../../lib/query-client';
import type { DeletedItem, DeletionCounts } from '../../domain/shared/deletion';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import type { TripDto } from '../../domain/trips/trips.schema';

/** What deleting the rig or trip would take with it. */
export const fetchDeletionCounts = (kind: 'rig' | 'trip', id: string) =>
  apiFetch<DeletionCounts>(`/api/${kind}s/${encodeURIComponent(id)}/deletion`);

/** Rigs and trips deleted in the crews the user owns, still restorable. */
export const fetchDeleted = () => apiFetch<DeletedItem[]>('/api/deleted');

/** Brings a deleted rig back. */
export const restoreRig = (id: string) => apiFetch<RigDto>(`/api/rigs/${encodeURIComponent(id)}/restore`, { method: 'POST' });

/** Brings a deleted trip back. */
export const restoreTrip = (id: string) => apiFetch<TripDto>(`/api/trips/${encodeURIComponent(id)}/restore`, { method: 'POST' });

/** Query keys of this area. */
export const deletedKeys = {
  all: ['deleted'] as const,
  list: () => [...deletedKeys.all, 'list'] as const,
  counts: (kind: 'rig' | 'trip', id: string) => [...deletedKeys.all, 'counts', kind, id] as const,
};
