import { z } from 'zod';
import { arraySchema, bankSchema, chargerSchema, CHEMISTRY_DEFAULTS, inverterSchema, LIMITS } from '../../engine';
import { patchOf, versionField } from '../shared/patch';

/**
 * A rig: one vehicle's power system. Bank, arrays, chargers and inverter use the engine
 * contract's shapes and field names, so a rig drops straight into a forecast plan.
 */
export const rigNameField = z.string({ error: 'must be text' }).trim().min(1, { error: 'Give the rig a name.' }).max(80, { error: 'Use at most 80 characters.' });

/**
 * Low-voltage cutoff band, as a share of the bank's nominal volts (the chemistry's own nominal volts
 * when none is given). 0.75–1.0 × nominal is common practice: a 12.8 V LiFePO4 BMS cuts near 10 V,
 * a 12 V lead-acid rig near 10.5 V; a cutoff at or above nominal would cut a healthy bank.
 */
export const CUTOFF_BAND = { low: 0.75, high: 1.0 } as const;

const rigBankSchema = bankSchema.superRefine((bank, ctx) => {
  if (bank.cutoffVolts == null) return;
  const nominal = bank.nominalVolts ?? CHEMISTRY_DEFAULTS[bank.chemistry].nominalVolts;
  const low = Math.round(nominal * CUTOFF_BAND.low * 10) / 10;
  const high = Math.round(nominal * CUTOFF_BAND.high * 10) / 10;
  if (bank.cutoffVolts < low || bank.cutoffVolts > high) {
    ctx.addIssue({
      code: 'custom',
      path: ['cutoffVolts'],
      message: `The low-voltage cutoff must be between ${low} V and ${high} V for a ${nominal} V bank.`,
    });
  }
});

export const rigInputSchema = z.object({
  name: rigNameField,
  bank: rigBankSchema,
  arrays: z.array(arraySchema).max(LIMITS.maxArrays, { error: `at most ${LIMITS.maxArrays} arrays` }).default([]),
  chargers: z.array(chargerSchema).max(LIMITS.maxChargers, { error: `at most ${LIMITS.maxChargers} chargers` }).default([]),
  inverter: inverterSchema.nullable().default(null),
  /** What the rig may still carry, kg: the upgrade sweep checks bank weights against it. */
  payloadKg: z.number({ error: 'The payload must be a number of kilograms, such as 250.' }).positive({ error: 'The payload must be more than 0 kg.' }).max(20_000, { error: 'The payload can be at most 20,000 kg.' }).nullable().default(null),
  /** Room for batteries, litres: the upgrade sweep checks bank sizes against it. */
  batterySpaceL: z.number({ error: 'The battery room must be a number of litres, such as 60.' }).positive({ error: 'The battery room must be more than 0 L.' }).max(5_000, { error: 'The battery room can be at most 5,000 L.' }).nullable().default(null),
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
  payloadKg: number | null;
  batterySpaceL: number | null;
  /** Whether the signed-in user may change this rig, its loads and its trips (false for a crew viewer). */
  canEdit: boolean;
  /** Whether the signed-in user may delete (and restore) this rig: the crew's owners only. */
  canDelete: boolean;
  version: number;
  createdAt: string;
  updatedAt: string;
}
