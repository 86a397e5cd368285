import { z } from 'zod';
import { UNIT_SYSTEMS } from '../../lib/units';
import { isTimeZone } from '../../lib/clock';

// Accounts: sign-up, sign-in, password reset and the signed-in user's settings. The one place the
// e-mail and password rules are written; better-auth's own limits (src/server/auth.ts) read these.

/** Password length better-auth and every form enforce. */
export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 128;

export const emailField = z.string().trim().min(1, 'Enter your e-mail address.').email('Enter an e-mail address like name@example.com.').max(254);
export const passwordField = z.string().min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`).max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const signInSchema = z.object({
  email: emailField,
  password: z.string().min(1, 'Enter your password.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: z.string().trim().min(1, 'Enter your name.').max(80, 'Use at most 80 characters.'),
  email: emailField,
  password: passwordField,
  kind: z.enum(['camper', 'installer'], { message: 'Choose camper or installer.' }),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const resetRequestSchema = z.object({ email: emailField });
export type ResetRequestInput = z.input<typeof resetRequestSchema>;

export const newPasswordSchema = z
  .object({
    password: passwordField,
    confirm: z.string().min(1, 'Type the new password again.'),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ: type the same password twice.' });
export type NewPasswordInput = z.input<typeof newPasswordSchema>;

/** PATCH /api/settings: the signed-in user's name, units and time zone; send any of them. */
export const settingsSchema = z
  .object({
    name: z.string({ error: 'must be text' }).trim().min(1, { error: 'Enter your name.' }).max(80, { error: 'Use at most 80 characters.' }).optional(),
    units: z.enum(UNIT_SYSTEMS, { error: 'Choose metric or imperial.' }).optional(),
    timeZone: z.string({ error: 'must be text' }).trim().refine(isTimeZone, { error: 'Choose a time zone from the list, such as America/Vancouver.' }).optional(),
    /** The browser's own zone, sent once: stored only while the user has none (a choice made in Settings stays). */
    deviceTimeZone: z.string({ error: 'must be text' }).trim().refine(isTimeZone, { error: 'This device sent a time zone the server does not know.' }).optional(),
  })
  .refine((s) => s.name !== undefined || s.units !== undefined || s.timeZone !== undefined || s.deviceTimeZone !== undefined, { error: 'Send a name, units or time zone to change.', path: ['(body)'] });

export type SettingsInput = z.input<typeof settingsSchema>;
export interface SettingsDto {
  name: string;
  units: 'metric' | 'imperial';
  /** The zone app-event times are shown in; null until the browser tells it or the user chooses. */
  timeZone: string | null;
}
