import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { newPasswordSchema, resetRequestSchema, type NewPasswordInput, type ResetRequestInput } from '../../domain/accounts/accounts.schema';
import { authClient } from '../../lib/auth-client';
import { Field, describedBy } from '../../components/ui/Field';

/** Step 1: asks for the account's e-mail and sends the reset link (better-auth's flow). */
export function RequestResetForm() {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<ResetRequestInput>({
    resolver: zodResolver(resetRequestSchema),
    defaultValues: { email: '' },
  });

  const onSubmit = handleSubmit(async ({ email }) => {
    setFormError(null);
    const { error } = await authClient.requestPasswordReset({ email, redirectTo: '/reset-password' });
    if (error) {
      setFormError(error.status === 429 ? 'Too many requests. Wait a minute, then try again.' : error.message || 'The link could not be sent. Try again.');
      return;
    }
    setSentTo(email);
  });

  if (sentTo) {
    return (
      <div role="status" className="space-y-3">
        <p className="font-bold">Check your e-mail.</p>
        <p>If <strong>{sentTo}</strong> has a Sunreckon account, a link to choose a new password is on its way. It works once, for one hour.</p>
        <button type="button" className="btn btn-quiet" onClick={() => setSentTo(null)}>Use another address</button>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Ask for a reset link">
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <Field id="email" label="E-mail of your account" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className="field-input" {...describedBy('email', errors.email?.message)} {...register('email')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Sending…' : 'Send me a reset link'}</button>
    </form>
  );
}

/** Step 2: the link's token plus a new password; the token works once. */
export function NewPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<NewPasswordInput>({
    resolver: zodResolver(newPasswordSchema),
    defaultValues: { password: '', confirm: '' },
  });

  const onSubmit = handleSubmit(async ({ password }) => {
    setFormError(null);
    const { error } = await authClient.resetPassword({ newPassword: password, token });
    if (error) {
      setFormError(
        error.code === 'INVALID_TOKEN' || /token/i.test(error.message ?? '')
          ? 'This reset link has expired or was already used. Ask for a new link below.'
          : error.message || 'The password could not be changed. Try again.',
      );
      return;
    }
    setDone(true);
  });

  if (done) {
    return (
      <div role="status" className="space-y-3">
        <p className="font-bold">Your password is changed.</p>
        <p>Every device that was signed in has been signed out. Sign in with the new password.</p>
        <a className="btn btn-primary" href="/sign-in">Sign in</a>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Choose a new password">
      {formError ? (
        <div role="alert" className="caution">
          <p className="font-semibold text-alert">{formError}</p>
          <a className="mt-2 inline-block font-bold text-ember-deep underline" href="/reset-password">Ask for a new link</a>
        </div>
      ) : null}
      <Field id="password" label="New password" error={errors.password?.message} hint="At least 8 characters.">
        <input id="password" type="password" autoComplete="new-password" className="field-input" {...describedBy('password', errors.password?.message, true)} {...register('password')} />
      </Field>
      <Field id="confirm" label="New password again" error={errors.confirm?.message}>
        <input id="confirm" type="password" autoComplete="new-password" className="field-input" {...describedBy('confirm', errors.confirm?.message)} {...register('confirm')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Saving…' : 'Save the new password'}</button>
    </form>
  );
}
