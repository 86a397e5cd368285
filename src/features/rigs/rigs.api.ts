// Plain fetchers for the rig routes; hooks live in rigs.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { RigDto, RigInput, RigPatch } from '../../domain/rigs/rigs.schema';

/** The rigs of the signed-in user's crews. */
export const fetchRigs = () => apiFetch<RigDto[]>('/api/rigs');

/** One rig. */
export const fetchRig = (id: string) => apiFetch<RigDto>(`/api/rigs/${encodeURIComponent(id)}`);

/** Creates a rig in the user's crew. */
export const createRig = (input: RigInput) => apiFetch<RigDto>('/api/rigs', { method: 'POST', json: input });

/** Saves changes on top of the version read; a stale version is a 409 carrying the current rig. */
export const updateRig = (id: string, patch: RigPatch) => apiFetch<RigDto>(`/api/rigs/${encodeURIComponent(id)}`, { method: 'PATCH', json: patch });

/** Deletes a rig as of the version read. */
export const deleteRig = (id: string, version: number) =>
  apiFetch<void>(`/api/rigs/${encodeURIComponent(id)}?version=${version}`, { method: 'DELETE' });
