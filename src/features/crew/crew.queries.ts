import { queryOptions } from '@tanstack/react-query';
import { fetchCrew, fetchCrews } from './crew.api';

/** Query keys of crews: one place, so invalidation cannot miss a spelling. */
export const crewKeys = {
  all: ['crews'] as const,
  list: () => [...crewKeys.all, 'list'] as const,
  detail: (id: string) => [...crewKeys.all, 'detail', id] as const,
};

export const crewsQuery = () => queryOptions({ queryKey: crewKeys.list(), queryFn: fetchCrews });

export const crewQuery = (id: string) => queryOptions({ queryKey: crewKeys.detail(id), queryFn: () => fetchCrew(id) });
