import { z } from 'zod';
import { arraySchema, bankSchema, chargerSchema, inverterSchema, LIMITS } from '../../engine';
import { patchOf, versionField } from '../shared/patch';

/**
 * A rig: one vehicle's power system. Bank, arrays, chargers and inverter use the engine
 * contract's shapes and field names, so a rig drops straight into a forecast plan.
 */
export const rigNameField = z.string({ error: 'must be text' }).trim().min(1, { error: 'Give the rig a name.' }).max(80, { error: 'Use at most 80 characters.' });

export const rigInputSchema = z.object({
  name: rigNameField,
  bank: bankSchema,
  arrays: z.array(arraySchema).max(LIMITS.maxArrays, { error: `at most ${LIMITS.maxArrays} arrays` }).default([]),
  chargers: z.array(chargerSchema).max(LIMITS.maxChargers, { error: `at most ${LIMITS.maxChargers} chargers` }).default([]),
  inverter: inverterSchema.nullable().default(null),
  crewId: z.string().min(1).optional(),
});
export type RigInput = z.input<typeof rigInputSchema>;

/** PATCH: the version read, plus any fields to change (a field not sent stays as it is). */
export const rigPatchSchema = patchOf(rigInputSchema.omit({ crewId: true })).extend({ version: versionField });
export type RigPatch = z.input<typeof rigPatchSchema>;
export type RigValues = z.output<typeof rigInputSchema>;
export type RigChanges = z.output<typeof rigPatchSchema>;

export interface RigDto {
  id: string;
  crewId: string;
  name: string;
  bank: z.output<typeof bankSchema>;
  arrays: z.output<typeof arraySchema>[];
  chargers: z.output<typeof chargerSchema>[];
  inverter: z.output<typeof inverterSchema> | null;
  /** Whether the signed-in user may change this rig, its loads and its trips (false for a crew viewer). */
  canEdit: boolean;
  version: number;
  createdAt: string;
  updatedAt: string;
}
