import { useEffect, useMemo, useRef, useState } from 'react';
import { useFieldArray, useForm, useWatch, type Control, type FieldErrors, type UseFormRegister, type UseFormSetValue } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { SKY_CHOICES, type TripDto } from '../../domain/trips/trips.schema';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import { Field, describedBy } from '../../components/ui/Field';
import { NumberField } from '../../components/ui/NumberField';
import { TemperatureInput } from '../../components/ui/TemperatureInput';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { useVersionedEditor } from '../../components/ui/useVersionedEditor';
import { asNumber, asNumberOrNull, errorAt, fieldId } from '../../components/ui/form';
import { formatDate, formatHour, formatNumber, rigSummary } from '../../lib/format';
import { formatTemp, type Units } from '../../lib/units';
import { rigsQuery } from '../rigs/rigs.queries';
import { PlaceSearch } from './PlaceSearch';
import { createTrip, deleteTrip, updateTrip } from './trips.api';
import { timeZoneQuery, tripKeys } from './trips.queries';
import { describeSpan, emptyTrip, newDrive, newStop, stopDays, tripFormSchema, tripSpan, tripToForm, type TripFormOutput, type TripFormValues } from '../../domain/trips/trip-form';
import { DeleteRow, FormProblemBox } from '../../components/ui/SaveProblems';
import { Confirmation } from '../../components/ui/AskFirst';
import { DeletionQuestion } from '../deleted/DeletionQuestion';

type Ctx = {
  register: UseFormRegister<TripFormValues>;
  control: Control<TripFormValues>;
  errors: FieldErrors<TripFormValues>;
  setValue: UseFormSetValue<TripFormValues>;
  units: Units;
};

const num = { setValueAs: asNumber };
const HOURS = Array.from({ length: 24 }, (_, h) => h);
const TIME_ZONES: string[] = (() => {
  try {
    return (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf('timeZone');
  } catch {
    return [];
  }
})();

/**
 * The browser's own list of zone names as suggestions for the zone field. Filled in after the page
 * is up: hundreds of options, and the server's list may differ from the phone's.
 */
function TimeZoneList() {
  const [zones, setZones] = useState<string[]>([]);
  useEffect(() => setZones(TIME_ZONES), []);
  return <datalist id="time-zones">{zones.map((z) => <option key={z} value={z} />)}</datalist>;
}

/** The trip planner: rig, stops in order (place, dates, shade, hookup, weather per day), drive days, reserve. */
export function TripEditor({ trip, units, initialRigId, initialRigs, onClose }: { trip?: TripDto; units: Units; initialRigId?: string; initialRigs?: RigDto[]; onClose?: () => void }) {
  const qc = useQueryClient();
  const rigs = useQuery({ ...rigsQuery(), initialData: initialRigs });
  const readOnly = trip?.canEdit === false;

  const form = useForm<TripFormValues, unknown, TripFormOutput>({
    resolver: zodResolver(tripFormSchema),
    defaultValues: trip ? tripToForm(trip) : emptyTrip(initialRigId ?? ''),
    mode: 'onTouched',
  });
  const { register, control, handleSubmit, setValue, reset, setError, formState } = form;
  const { errors, isSubmitting, isDirty } = formState;
  const ctx: Ctx = { register, control, errors, setValue, units };
  const stops = useFieldArray({ control, name: 'stops' });
  const drives = useFieldArray({ control, name: 'drives' });
  const stopValues = useWatch({ control, name: 'stops' }) ?? [];
  const rigId = useWatch({ control, name: 'rigId' });
  const name = useWatch({ control, name: 'name' });
  const rig = rigs.data?.find((r) => r.id === rigId);
  const hasGenerator = Boolean(rig?.chargers.some((c) => c.kind === 'generator'));

  // A new trip with one rig in the crew picks that rig.
  useEffect(() => {
    const onlyRig = rigs.data?.length === 1 ? rigs.data[0] : undefined;
    if (!trip && !rigId && onlyRig) setValue('rigId', onlyRig.id);
  }, [rigs.data, rigId, trip, setValue]);

  const { formError, savedAt, conflict, keepMine, takeTheirs, save, remove, onSubmit } = useVersionedEditor<TripDto, TripFormValues, TripFormOutput>({
    what: 'trip',
    row: trip,
    create: createTrip,
    update: (id, values, version) => updateTrip(id, { ...values, version }),
    remove: deleteTrip,
    onSaved: (next) => {
      qc.setQueryData(tripKeys.detail(next.id), next);
      void qc.invalidateQueries({ queryKey: tripKeys.all, exact: false, predicate: (q) => q.queryKey[1] === 'list' });
      reset(tripToForm(next));
    },
    onCreated: (next) => window.location.assign(`/trips/${encodeURIComponent(next.id)}?created=1`),
    onDeleted: () => {
      void qc.invalidateQueries({ queryKey: tripKeys.all });
      window.location.assign('/trips');
    },
    handleSubmit,
    setError,
  });

  const span = tripSpan(stopValues);
  const busy = isSubmitting || save.isPending;

  // Opened from the itinerary: focus moves to the form that replaced the Edit button.
  const formRef = useRef<HTMLFormElement | null>(null);
  const openedFromItinerary = useRef(onClose !== undefined);
  useEffect(() => {
    if (openedFromItinerary.current) formRef.current?.focus({ preventScroll: true });
  }, []);
  // Closing with unsaved changes asks in place first (the app's one confirmation pattern).
  const [askClose, setAskClose] = useState(false);
  const close = () => {
    if (isDirty) return setAskClose(true);
    onClose?.();
  };

  return (
    <form ref={formRef} tabIndex={-1} onSubmit={onSubmit} noValidate aria-label={trip ? `Trip ${trip.name}` : 'New trip'} className="space-y-5 focus:outline-none">
      <div>
        <p className="text-sm font-bold"><a href="/trips" className="text-slate-text underline-offset-2 hover:underline">← Trips</a></p>
        <h1 className="text-2xl sm:text-3xl">{trip ? name || trip.name : 'New trip'}</h1>
        <p className="mt-1 min-h-[1.6em] font-semibold text-slate-text">{span ? describeSpan(stopValues as { arrive: string; nights: number }[]) : 'Add the stops in the order you travel.'}</p>
      </div>

      {readOnly ? <p className="caution">You can view this trip. A crew owner or editor can change it.</p> : null}
      <FormProblemBox problem={formError} />
      {conflict ? (
        <ConflictNotice
          what="trip"
          theirs={conflict.current}
          busy={save.isPending}
          onKeepMine={keepMine}
          onTakeTheirs={takeTheirs}
        >
          <dl className="mt-2 grid grid-cols-[5rem_1fr] gap-x-3 text-sm">
            <dt className="font-bold">Theirs</dt>
            <dd>{conflict.current.name}: {conflict.current.stops.map((s) => s.name).join(' → ')} · {describeSpan(conflict.current.stops)}</dd>
            <dt className="font-bold">Yours</dt>
            <dd>{conflict.mine.name}: {conflict.mine.stops.map((s) => s.name).join(' → ')} · {describeSpan(conflict.mine.stops)}</dd>
          </dl>
        </ConflictNotice>
      ) : null}

      <fieldset disabled={readOnly} className="space-y-5">
        <section className="card grid gap-4 p-4 sm:grid-cols-2 sm:p-6" aria-labelledby="trip-basics">
          <h2 id="trip-basics" className="text-xl sm:col-span-2">Trip</h2>
          <Field id="name" label="Trip name" error={errors.name?.message} hint="e.g. “High desert, late October”.">
            <input id="name" className="field-input" autoComplete="off" {...describedBy('name', errors.name?.message, true)} {...register('name')} />
          </Field>
          <Field id="rigId" label="Rig" error={errors.rigId?.message} hint={rig ? rigSummary(rig) : rigs.isPending ? 'Loading your rigs…' : undefined}>
            {rigs.data ? (
              <select id="rigId" className="field-input" {...describedBy('rigId', errors.rigId?.message, Boolean(rig))} {...register('rigId')}>
                <option value="">Choose a rig</option>
                {rigs.data.map((r: RigDto) => <option key={r.id} value={r.id}>{r.name}</option>)}
              </select>
            ) : (
              // The options arrive with the rigs; the real select mounts then, so it shows the saved rig.
              <select id="rigId" className="field-input" disabled><option>{rigs.isError ? 'Could not load rigs' : 'Loading rigs…'}</option></select>
            )}
          </Field>
          {rigs.data && rigs.data.length === 0 ? (
            <p className="caution sm:col-span-2">A trip runs on a rig. <a className="font-bold underline" href="/rigs/new">Describe your rig first</a>, then come back.</p>
          ) : null}
          {rigs.isError ? <p role="alert" className="caution sm:col-span-2">Could not load your rigs: {rigs.error.message}</p> : null}
          <NumberField id="reserveSocPct" label="Reserve to keep" errorName="Reserve" unit="%" registration={register('reserveSocPct', { setValueAs: asNumberOrNull })} error={errors.reserveSocPct?.message}
            hint="The forecast flags hours below this state of charge. Leave empty to use the rig’s usable floor." />
        </section>

        <section aria-labelledby="stops-heading" className="space-y-4">
          <h2 id="stops-heading" className="text-xl">Stops</h2>
          {errorAt(errors, 'stops') ? <p className="field-error" role="alert">Stops: {errorAt(errors, 'stops')}</p> : null}
          {stops.fields.map((f, i) => (
            <StopCard key={f.id} index={i} count={stops.fields.length} ctx={ctx} hasGenerator={hasGenerator}
              onRemove={() => stops.remove(i)} onMoveUp={i > 0 ? () => stops.swap(i, i - 1) : undefined} />
          ))}
          <button type="button" className="btn btn-quiet" onClick={() => stops.append(newStop(stopValues[stopValues.length - 1]))}>+ Add the next stop</button>
        </section>

        <section aria-labelledby="drives-heading" className="card space-y-3 p-4 sm:p-6">
          <h2 id="drives-heading" className="text-xl">Drive days</h2>
          <p className="text-slate-text">While you drive, the alternator charges the bank through a DC-DC charger{rig && !rig.chargers.some((c) => c.kind === 'alternator') ? ' (this rig has none yet: add one under Power system)' : ''}, and loads set to “drive days” run.</p>
          {drives.fields.map((f, k) => (
            <DriveRow key={f.id} index={k} ctx={ctx} onRemove={() => drives.remove(k)} />
          ))}
          <button type="button" className="btn btn-quiet" onClick={() => drives.append(newDrive(stopValues, Math.max(0, Math.min(drives.fields.length, stopValues.length - 2))))}>+ Add a drive day</button>
        </section>
      </fieldset>

      {!readOnly ? (
        <div className="sticky bottom-0 z-10 -mx-4 flex flex-wrap items-center gap-3 border-t border-sand-dark bg-sand/95 px-4 py-3 backdrop-blur sm:static sm:mx-0 sm:border-0 sm:bg-transparent sm:px-0">
          <button type="submit" className="btn btn-primary" disabled={busy}>{busy ? 'Saving…' : trip ? 'Save trip' : 'Create trip'}</button>
          {savedAt && !isDirty ? <span role="status" className="font-semibold text-moss-deep">Saved.</span> : null}
          {trip && isDirty && !busy ? <span className="text-sm text-slate-text">Unsaved changes</span> : null}
          {onClose && askClose ? (
            <Confirmation className="ml-auto" question="Close the editor and drop the unsaved changes?" confirmLabel="Drop changes" keepLabel="Keep editing" onConfirm={() => { setAskClose(false); onClose(); }} onKeep={() => setAskClose(false)} />
          ) : onClose ? (
            <button type="button" className="btn btn-quiet ml-auto" onClick={close} disabled={busy}>Close the editor</button>
          ) : null}
        </div>
      ) : null}
      {trip && !readOnly ? (
        trip.canDelete === true ? (
          <DeleteRow label="Delete trip…" question={<DeletionQuestion kind="trip" id={trip.id} name={trip.name} />} onDelete={() => remove.mutate()} busy={remove.isPending} />
        ) : (
          <p className="border-t border-sand-dark pt-4 text-right text-sm text-slate-text">Only the crew’s owners can delete this trip: it takes its saved forecasts and check-ins with it.</p>
        )
      ) : null}
    </form>
  );
}

function StopCard({ index: i, count, ctx, hasGenerator, onRemove, onMoveUp }: { index: number; count: number; ctx: Ctx; hasGenerator: boolean; onRemove: () => void; onMoveUp?: () => void }) {
  const { register, control, errors } = ctx;
  const p = (k: string) => `stops.${i}.${k}`;
  const id = (k: string) => fieldId(p(k));
  const err = (k: string) => errorAt(errors, p(k));
  const stopName = useWatch({ control, name: `stops.${i}.name` });
  const arrive = useWatch({ control, name: `stops.${i}.arrive` });
  const nights = useWatch({ control, name: `stops.${i}.nights` });
  const leave = stopDays(arrive, nights).at(-1);

  return (
    <fieldset className="card space-y-4 p-4 sm:p-6" aria-label={`Stop ${i + 1}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-lg font-extrabold">
          <span className="mr-2 inline-flex h-7 w-7 items-center justify-center rounded-full bg-dusk text-sm text-white">{i + 1}</span>
          {(stopName as string) || `Stop ${i + 1}`}
        </h3>
        <span className="flex gap-2">
          {onMoveUp ? <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onMoveUp} aria-label={`Move stop ${i + 1} earlier`}>↑ Earlier</button> : null}
          {count > 1 ? <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onRemove} aria-label={`Remove stop ${i + 1}`}>Remove</button> : null}
        </span>
      </div>

      <StopLocation index={i} ctx={ctx} />

      <div className="grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Field id={id('arrive')} label="Arrive on" errorName="Arrival date" error={err('arrive')} className="col-span-2 sm:col-span-1">
          <input id={id('arrive')} type="date" className="field-input" {...describedBy(id('arrive'), err('arrive'))} {...register(`stops.${i}.arrive`)} />
        </Field>
        <Field id={id('arriveHour')} label="Arrive at" errorName="Arrival hour" error={err('arriveHour')}>
          <select id={id('arriveHour')} className="field-input" {...describedBy(id('arriveHour'), err('arriveHour'))} {...register(`stops.${i}.arriveHour`, { setValueAs: (v) => Number(v) })}>
            {HOURS.map((h) => <option key={h} value={h}>{formatHour(h)}</option>)}
          </select>
        </Field>
        <NumberField id={id('nights')} label="Nights" registration={register(`stops.${i}.nights`, num)} error={err('nights')} hint={leave ? `Leave ${formatDate(leave, false)}` : undefined} />
        <NumberField id={id('shadePct')} label="Shade at the site" errorName="Shade" unit="%" registration={register(`stops.${i}.shadePct`, num)} error={err('shadePct')} hint="Trees or walls over the panels." className="col-span-2 sm:col-span-1" />
      </div>

      <div className="grid gap-4 sm:grid-cols-2">
        <fieldset>
          <legend className="field-label">Hookup</legend>
          <div className="flex flex-wrap gap-2">
            {([['none', 'None (dry camping)'], ['shore', 'Shore power']] as const).map(([v, label]) => (
              <label key={v} className="flex min-h-[44px] flex-1 cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 font-bold has-[:checked]:border-ember">
                <input type="radio" value={v} className="accent-ember" {...register(`stops.${i}.hookup`)} /> {label}
              </label>
            ))}
          </div>
        </fieldset>
        {hasGenerator ? (
          <fieldset id={id('generatorHours')}>
            <legend className="field-label">Generator allowed</legend>
            <div className="flex items-center gap-2">
              <label className="sr-only" htmlFor={id('generatorHours.0')}>Generator allowed from</label>
              <select id={id('generatorHours.0')} className="field-input" {...register(`stops.${i}.generatorHours.0`, { setValueAs: (v) => Number(v) })}>
                {HOURS.map((h) => <option key={h} value={h}>{formatHour(h)}</option>)}
              </select>
              <span aria-hidden="true">to</span>
              <label className="sr-only" htmlFor={id('generatorHours.1')}>Generator allowed until</label>
              <select id={id('generatorHours.1')} className="field-input" {...register(`stops.${i}.generatorHours.1`, { setValueAs: (v) => Number(v) })}>
                {HOURS.map((h) => h + 1).map((h) => <option key={h} value={h}>{formatHour(h)}</option>)}
              </select>
            </div>
            {err('generatorHours') ? <p className="field-error" role="alert">{err('generatorHours')}</p> : <p className="field-hint mt-1">Campground quiet hours are often 22:00–06:00.</p>}
          </fieldset>
        ) : null}
      </div>

      <StopWeather index={i} ctx={ctx} />
    </fieldset>
  );
}

/** Coordinates by place search or typed, and the time zone found from them (editable). */
function StopLocation({ index: i, ctx }: { index: number; ctx: Ctx }) {
  const { register, control, errors, setValue } = ctx;
  const qc = useQueryClient();
  const p = (k: string) => `stops.${i}.${k}`;
  const id = (k: string) => fieldId(p(k));
  const err = (k: string) => errorAt(errors, p(k));
  const lat = useWatch({ control, name: `stops.${i}.lat` });
  const lon = useWatch({ control, name: `stops.${i}.lon` });
  const tz = useWatch({ control, name: `stops.${i}.timeZone` });
  // The coordinates the time zone was last set for: a loaded stop keeps its saved zone.
  const tzFor = useRef<string>(typeof lat === 'number' && typeof lon === 'number' ? `${lat},${lon}` : '');
  const [tzNote, setTzNote] = useState<string | null>(null);

  useEffect(() => {
    if (typeof lat !== 'number' || typeof lon !== 'number' || !Number.isFinite(lat) || !Number.isFinite(lon)) return;
    if (lat < -90 || lat > 90 || lon < -180 || lon > 180) return;
    const key = `${lat},${lon}`;
    if (key === tzFor.current) return;
    const t = setTimeout(async () => {
      try {
        const r = await qc.fetchQuery(timeZoneQuery(lat, lon));
        tzFor.current = key;
        setValue(`stops.${i}.timeZone`, r.timeZone, { shouldDirty: true, shouldValidate: true });
        setTzNote(`Found from the coordinates: ${r.timeZone}. Change it if it is wrong.`);
      } catch {
        setTzNote('Could not look up the time zone; type it, e.g. America/Denver.');
      }
    }, 400);
    return () => clearTimeout(t);
  }, [lat, lon, i, qc, setValue]);

  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <PlaceSearch
        id={id('place')}
        label="Find the place"
        onPick={(place) => {
          tzFor.current = `${place.lat},${place.lon}`;
          const opts = { shouldDirty: true, shouldValidate: true } as const;
          setValue(`stops.${i}.lat`, place.lat, opts);
          setValue(`stops.${i}.lon`, place.lon, opts);
          setValue(`stops.${i}.timeZone`, place.timeZone, opts);
          const current = (document.getElementById(id('name')) as HTMLInputElement | null)?.value ?? '';
          if (!current.trim()) setValue(`stops.${i}.name`, `Near ${place.name}`, opts);
          setTzNote(`Time zone of ${place.name}: ${place.timeZone}.`);
        }}
      />
      <Field id={id('name')} label="Camp name" errorName="Camp name" error={err('name')} hint="What you call this stop, e.g. “Mesa camp”.">
        <input id={id('name')} className="field-input" autoComplete="off" {...describedBy(id('name'), err('name'), true)} {...register(`stops.${i}.name`)} />
      </Field>
      <div className="grid grid-cols-2 gap-4 sm:col-span-2 lg:grid-cols-3">
        <NumberField id={id('lat')} label="Latitude" unit="°" signed registration={register(`stops.${i}.lat`, num)} error={err('lat')} hint="North is +, e.g. 38.57" />
        <NumberField id={id('lon')} label="Longitude" unit="°" signed registration={register(`stops.${i}.lon`, num)} error={err('lon')} hint="West is −, e.g. −109.55" />
        <Field id={id('timeZone')} label="Time zone" error={err('timeZone')} hint={tzNote ?? (tz ? undefined : 'Filled from the coordinates.')} className="col-span-2 lg:col-span-1">
          <input id={id('timeZone')} className="field-input" autoComplete="off" list="time-zones" {...describedBy(id('timeZone'), err('timeZone'), Boolean(tzNote || !tz))} {...register(`stops.${i}.timeZone`)} />
        </Field>
      </div>
      {i === 0 ? <TimeZoneList /> : null}
    </div>
  );
}

/** The expected weather for each day at a stop: a sky choice with the day's high and low. */
function StopWeather({ index: i, ctx }: { index: number; ctx: Ctx }) {
  const { control, errors, units } = ctx;
  const weather = useFieldArray({ control, name: `stops.${i}.weather` });
  const arrive = useWatch({ control, name: `stops.${i}.arrive` });
  const nights = useWatch({ control, name: `stops.${i}.nights` });
  const values = useWatch({ control, name: `stops.${i}.weather` }) ?? [];
  const days = stopDays(arrive, nights);
  const allDates = useMemo(() => [...new Set([...days, ...values.map((w) => w?.date).filter(Boolean)])].sort(), [days.join(), values.map((w) => w?.date).join()]);

  if (!days.length && !values.length) {
    return <p className="text-slate-text">Give the arrival date and nights to set each day’s weather.</p>;
  }

  const nearest = (date: string) => {
    let best: (typeof values)[number] | undefined;
    let dist = Infinity;
    for (const w of values) {
      if (!w || typeof w.highC !== 'number' || typeof w.lowC !== 'number') continue;
      const d = Math.abs(Date.parse(w.date) - Date.parse(date));
      if (d < dist) {
        dist = d;
        best = w;
      }
    }
    return best;
  };

  return (
    <div>
      <h4 className="font-extrabold">Weather you expect</h4>
      <p className="field-hint">
        Choose the sky for each day with its high and low. A day left on “—” takes the nearest day you set at this stop
        {values.length === 0 ? `; with none set, the forecast assumes partly cloudy, ${formatTemp(20, units)} by day and ${formatTemp(10, units)} at night` : ''}.
      </p>
      {errorAt(errors, `stops.${i}.weather`) ? <p className="field-error" role="alert">Weather: {errorAt(errors, `stops.${i}.weather`)}</p> : null}
      <ul className="mt-2 divide-y divide-sand-dark">
        {allDates.map((date) => {
          const j = values.findIndex((w) => w?.date === date);
          const outside = !days.includes(date);
          const w = j >= 0 ? values[j] : undefined;
          const skyId = fieldId(`stops.${i}.weather.${j >= 0 ? j : `new-${date}`}.cloudOktas`);
          const skyKnown = w && SKY_CHOICES.some((s) => s.oktas === w.cloudOktas);
          return (
            <li key={date} className="grid grid-cols-2 items-start gap-x-3 gap-y-2 py-2 sm:grid-cols-[9rem_1fr_8rem_8rem]">
              <div className="col-span-2 pt-2 font-bold sm:col-span-1">
                {formatDate(date, false)}
                {outside ? <span className="block text-xs font-semibold text-alert">outside this stop’s days</span> : null}
              </div>
              <div className="col-span-2 sm:col-span-1">
                <label htmlFor={skyId} className="sr-only">Sky on {formatDate(date)}</label>
                <select
                  id={skyId}
                  className="field-input"
                  value={w ? String(w.cloudOktas) : ''}
                  onChange={(e) => {
                    const v = e.target.value;
                    if (v === '') {
                      if (j >= 0) weather.remove(j);
                      return;
                    }
                    const oktas = Number(v);
                    if (j >= 0) {
                      ctx.setValue(`stops.${i}.weather.${j}.cloudOktas`, oktas, { shouldDirty: true });
                    } else {
                      const near = nearest(date);
                      weather.append({ date, cloudOktas: oktas, highC: near?.highC as number, lowC: near?.lowC as number });
                    }
                  }}
                >
                  <option value="">— (nearest day)</option>
                  {w && !skyKnown ? <option value={String(w.cloudOktas)}>{[...SKY_CHOICES].sort((a, b) => Math.abs(a.oktas - (w.cloudOktas as number)) - Math.abs(b.oktas - (w.cloudOktas as number)))[0]?.label ?? 'Cloud'} ({formatNumber(w.cloudOktas as number, 1)} oktas)</option> : null}
                  {SKY_CHOICES.map((s) => <option key={s.oktas} value={String(s.oktas)}>{s.label}</option>)}
                </select>
              </div>
              {j >= 0 ? (
                <>
                  <TemperatureInput control={control} name={`stops.${i}.weather.${j}.highC`} id={fieldId(`stops.${i}.weather.${j}.highC`)} label="High" units={units} minC={-60} maxC={60} />
                  <TemperatureInput control={control} name={`stops.${i}.weather.${j}.lowC`} id={fieldId(`stops.${i}.weather.${j}.lowC`)} label="Low" units={units} minC={-60} maxC={60} />
                </>
              ) : (
                <p className="col-span-2 pt-2 text-sm text-slate-text">{values.length ? 'Uses the nearest day you set.' : 'Not set yet.'}</p>
              )}
            </li>
          );
        })}
      </ul>
    </div>
  );
}

function DriveRow({ index: k, ctx, onRemove }: { index: number; ctx: Ctx; onRemove: () => void }) {
  const { register, errors } = ctx;
  const p = (f: string) => `drives.${k}.${f}`;
  const id = (f: string) => fieldId(p(f));
  const err = (f: string) => errorAt(errors, p(f));
  return (
    <fieldset className="grid grid-cols-2 items-start gap-3 rounded-xl border-2 border-sand-dark p-3 sm:grid-cols-[1fr_1fr_1fr_auto]" aria-label={`Drive ${k + 1}`}>
      <Field id={id('date')} label="Drive on" errorName="Drive date" error={err('date')} className="col-span-2 sm:col-span-1">
        <input id={id('date')} type="date" className="field-input" {...describedBy(id('date'), err('date'))} {...register(`drives.${k}.date`)} />
      </Field>
      <Field id={id('startHour')} label="Leave at" errorName="Start hour" error={err('startHour')}>
        <select id={id('startHour')} className="field-input" {...describedBy(id('startHour'), err('startHour'))} {...register(`drives.${k}.startHour`, { setValueAs: (v) => Number(v) })}>
          {HOURS.map((h) => <option key={h} value={h}>{formatHour(h)}</option>)}
        </select>
      </Field>
      <NumberField id={id('hours')} label="Hours driving" errorName="Hours driving" unit="h" registration={register(`drives.${k}.hours`, num)} error={err('hours')} />
      <button type="button" className="btn btn-quiet col-span-2 sm:col-span-1 sm:mt-7" onClick={onRemove} aria-label={`Remove drive ${k + 1}`}>Remove</button>
    </fieldset>
  );
}
