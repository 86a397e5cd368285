import { queryOptions } from '@tanstack/react-query';
import { fetchRig, fetchRigs } from './rigs.api';

/** Query keys of rigs: one place, so invalidation cannot miss a spelling. */
export const rigKeys = {
  all: ['rigs'] as const,
  list: () => [...rigKeys.all, 'list'] as const,
  detail: (id: string) => [...rigKeys.all, 'detail', id] as const,
};

export const rigsQuery = () => queryOptions({ queryKey: rigKeys.list(), queryFn: fetchRigs });

export const rigQuery = (id: string) => queryOptions({ queryKey: rigKeys.detail(id), queryFn: () => fetchRig(id) });
