import { infiniteQueryOptions } from '@tanstack/react-query';
import { fetchActivity } from './activity.api';

/** Query keys of activity; load mutations can invalidate `activityKeys.all`. */
export const activityKeys = {
  all: ['activity'] as const,
  rig: (rigId: string) => [...activityKeys.all, rigId] as const,
};

export const activityQuery = (rigId: string) =>
  infiniteQueryOptions({
    queryKey: activityKeys.rig(rigId),
    queryFn: ({ pageParam }) => fetchActivity(rigId, pageParam),
    initialPageParam: undefined as string | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
