import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Field, describedBy } from '../../components/ui/Field';
import { NumberField } from '../../components/ui/NumberField';
import { applyServerIssues, asNumber, errorAt, fieldId } from '../../components/ui/form';
import { ErrorState, LoadingState } from '../../components/ui/States';
import { ApiError, isConflict } from '../../lib/query-client';
import { priceListSchema, type PriceList, type PriceListInput } from '../../domain/proposals/proposals.schema';
import { savePriceList, type PriceListDto } from './proposals.api';
import { proposalKeys, proposalQueries } from './proposals.queries';

const num = { setValueAs: asNumber };
const ID = 'price-';

function values(dto: PriceListDto): PriceListInput {
  const { version: _v, saved: _s, updatedAt: _u, ...v } = dto;
  return v;
}

/** The installer's price list: the unit prices every sweep and proposal is priced from, in one currency. */
export default function PriceListForm({ onSaved }: { onSaved?: (dto: PriceListDto) => void }) {
  const q = useQuery(proposalQueries.priceList());
  if (q.isPending) return <LoadingState label="Loading your price list…" />;
  if (q.isError) return <ErrorState error={q.error} title="Your price list could not be loaded." onRetry={() => void q.refetch()} />;
  return <Form dto={q.data} onSaved={onSaved} />;
}

function Form({ dto, onSaved }: { dto: PriceListDto; onSaved?: (dto: PriceListDto) => void }) {
  const qc = useQueryClient();
  const [status, setStatus] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<PriceListInput, unknown, PriceList>({ resolver: zodResolver(priceListSchema), defaultValues: values(dto) });
  const { register, handleSubmit, setError, reset, formState: { errors, isDirty } } = form;
  const currency = form.watch('currency');
  const save = useMutation({
    mutationFn: (v: PriceList) => savePriceList({ ...v, version: dto.version }),
    onSuccess: (saved) => {
      qc.setQueryData(proposalKeys.priceList(), saved);
      reset(values(saved));
      setStatus(`Saved (version ${saved.version}).`);
      onSaved?.(saved);
    },
    onError: (e) => {
      if (isConflict(e)) {
        const current = e.current<PriceListDto>();
        if (current) {
          qc.setQueryData(proposalKeys.priceList(), current);
          reset(values(current));
        }
        setFormError('You saved this price list in another window meanwhile; it is shown as saved there. Enter your changes again.');
      } else if (e instanceof ApiError) {
        const loose = applyServerIssues(e.issues, setError, ID);
        setFormError(loose.length ? `${e.message} ${loose.map((i) => `${i.path}: ${i.message}`).join(' ')}` : e.message);
      } else setFormError('Could not save. Try again.');
    },
  });

  const money = (path: string, label: string, hint?: string) => (
    <NumberField
      id={ID + fieldId(path)}
      label={label}
      unit={(currency || '').toUpperCase().slice(0, 3)}
      hint={hint}
      error={errorAt(errors, path)}
      registration={register(path as never, num)}
    />
  );

  return (
    <form
      noValidate
      aria-label="Price list"
      className="space-y-5"
      onSubmit={handleSubmit((v) => {
        setStatus(null);
        setFormError(null);
        save.mutate(v);
      })}
    >
      {formError ? <p role="alert" className="caution font-semibold text-alert">{formError}</p> : null}
      {!dto.saved ? <p className="field-hint">Enter your own prices; sweeps rank options by them. Nothing is filled in for you.</p> : null}
      <Field id={`${ID}currency`} label="Currency" error={errorAt(errors, 'currency')} hint="Three letters: USD, CAD, EUR, AUD…" className="max-w-[12rem]">
        <input id={`${ID}currency`} className="field-input uppercase" maxLength={3} autoComplete="off" {...describedBy(`${ID}currency`, errorAt(errors, 'currency'), true)} {...register('currency')} />
      </Field>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-lg font-extrabold">Batteries, per Ah</legend>
        {money('bankPerAh.lifepo4', 'LiFePO4 bank, per Ah')}
        {money('bankPerAh.agm', 'AGM bank, per Ah')}
        {money('bankPerAh.flooded', 'Flooded lead-acid bank, per Ah')}
        {money('bankPerAh.gel', 'Gel bank, per Ah')}
        {money('bankInstall', 'Bank installation', 'Labour, lugs and the main fuse, once per bank swap.')}
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-lg font-extrabold">Solar</legend>
        {money('panelPerWatt', 'Panels, per rated watt')}
        {money('arrayInstall.flat', 'Added array, flat on the roof', 'Mounting, MPPT controller and wiring.')}
        {money('arrayInstall.tilted', 'Added array, tilted')}
        {money('arrayInstall.portable', 'Added array, portable')}
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-lg font-extrabold">Charging</legend>
        {money('dcdcPerAmp', 'DC-DC charger, per amp')}
        {money('dcdcInstall', 'DC-DC charger installation')}
        {money('generator', 'Generator with converter/charger', 'Only when the rig has none.')}
        {money('generatorPerHour', 'Generator running, per hour', 'Fuel and wear; priced from the forecast’s generator hours.')}
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-lg font-extrabold">Wiring from the cable check</legend>
        {money('wiring.cablePerMm2M', 'Cable, per metre and per mm²', 'A 25 mm² cable costs 25 × this per metre; each run is priced out and back.')}
        {money('wiring.fuse', 'Fuse or breaker with holder, each')}
        {money('wiring.busBars', 'Bus bars, a positive and negative pair')}
      </fieldset>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn btn-primary" disabled={save.isPending || (dto.saved && !isDirty)}>
          {save.isPending ? 'Saving…' : dto.saved ? 'Save price list' : 'Save my price list'}
        </button>
        <p role="status" aria-live="polite" className="font-semibold text-moss-deep">{status && !isDirty ? status : ''}</p>
      </div>
    </form>
  );
}
