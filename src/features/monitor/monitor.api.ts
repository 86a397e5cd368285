// Plain fetchers for monitor logs; hooks live in monitor.queries.ts and the islands.
import type { DetectedMapping } from '../../domain/monitor/detect';
import type { ColumnMapping, MonitorLogDetail, MonitorLogDto, ReadingsPage } from '../../domain/monitor/monitor.schema';
import type { LogPreview } from '../../domain/monitor/monitor';
import { apiFetch } from '../../lib/query-client';

export type { MonitorLogDetail, MonitorLogDto };
export type PreviewAnswer = LogPreview & { fileName: string; bytes: number };

const rigPath = (rigId: string) => `/api/rigs/${encodeURIComponent(rigId)}/monitor-logs`;

export const fetchLogs = (rigId: string, signal?: AbortSignal) => apiFetch<MonitorLogDto[]>(rigPath(rigId), { signal });

export const fetchLog = (id: string, signal?: AbortSignal) => apiFetch<MonitorLogDetail>(`/api/monitor-logs/${encodeURIComponent(id)}`, { signal });

/** One page of a log's readings after `after` (ms; null: from the first). */
export const fetchReadings = (id: string, after: number | null, limit: number, signal?: AbortSignal) =>
  apiFetch<ReadingsPage>(`/api/monitor-logs/${encodeURIComponent(id)}/readings?limit=${limit}${after === null ? '' : `&after=${after}`}`, { signal });

function form(file: File, timeZone: string, mapping: DetectedMapping | ColumnMapping | null, name?: string): FormData {
  const f = new FormData();
  f.set('file', file, file.name);
  f.set('timeZone', timeZone);
  if (mapping) f.set('mapping', JSON.stringify(mapping));
  if (name) f.set('name', name);
  return f;
}

/** Reads a log without saving it: the detected (or the given) mapping, first readings, problems by line. */
export const previewLog = (rigId: string, file: File, timeZone: string, mapping: DetectedMapping | null, signal?: AbortSignal) =>
  apiFetch<PreviewAnswer>(`${rigPath(rigId)}?preview=1`, { method: 'POST', body: form(file, timeZone, mapping), signal });

/** Saves the file and its readings with the confirmed mapping (all or nothing). */
export const saveLog = (rigId: string, file: File, mapping: ColumnMapping, name?: string) =>
  apiFetch<MonitorLogDto & { warnings: string[] }>(rigPath(rigId), { method: 'POST', body: form(file, mapping.timeZone, mapping, name) });

export const deleteLog = (id: string, version: number) => apiFetch<void>(`/api/monitor-logs/${encodeURIComponent(id)}?version=${version}`, { method: 'DELETE' });

export const originalUrl = (id: string) => `/api/monitor-logs/${encodeURIComponent(id)}/original`;
