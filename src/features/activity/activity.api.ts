// Plain fetcher for a rig's load activity.
import { apiFetch } from '../../lib/query-client';
import type { ActivityDto } from '../../domain/crews/crews.schema';

export interface ActivityPage {
  items: ActivityDto[];
  /** Cursor for the next (older) page; null on the last page. */
  nextBefore: string | null;
}

/** One page of a rig's load activity, newest first. */
export const fetchActivity = (rigId: string, before?: string) =>
  apiFetch<ActivityPage>(`/api/rigs/${encodeURIComponent(rigId)}/activity?limit=30${before ? `&before=${encodeURIComponent(before)}` : ''}`);
