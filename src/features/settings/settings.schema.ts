import { z } from 'zod';
import { UNIT_SYSTEMS } from '../../lib/units';

/** PATCH /api/settings: the signed-in user's name and units; send either or both. */
export const settingsSchema = z
  .object({
    name: z.string({ error: 'must be text' }).trim().min(1, { error: 'Enter your name.' }).max(80, { error: 'Use at most 80 characters.' }).optional(),
    units: z.enum(UNIT_SYSTEMS, { error: 'Choose metric or imperial.' }).optional(),
  })
  .refine((s) => s.name !== undefined || s.units !== undefined, { error: 'Send a name or units to change.', path: ['(body)'] });

export type SettingsInput = z.input<typeof settingsSchema>;
export interface SettingsDto {
  name: string;
  units: 'metric' | 'imperial';
}
