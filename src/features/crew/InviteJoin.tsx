import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { authClient } from '../../lib/auth-client';
import { Field, describedBy } from '../../components/ui/Field';
import { passwordField } from '../../domain/accounts/accounts.schema';
import type { CrewRoleName } from '../../domain/crews/crews.schema';
import { acceptInvitation } from './crew.api';

interface Props {
  token: string;
  crewName: string;
  role: CrewRoleName;
  email: string;
  /** accept: signed in with the invited address; signup / signin: not signed in yet. */
  mode: 'accept' | 'signup' | 'signin';
}

const signUpHere = z.object({ name: z.string().trim().min(1, 'Enter your name.').max(80, 'Use at most 80 characters.'), password: passwordField });
const signInHere = z.object({ password: z.string().min(1, 'Enter your password.') });

async function joinAndGo(token: string): Promise<string | null> {
  try {
    await acceptInvitation(token);
    window.location.assign('/crew?joined=1');
    return null;
  } catch (e) {
    return (e as Error).message;
  }
}

function AcceptButton({ token, crewName, role }: Pick<Props, 'token' | 'crewName' | 'role'>) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-3">
      {error ? <p role="alert" className="caution font-semibold text-alert">{error}</p> : null}
      <button
        type="button"
        className="btn btn-primary w-full"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          setError(await joinAndGo(token));
          setBusy(false);
        }}
      >
        {busy ? 'Joining…' : `Join ${crewName} as ${role}`}
      </button>
    </div>
  );
}

function SignUpAndJoin({ token, email, crewName }: Pick<Props, 'token' | 'email' | 'crewName'>) {
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<z.infer<typeof signUpHere>>({ resolver: zodResolver(signUpHere), defaultValues: { name: '', password: '' } });
  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    const { error } = await authClient.signUp.email({ name: v.name, email, password: v.password, kind: 'camper' } as Parameters<typeof authClient.signUp.email>[0]);
    if (error) {
      setFormError(error.status === 422 || /exist/i.test(error.message ?? '') ? 'An account with this e-mail already exists: sign in instead.' : error.message || 'The account could not be created. Try again.');
      return;
    }
    setFormError(await joinAndGo(token));
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={`Create an account and join ${crewName}`}>
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <div>
        <span className="field-label">E-mail</span>
        <p className="rounded-[10px] border-[1.5px] border-sand-dark bg-sand px-3 py-2 font-semibold" data-invited-email>{email}</p>
        <p className="field-hint mt-1">The invitation is for this address.</p>
      </div>
      <Field id="join-name" label="Your name" error={errors.name?.message}>
        <input id="join-name" autoComplete="name" className="field-input" {...describedBy('join-name', errors.name?.message)} {...register('name')} />
      </Field>
      <Field id="join-password" label="Password" error={errors.password?.message} hint="At least 8 characters.">
        <input id="join-password" type="password" autoComplete="new-password" className="field-input" {...describedBy('join-password', errors.password?.message, true)} {...register('password')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Joining…' : 'Create account and join'}</button>
    </form>
  );
}

function SignInAndJoin({ token, email, crewName }: Pick<Props, 'token' | 'email' | 'crewName'>) {
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, formState: { errors, isSubmitting } } = useForm<z.infer<typeof signInHere>>({ resolver: zodResolver(signInHere), defaultValues: { password: '' } });
  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    const { error } = await authClient.signIn.email({ email, password: v.password });
    if (error) {
      setFormError(error.status === 429 ? 'Too many attempts. Wait a minute, then try again.' : 'That password does not match this account. Try again, or reset the password.');
      return;
    }
    setFormError(await joinAndGo(token));
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={`Sign in and join ${crewName}`}>
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <div>
        <span className="field-label">E-mail</span>
        <p className="rounded-[10px] border-[1.5px] border-sand-dark bg-sand px-3 py-2 font-semibold" data-invited-email>{email}</p>
      </div>
      <Field id="join-password" label="Password" error={errors.password?.message}>
        <input id="join-password" type="password" autoComplete="current-password" className="field-input" {...describedBy('join-password', errors.password?.message)} {...register('password')} />
      </Field>
      <button type="submit" className="btn btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Joining…' : 'Sign in and join'}</button>
      <p className="text-sm"><a className="font-bold text-ember-deep underline" href="/reset-password">Forgot the password?</a></p>
    </form>
  );
}

/** The /invite/<token> page's action: join now, or sign up / sign in with the invited address and join. */
export default function InviteJoin(props: Props) {
  const [mode, setMode] = useState(props.mode);
  if (mode === 'accept') return <AcceptButton token={props.token} crewName={props.crewName} role={props.role} />;
  return (
    <div>
      {mode === 'signup' ? <SignUpAndJoin {...props} /> : <SignInAndJoin {...props} />}
      <p className="mt-5 text-sm">
        {mode === 'signup' ? 'Already have an account with this address? ' : 'No account with this address yet? '}
        <button type="button" className="font-bold text-ember-deep underline" onClick={() => setMode(mode === 'signup' ? 'signin' : 'signup')}>
          {mode === 'signup' ? 'Sign in instead' : 'Create one'}
        </button>
      </p>
    </div>
  );
}
