// Deleted rigs and trips: what goes with them, and how long they can still be restored. Pure, shared by
// the server (purge, lists) and the islands (the confirmation, the "Recently deleted" list).

/** Days a deleted rig or trip stays restorable before the purge removes it for good. */
export const RESTORE_DAYS = 30;

const DAY_MS = 86_400_000;

/** What deleting a rig or a trip takes with it (a trip's answer has no loads, logs or trips). */
export interface DeletionCounts {
  trips?: number;
  forecasts: number;
  checkIns: number;
  loads?: number;
  logs?: number;
}

/** A deleted rig or trip as the "Recently deleted" list shows it. */
export interface DeletedItem {
  kind: 'rig' | 'trip';
  id: string;
  name: string;
  crewId: string;
  deletedAt: string;
  deletedBy: string | null;
  /** Whole days left before the purge (at least 0). */
  daysLeft: number;
  /** For a trip: its rig, and whether that rig is deleted too (then the rig is restored first). */
  rigId?: string;
  rigName?: string;
  rigDeleted?: boolean;
}

/** The moment before which deleted rows are purged. */
export function purgeBefore(nowMs: number): string {
  return new Date(nowMs - RESTORE_DAYS * DAY_MS).toISOString();
}

/** Whole days until a row deleted at `deletedAt` is purged: 30 on the day it was deleted, 0 on its last day. */
export function daysLeft(deletedAt: string, nowMs: number): number {
  const left = Date.parse(deletedAt) + RESTORE_DAYS * DAY_MS - nowMs;
  return Number.isFinite(left) ? Math.max(0, Math.ceil(left / DAY_MS)) : 0;
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/**
 * What goes with a deletion, in words: "2 trips, 5 saved forecasts, 3 check-ins"; only what there is
 * (an empty rig: "nothing else").
 */
export function describeDeletion(c: DeletionCounts): string {
  const parts = [
    c.loads ? plural(c.loads, 'load', 'loads') : '',
    c.trips ? plural(c.trips, 'trip', 'trips') : '',
    c.forecasts ? plural(c.forecasts, 'saved forecast', 'saved forecasts') : '',
    c.checkIns ? plural(c.checkIns, 'check-in', 'check-ins') : '',
    c.logs ? plural(c.logs, 'monitor log', 'monitor logs') : '',
  ].filter(Boolean);
  return parts.length ? parts.join(', ') : 'nothing else';
}
