import { z } from 'zod';
import { arraySchema, bankSchema, chargerSchema, inverterSchema, LIMITS } from '../engine/schema';

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

/** PATCH: the version read, plus any fields to change. */
export const rigPatchSchema = rigInputSchema.omit({ crewId: true }).partial().extend({
  version: z.number({ error: 'Send the version you read.' }).int().min(1),
});
export type RigPatch = z.input<typeof rigPatchSchema>;

export interface RigDto {
  id: string;
  crewId: string;
  name: string;
  bank: z.output<typeof bankSchema>;
  arrays: z.output<typeof arraySchema>[];
  chargers: z.output<typeof chargerSchema>[];
  inverter: z.output<typeof inverterSchema> | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}
