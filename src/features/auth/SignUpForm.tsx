import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signUpSchema, type SignUpInput } from '../../domain/accounts/accounts.schema';
import { authClient, safeNext } from '../../lib/auth-client';
import { Field, describedBy } from '../../components/ui/Field';

/** Account creation; asks whether the person camps or installs. */
export default function SignUpForm({ next, onSignedUp, kind = 'camper' }: { next?: string; onSignedUp?: () => Promise<void> | void; kind?: 'camper' | 'installer' }) {
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { name: '', email: '', password: '', kind },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const { error } = await authClient.signUp.email({ name: values.name, email: values.email, password: values.password, kind: values.kind } as Parameters<typeof authClient.signUp.email>[0]);
    if (error) {
      setFormError(
        error.status === 429
          ? 'Too many attempts. Wait a minute, then try again.'
          : error.code === 'USER_ALREADY_EXISTS' || error.code === 'USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL' || error.status === 422
            ? 'An account with this e-mail already exists. Sign in instead.'
            : error.message || 'Could not create the account. Try again.',
      );
      return;
    }
    if (onSignedUp) await onSignedUp();
    window.location.assign(safeNext(next, values.kind === 'installer' ? '/installer' : '/rigs'));
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Create account">
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <fieldset>
        <legend className="field-label">I am a…</legend>
        <div className="grid grid-cols-2 gap-2">
          {([
            ['camper', 'Camper', 'I plan trips with my rig'],
            ['installer', 'Installer', 'I size systems for crews'],
          ] as const).map(([value, title, text]) => (
            <label key={value} className="flex cursor-pointer flex-col rounded-xl border-2 border-sand-dark bg-white p-3 has-[:checked]:border-ember has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-ember">
              <span className="flex items-center gap-2 font-bold">
                <input type="radio" value={value} className="accent-ember" {...register('kind')} /> {title}
              </span>
              <span className="text-sm text-slate-text">{text}</span>
            </label>
          ))}
        </div>
        {errors.kind ? <p className="field-error" role="alert">{errors.kind.message}</p> : null}
      </fieldset>
      <Field id="name" label="Your name" error={errors.name?.message}>
        <input id="name" autoComplete="name" className="field-input" {...describedBy('name', errors.name?.message)} {...register('name')} />
      </Field>
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className="field-input" {...describedBy('email', errors.email?.message)} {...register('email')} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message} hint="At least 8 characters.">
        <input id="password" type="password" autoComplete="new-password" className="field-input" {...describedBy('password', errors.password?.message, true)} {...register('password')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Creating account…' : 'Create account'}</button>
    </form>
  );
}
