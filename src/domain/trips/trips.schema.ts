import { z } from 'zod';
import { driveSchema, LIMITS, stopSchema } from '../../engine';
import { patchOf, versionField } from '../shared/patch';
import { driveIssues } from './drives';

/** A trip: stops (with their weather days) and drives, as the engine contract shapes them. */
export const tripInputSchema = z.object({
  rigId: z.string({ error: 'Choose a rig.' }).min(1, { error: 'Choose a rig.' }),
  name: z.string({ error: 'must be text' }).trim().min(1, { error: 'Name the trip.' }).max(100, { error: 'Use at most 100 characters.' }),
  stops: z.array(stopSchema).min(1, { error: 'Add at least one stop.' }).max(LIMITS.maxStops, { error: `at most ${LIMITS.maxStops} stops` }),
  drives: z.array(driveSchema).max(LIMITS.maxDrives).default([]),
  reserveSocPct: z.number({ error: 'must be a number' }).min(0).max(95).nullable().default(null),
}).superRefine((trip, ctx) => {
  // Drives inside the trip, each ending by the next stop's arrival, none overlapping (drives.ts).
  for (const i of driveIssues(trip.stops, trip.drives)) ctx.addIssue({ code: 'custom', path: i.path, message: i.message });
});
export type TripInput = z.input<typeof tripInputSchema>;

/** PATCH: the version read, plus any fields to change (a field not sent stays as it is). */
export const tripPatchSchema = patchOf(tripInputSchema).extend({ version: versionField });
export type TripPatch = z.input<typeof tripPatchSchema>;
export type TripValues = z.output<typeof tripInputSchema>;
export type TripChanges = z.output<typeof tripPatchSchema>;

export interface TripDto {
  id: string;
  crewId: string;
  rigId: string;
  name: string;
  stops: z.output<typeof stopSchema>[];
  drives: z.output<typeof driveSchema>[];
  reserveSocPct: number | null;
  /** Whether the signed-in user may change this trip (false for a crew viewer). */
  canEdit: boolean;
  /** Whether the signed-in user may delete (and restore) this trip: the owners of its rig's crew only. */
  canDelete: boolean;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export { SKY_CHOICES } from './sky';
