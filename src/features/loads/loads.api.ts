// Plain fetchers for a rig's load list; hooks live in loads.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { LoadDto, LoadInput, LoadPatch } from '../../domain/loads/loads.schema';

const rigPath = (rigId: string) => `/api/rigs/${encodeURIComponent(rigId)}`;

/** The loads of a rig. */
export const fetchLoads = (rigId: string) => apiFetch<LoadDto[]>(`${rigPath(rigId)}/loads`);

/** Adds a load to a rig. */
export const createLoad = (rigId: string, input: LoadInput) => apiFetch<LoadDto>(`${rigPath(rigId)}/loads`, { method: 'POST', json: input });

/** Saves a load on top of the version read; a stale version is a 409 carrying the current load. */
export const updateLoad = (id: string, patch: LoadPatch) => apiFetch<LoadDto>(`/api/loads/${encodeURIComponent(id)}`, { method: 'PATCH', json: patch });

/** Deletes a load as of the version read. */
export const deleteLoad = (id: string, version: number) => apiFetch<void>(`/api/loads/${encodeURIComponent(id)}?version=${version}`, { method: 'DELETE' });

export interface CsvLineError {
  line: number;
  column?: string;
  message: string;
}

export interface CsvPreview {
  rows: (Partial<LoadInput> & { line?: number })[];
  errors: CsvLineError[];
}

/** Checks a CSV load list without saving anything: the rows it would add and each line's errors. */
export const previewCsv = (rigId: string, csv: string) =>
  apiFetch<CsvPreview>(`${rigPath(rigId)}/loads/import?preview=1`, { method: 'POST', headers: { 'content-type': 'text/csv' }, body: csv });

/** Imports a CSV load list: all lines or none. */
export const importCsv = (rigId: string, csv: string) =>
  apiFetch<{ imported: number; loads: LoadDto[] }>(`${rigPath(rigId)}/loads/import`, { method: 'POST', headers: { 'content-type': 'text/csv' }, body: csv });

/** Where the rig's load list downloads as CSV. */
export const loadsCsvUrl = (rigId: string) => `${rigPath(rigId)}/loads.csv`;
