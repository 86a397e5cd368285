// Plain fetchers for a rig's load list; hooks live in loads.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { LoadDto, LoadInput, LoadPatch } from '../../domain/loads/loads.schema';
import type { ImportMode } from '../../domain/loads/import-choice';

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
  /** The list as it was when the file was checked: a replacing import sends its version back. */
  list: { version: string; loads: { id: string; name: string; version: number }[] };
  /** The file's rows whose names are already in the list. */
  alreadyListed: { line: number; name: string }[];
}

const importPath = (rigId: string, params: Record<string, string>) => `${rigPath(rigId)}/loads/import?${new URLSearchParams(params).toString()}`;

/** Checks a CSV load list without saving anything: the rows it would add, each line's errors, and the list it meets. */
export const previewCsv = (rigId: string, csv: string, mode: ImportMode = 'add') =>
  apiFetch<CsvPreview>(importPath(rigId, { preview: '1', mode }), { method: 'POST', headers: { 'content-type': 'text/csv' }, body: csv });

/** Imports a CSV load list: all lines or none, added to the list or replacing it (as of `listVersion`; a changed list is a 409). */
export const importCsv = (rigId: string, csv: string, mode: ImportMode = 'add', listVersion?: string) =>
  apiFetch<{ imported: number; removed: number; loads: LoadDto[] }>(importPath(rigId, { mode, ...(listVersion ? { listVersion } : {}) }), {
    method: 'POST',
    headers: { 'content-type': 'text/csv' },
    body: csv,
  });

/** Where the rig's load list downloads as CSV. */
export const loadsCsvUrl = (rigId: string) => `${rigPath(rigId)}/loads.csv`;
