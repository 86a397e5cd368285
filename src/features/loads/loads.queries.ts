import { queryOptions } from '@tanstack/react-query';
import { fetchLoads } from './loads.api';

/** Query keys of load lists. */
export const loadKeys = {
  all: ['loads'] as const,
  list: (rigId: string) => [...loadKeys.all, 'rig', rigId] as const,
};

export const loadsQuery = (rigId: string) => queryOptions({ queryKey: loadKeys.list(rigId), queryFn: () => fetchLoads(rigId) });
