import { z } from 'zod';
import { loadSchema } from '../../engine';
import { patchOf, versionField } from '../shared/patch';

/**
 * A load on a rig: the engine contract's load fields plus who added it, a note, and whether it
 * is the rig's standby (parasitic) draw — an all-day, every-day load the UI labels as such.
 */
export const loadInputSchema = loadSchema.extend({
  name: z.string({ error: 'must be text' }).trim().min(1, { error: 'Name the load.' }).max(100, { error: 'Use at most 100 characters.' }),
  note: z.string({ error: 'must be text' }).trim().max(500, { error: 'Use at most 500 characters.' }).default(''),
  standby: z.boolean({ error: 'must be true or false' }).default(false),
  /** Place in the rig's list; a new load goes last when this is left out. */
  position: z.number({ error: 'must be a number' }).int({ error: 'must be a whole number' }).min(0, { error: 'must be at least 0' }).max(1_000_000, { error: 'must be at most 1000000' }).optional(),
});
export type LoadInput = z.input<typeof loadInputSchema>;

/** PATCH: the version read, plus any fields to change (a field not sent stays as it is). */
export const loadPatchSchema = patchOf(loadInputSchema).extend({ version: versionField });
export type LoadPatch = z.input<typeof loadPatchSchema>;

export interface LoadDto extends z.output<typeof loadSchema> {
  id: string;
  rigId: string;
  name: string;
  note: string;
  standby: boolean;
  position: number;
  addedBy: { id: string; name: string } | null;
  /** Who saved the load last (null before it was recorded): a stale edit's notice names them. */
  updatedBy: { id: string; name: string } | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

/** CSV columns of a load list (import and export); `location` and `surgeWatts` (engine revision 2) are optional, so older files still import. */
export const LOAD_CSV_COLUMNS = ['name', 'watts', 'quantity', 'supply', 'windows', 'dutyPct', 'days', 'response', 'setpointC', 'standby', 'note', 'location', 'surgeWatts'] as const;
