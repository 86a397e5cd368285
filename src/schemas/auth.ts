import { z } from 'zod';

export const emailField = z.string().trim().min(1, 'Enter your e-mail address.').email('Enter an e-mail address like name@example.com.').max(254);
export const passwordField = z.string().min(8, 'Use at least 8 characters.').max(128, 'Use at most 128 characters.');

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
