import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signInSchema, type SignInInput } from '../../domain/accounts/accounts.schema';
import { authClient, safeNext } from '../../lib/auth-client';
import { Field, describedBy } from '../../components/ui/Field';

/** E-mail and password sign-in. */
export default function SignInForm({ next }: { next?: string }) {
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: '', password: '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const { data, error } = await authClient.signIn.email({ email: values.email, password: values.password });
    if (error) {
      setFormError(
        error.status === 429
          ? 'Too many attempts. Wait a minute, then try again.'
          : error.status === 401 || error.code === 'INVALID_EMAIL_OR_PASSWORD'
            ? 'That e-mail and password do not match an account. Check both, or create an account.'
            : error.message || 'Sign-in failed. Try again.',
      );
      return;
    }
    // Installers land on their own page (rigs shared with them, their proposals), campers on their trips.
    const kind = (data?.user as { kind?: string } | undefined)?.kind;
    window.location.assign(safeNext(next, kind === 'installer' ? '/installer' : '/trips'));
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Sign in">
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className="field-input" {...describedBy('email', errors.email?.message)} {...register('email')} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <input id="password" type="password" autoComplete="current-password" className="field-input" {...describedBy('password', errors.password?.message)} {...register('password')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Signing in…' : 'Sign in'}</button>
    </form>
  );
}
