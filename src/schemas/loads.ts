import { z } from 'zod';
import { loadSchema } from '../engine/schema';

/**
 * A load on a rig: the engine contract's load fields plus who added it, a note, and whether it
 * is the rig's standby (parasitic) draw — an all-day, every-day load the UI labels as such.
 */
export const loadInputSchema = loadSchema.extend({
  name: z.string({ error: 'must be text' }).trim().min(1, { error: 'Name the load.' }).max(100, { error: 'Use at most 100 characters.' }),
  note: z.string({ error: 'must be text' }).trim().max(500, { error: 'Use at most 500 characters.' }).default(''),
  standby: z.boolean({ error: 'must be true or false' }).default(false),
});
export type LoadInput = z.input<typeof loadInputSchema>;

export const loadPatchSchema = loadInputSchema.partial().extend({
  version: z.number({ error: 'Send the version you read.' }).int().min(1),
});
export type LoadPatch = z.input<typeof loadPatchSchema>;

export interface LoadDto extends z.output<typeof loadSchema> {
  id: string;
  rigId: string;
  name: string;
  note: string;
  standby: boolean;
  addedBy: { id: string; name: string } | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

/** CSV columns of a load list (import and export). */
export const LOAD_CSV_COLUMNS = ['name', 'watts', 'quantity', 'supply', 'windows', 'dutyPct', 'days', 'response', 'setpointC', 'standby', 'note'] as const;
