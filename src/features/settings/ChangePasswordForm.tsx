import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Field, describedBy } from '../../components/ui/Field';
import { authClient } from '../../lib/auth-client';
import { newPasswordSchema } from '../../domain/accounts/accounts.schema';

const schema = z
  .object({
    current: z.string().min(1, 'Type your current password.'),
    password: newPasswordSchema.shape.password,
    confirm: newPasswordSchema.shape.confirm,
    signOutOthers: z.boolean(),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ: type the same password twice.' })
  .refine((v) => v.password !== v.current, { path: ['password'], message: 'Choose a password other than the current one.' });
type Values = z.input<typeof schema>;

/** Changes the password of the signed-in account (better-auth checks the current one), optionally signing out other devices. */
export default function ChangePasswordForm() {
  const [status, setStatus] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, reset, setError, formState: { errors, isSubmitting } } = useForm<Values>({
    resolver: zodResolver(schema),
    defaultValues: { current: '', password: '', confirm: '', signOutOthers: true },
  });

  const onSubmit = handleSubmit(async (v) => {
    setStatus(null);
    setFormError(null);
    const { error } = await authClient.changePassword({ currentPassword: v.current, newPassword: v.password, revokeOtherSessions: v.signOutOthers });
    if (error) {
      if (error.code === 'INVALID_PASSWORD') setError('current', { message: 'This is not your current password.' });
      else if (error.code === 'PASSWORD_TOO_SHORT' || error.code === 'PASSWORD_TOO_LONG') setError('password', { message: 'Use 8 to 128 characters.' });
      else if (error.status === 429) setFormError('Too many tries: wait a minute, then try again.');
      else setFormError(error.message || 'The password could not be changed. Try again.');
      return;
    }
    reset({ current: '', password: '', confirm: '', signOutOthers: v.signOutOthers });
    setStatus(v.signOutOthers ? 'Password changed. Your other devices are signed out; this one stays signed in.' : 'Password changed.');
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Change your password" className="space-y-4">
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <Field id="current-password" label="Current password" error={errors.current?.message}>
        <input id="current-password" type="password" autoComplete="current-password" className="field-input" {...describedBy('current-password', errors.current?.message)} {...register('current')} />
      </Field>
      <Field id="new-password" label="New password" error={errors.password?.message} hint="At least 8 characters.">
        <input id="new-password" type="password" autoComplete="new-password" className="field-input" {...describedBy('new-password', errors.password?.message, true)} {...register('password')} />
      </Field>
      <Field id="confirm-password" label="New password again" error={errors.confirm?.message}>
        <input id="confirm-password" type="password" autoComplete="new-password" className="field-input" {...describedBy('confirm-password', errors.confirm?.message)} {...register('confirm')} />
      </Field>
      <label className="flex min-h-[44px] cursor-pointer items-center gap-2">
        <input type="checkbox" className="h-5 w-5 accent-ember" {...register('signOutOthers')} /> Sign out my other devices
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Changing…' : 'Change password'}</button>
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">{status ?? ''}</p>
      </div>
    </form>
  );
}
