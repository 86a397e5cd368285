import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { Field, describedBy } from '../../components/ui/Field';
import { applyServerIssues } from '../../components/ui/form';
import { ApiError } from '../../lib/query-client';
import { formatLength, formatTemp, tempUnit, toUnits, type Units } from '../../lib/units';
import { saveSettings } from './settings.api';
import { settingsSchema } from '../../domain/accounts/accounts.schema';

// The form always sends both fields, so both are required here (the API accepts either).
const formSchema = z.object({ name: settingsSchema.shape.name.unwrap(), units: settingsSchema.shape.units.unwrap() });
type Values = { name: string; units: Units };

/** Name and units (metric or imperial). Values stay stored in SI; units only change what the screens show. */
function SettingsForm({ name, units }: { name: string; units: Units }) {
  const [status, setStatus] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, reset, setError, formState: { errors, isDirty } } = useForm<Values>({
    resolver: zodResolver(formSchema),
    defaultValues: { name, units: toUnits(units) },
  });
  const save = useMutation({
    mutationFn: saveSettings,
    onSuccess: (s) => {
      reset({ name: s.name, units: s.units });
      setStatus(`Saved. Temperatures show in ${tempUnit(s.units)}.`);
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        const loose = applyServerIssues(e.issues, setError);
        setFormError(loose.length ? `${e.message} ${loose.map((i) => i.message).join(' ')}` : e.message);
      } else setFormError('Could not save. Try again.');
    },
  });
  const onSubmit = handleSubmit((v) => {
    setStatus(null);
    setFormError(null);
    save.mutate({ name: v.name, units: v.units });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Settings" className="space-y-5">
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      <Field id="name" label="Your name" error={errors.name?.message} hint="Shown to your crew next to the loads you add.">
        <input id="name" autoComplete="name" className="field-input" {...describedBy('name', errors.name?.message, true)} {...register('name')} />
      </Field>
      <fieldset id="units">
        <legend className="field-label">Units</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {(['metric', 'imperial'] as const).map((u) => (
            <label key={u} className="flex cursor-pointer flex-col rounded-xl border-2 border-sand-dark bg-white p-3 has-[:checked]:border-ember has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-ember">
              <span className="flex items-center gap-2 font-bold">
                <input type="radio" value={u} className="accent-ember" {...register('units')} /> {u === 'metric' ? 'Metric' : 'Imperial'}
              </span>
              <span className="text-sm text-slate-text">{formatTemp(-2, u)}, {formatTemp(25, u)} · cable runs in {formatLength(3, u).replace(/^[\d.]+ /, '')}</span>
            </label>
          ))}
        </div>
        {errors.units ? <p className="field-error" role="alert">Units: {errors.units.message}</p> : <p className="field-hint mt-1">Amps, volts, watts and amp-hours are the same either way. Everything is stored in metric.</p>}
      </fieldset>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn btn-primary" disabled={save.isPending || !isDirty}>{save.isPending ? 'Saving…' : 'Save settings'}</button>
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">{status && !isDirty ? status : ''}</p>
      </div>
    </form>
  );
}

export default withQueryClient(SettingsForm);
