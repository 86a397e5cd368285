import { queryOptions } from '@tanstack/react-query';
import { fetchLog, fetchLogs } from './monitor.api';

export const monitorKeys = {
  all: ['monitor-logs'] as const,
  list: (rigId: string) => [...monitorKeys.all, 'rig', rigId] as const,
  detail: (id: string) => [...monitorKeys.all, 'detail', id] as const,
};

export const monitorQueries = {
  list: (rigId: string) => queryOptions({ queryKey: monitorKeys.list(rigId), queryFn: ({ signal }) => fetchLogs(rigId, signal) }),
  /** A stored log never changes. */
  detail: (id: string) => queryOptions({ queryKey: monitorKeys.detail(id), queryFn: ({ signal }) => fetchLog(id, signal), staleTime: Infinity }),
};
