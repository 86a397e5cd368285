import { useMemo, useState, type ReactNode } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { LoadDto } from '../../domain/loads/loads.schema';
import { Field, describedBy } from '../../components/ui/Field';
import { NumberField } from '../../components/ui/NumberField';
import { TemperatureInput } from '../../components/ui/TemperatureInput';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { applyServerIssues, asNumber, asNumberOrNull, errorAt } from '../../components/ui/form';
import { ApiError, isConflict, isNotFound } from '../../lib/query-client';
import { formatAh, formatNumber, formatWh } from '../../lib/format';
import { formatTemp, formatTempDelta, type Units } from '../../lib/units';
import { loadWhPerDay, whToAh, type EnergyRig } from '../../domain/loads/energy';
import { LOAD_FIELDS, LOAD_LOCATION_LABELS, loadFormSchemaFor, loadToForm, type LoadFormOutput, type LoadFormValues } from '../../domain/loads/load-form';
import { AC_VOLTS, ampsToWatts, bankAmpsOfAc, drawVolts, roundWatts, wattsToAmps, type AcVolts } from '../../domain/loads/draw';
import { DEFAULT_INVERTER_EFFICIENCY_PCT } from '../../domain/loads/energy';
import { describeWindows, parseWindows } from '../../domain/loads/windows';

interface LoadEditorProps {
  /** Unique per editor on the page; prefixes the field ids. */
  idPrefix: string;
  initial: LoadFormValues;
  units: Units;
  rig: EnergyRig;
  title: string;
  intro?: ReactNode;
  submitLabel: string;
  /** Saves; `version` is given when the user keeps their edit over a newer version. */
  save: (values: LoadFormOutput, version?: number) => Promise<void>;
  onCancel: () => void;
  /** The other version won: show it and close. */
  onTakeTheirs?: (current: LoadDto) => void;
  /** Someone deleted the load meanwhile: add the camper's edit again as a new load. */
  addAsNew?: (values: LoadFormOutput) => Promise<void>;
}

const num = { setValueAs: asNumber };
const numOrNull = { setValueAs: asNumberOrNull };
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

function show(key: string, v: unknown, units: Units): string {
  if (v === undefined || v === null || v === '') return '—';
  if (key === 'windows' && Array.isArray(v)) return describeWindows(v as [number, number][]);
  if (key === 'setpointC' && typeof v === 'number') return formatTemp(v, units);
  if (key === 'standby') return v ? 'yes' : 'no';
  if (key === 'supply') return String(v).toUpperCase();
  if (key === 'location') return LOAD_LOCATION_LABELS[v as keyof typeof LOAD_LOCATION_LABELS] ?? String(v);
  return String(v);
}

/** One load's fields, in place in the table: used to add, edit, and confirm a catalogue item. */
export function LoadEditor({ idPrefix, initial, units, rig, title, intro, submitLabel, save, onCancel, onTakeTheirs, addAsNew }: LoadEditorProps) {
  const [formError, setFormError] = useState<string | null>(null);
  // The camper's edit of a load someone deleted meanwhile, kept for "Add it again as a new load".
  const [gone, setGone] = useState<LoadFormOutput | null>(null);
  const [conflict, setConflict] = useState<{ current: LoadDto; mine: LoadFormOutput } | null>(null);
  const schema = useMemo(() => loadFormSchemaFor(rig.nominalVolts), [rig.nominalVolts]);
  const form = useForm<LoadFormValues, unknown, LoadFormOutput>({ resolver: zodResolver(schema), defaultValues: initial, mode: 'onTouched' });
  const { register, control, handleSubmit, setError, setValue, getValues, formState: { errors, isSubmitting } } = form;
  const id = (k: string) => `${idPrefix}-${k}`;
  const err = (k: string) => errorAt(errors, k);

  const values = useWatch({ control });
  const standby = values.standby === true;
  const response = values.response;
  const parsed = parseWindows(typeof values.windows === 'string' ? values.windows : '');
  const byAmps = values.drawUnit === 'A';
  const acVolts: AcVolts = values.acVolts === 230 ? 230 : 120;
  const volts = drawVolts(values.supply, rig.nominalVolts, acVolts);
  // The draw in watts, whichever way it was typed: what will be saved.
  const drawW = byAmps ? (isNum(values.amps) ? roundWatts(ampsToWatts(values.amps, values.supply, rig.nominalVolts, acVolts)) : null) : isNum(values.watts) ? values.watts : null;
  const inverterPct = rig.inverter?.efficiencyPct ?? DEFAULT_INVERTER_EFFICIENCY_PCT;
  /** Switches how the draw is typed, carrying the number across so nothing is lost. */
  const switchUnit = (next: 'W' | 'A') => {
    const v = getValues();
    const av: AcVolts = v.acVolts === 230 ? 230 : 120;
    if (next === 'A' && isNum(v.watts)) setValue('amps', Math.round(wattsToAmps(v.watts, v.supply, rig.nominalVolts, av) * 100) / 100, { shouldDirty: true });
    if (next === 'W' && isNum(v.amps)) setValue('watts', roundWatts(ampsToWatts(v.amps, v.supply, rig.nominalVolts, av)), { shouldDirty: true });
  };
  const estimate =
    drawW !== null && parsed.ok
      ? loadWhPerDay(
          {
            watts: drawW,
            quantity: typeof values.quantity === 'number' && Number.isFinite(values.quantity) ? values.quantity : 1,
            supply: values.supply,
            windows: standby ? [[0, 24]] : parsed.windows,
            dutyPct: standby ? 100 : typeof values.dutyPct === 'number' && Number.isFinite(values.dutyPct) ? values.dutyPct : 100,
          },
          rig,
        )
      : null;

  const run = async (out: LoadFormOutput, version?: number) => {
    setFormError(null);
    setGone(null);
    try {
      await save(out, version);
    } catch (e) {
      if (isConflict(e)) {
        const current = e.current<LoadDto>();
        if (current) return setConflict({ current, mine: out });
      }
      if (isNotFound(e)) return addAsNew ? setGone(out) : setFormError('Someone deleted this load while you were editing it. Cancel to close the editor.');
      if (e instanceof ApiError) {
        const loose = applyServerIssues(e.issues, setError, `${idPrefix}-`);
        setFormError(loose.length ? `${e.message} ${loose.map((i) => `${i.path}: ${i.message}`).join('; ')}` : e.message);
      } else setFormError('Could not save the load. Try again.');
    }
  };

  const onSubmit = handleSubmit((out) => run(out), () => setFormError('Some fields need fixing: see the messages next to them.'));

  return (
    <form onSubmit={onSubmit} noValidate aria-label={title} className="rounded-xl border-2 border-ember/60 bg-white p-3 text-left sm:p-4">
      <h3 className="text-base font-extrabold">{title}</h3>
      {intro}
      {formError ? <p role="alert" className="caution mt-2 font-semibold text-alert">{formError}</p> : null}
      {gone && addAsNew ? (
        <div role="alert" className="caution mt-2" data-load-gone>
          <p className="font-bold">Someone deleted this load while you were editing it.</p>
          <p className="mt-1">Your changes are not saved. Add them again as a new load, or cancel to leave it deleted.</p>
          <div className="mt-3 flex flex-wrap gap-2">
            <button
              type="button"
              className="btn btn-primary"
              disabled={isSubmitting}
              onClick={() => {
                const mine = gone;
                void addAsNew(mine).then(
                  () => setGone(null),
                  (e: unknown) => setFormError(e instanceof Error ? e.message : 'Could not add the load. Try again.'),
                );
              }}
            >
              Add it again as a new load
            </button>
            <button type="button" className="btn btn-quiet" onClick={onCancel}>Cancel</button>
          </div>
        </div>
      ) : null}
      {conflict ? (
        <ConflictNotice
          what="load"
          theirs={conflict.current}
          busy={isSubmitting}
          onKeepMine={() => {
            const { mine, current } = conflict;
            setConflict(null);
            void run(mine, current.version);
          }}
          onTakeTheirs={() => {
            const current = conflict.current;
            setConflict(null);
            onTakeTheirs?.(current);
          }}
        >
          <table className="mt-2 w-full text-sm">
            <thead>
              <tr className="text-left"><th className="py-1 pr-2">Field</th><th className="py-1 pr-2">Theirs</th><th className="py-1">Yours</th></tr>
            </thead>
            <tbody>
              {LOAD_FIELDS.filter(({ key }) => JSON.stringify(conflict.current[key as keyof LoadDto]) !== JSON.stringify(conflict.mine[key as keyof LoadFormOutput])).map(({ key, label }) => (
                <tr key={key} className="border-t border-sand-dark">
                  <th scope="row" className="py-1 pr-2 text-left font-semibold">{label}</th>
                  <td className="py-1 pr-2">{show(key, conflict.current[key as keyof LoadDto], units)}</td>
                  <td className="py-1">{show(key, conflict.mine[key as keyof LoadFormOutput], units)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ConflictNotice>
      ) : null}

      <div className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Field id={id('name')} label="Name" error={err('name')} className="sm:col-span-2">
          <input id={id('name')} className="field-input" autoComplete="off" {...describedBy(id('name'), err('name'))} {...register('name')} />
        </Field>
        <NumberField id={id('quantity')} label="Quantity" registration={register('quantity', num)} error={err('quantity')} className="lg:col-span-2" />

        <fieldset className="sm:col-span-2">
          <legend className="field-label">Supply</legend>
          <div className="flex gap-2">
            {(['dc', 'ac'] as const).map((s) => (
              <label key={s} className="flex min-h-[44px] flex-1 cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 font-bold has-[:checked]:border-ember">
                <input type="radio" value={s} className="accent-ember" {...register('supply')} /> {s === 'dc' ? `${formatNumber(rig.nominalVolts, 1)} V DC` : 'AC (inverter)'}
              </label>
            ))}
          </div>
          {values.supply === 'ac' && !rig.inverter ? <p className="field-hint mt-1">This rig has no inverter yet; the estimate assumes one at 90 % efficiency.</p> : null}
        </fieldset>

        <fieldset className="sm:col-span-2">
          <legend className="field-label">Draw typed in</legend>
          <div className="flex gap-2">
            {(['W', 'A'] as const).map((u) => (
              <label key={u} className="flex min-h-[44px] flex-1 cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 font-bold has-[:checked]:border-ember">
                <input type="radio" value={u} className="accent-ember" {...register('drawUnit', { onChange: (e) => switchUnit(e.target.value as 'W' | 'A') })} /> {u === 'W' ? 'Watts' : 'Amps'}
              </label>
            ))}
          </div>
        </fieldset>
        {byAmps ? (
          <>
            <NumberField id={id('amps')} label="Amps (each)" errorName="Amps" unit="A" registration={register('amps', num)} error={err('amps')}
              hint={values.supply === 'ac' ? `Running current at the outlet, from the label, at ${acVolts} V.` : `Running current from the label, at the bank's ${formatNumber(rig.nominalVolts, 1)} V.`} />
            {values.supply === 'ac' ? (
              <Field id={id('acVolts')} label="Outlet voltage" hint="120 V in North America, 230 V in most other places.">
                <select id={id('acVolts')} className="field-input" aria-describedby={`${id('acVolts')}-hint`} {...register('acVolts', { setValueAs: (v) => Number(v) })}>
                  {AC_VOLTS.map((v) => <option key={v} value={v}>{v} V AC</option>)}
                </select>
              </Field>
            ) : null}
          </>
        ) : (
          <NumberField id={id('watts')} label="Watts (each)" errorName="Watts" unit="W" registration={register('watts', num)} error={err('watts')} hint="Running draw from the label; AC watts for AC loads." />
        )}
        <p className="self-end text-sm sm:col-span-2" data-testid="draw-both" aria-live="polite">
          {drawW !== null ? (
            <>
              <span className="font-bold tabular-nums">
                {byAmps ? `= ${formatNumber(drawW, 1)} W` : `= ${formatNumber(wattsToAmps(drawW, values.supply, rig.nominalVolts, acVolts), 2)} A at ${formatNumber(volts, 1)} V`}
              </span>
              {values.supply === 'ac' ? <span className="text-slate-text"> · about {formatNumber(bankAmpsOfAc(drawW, rig.nominalVolts, inverterPct), 1)} A from the bank through the inverter</span> : null}
              <span className="block text-slate-text">Saved as watts.</span>
            </>
          ) : null}
        </p>

        <fieldset className="sm:col-span-2">
          <legend className="field-label">Where it sits</legend>
          <div className="flex gap-2">
            {(['cabin', 'outside'] as const).map((loc) => (
              <label key={loc} className="flex min-h-[44px] flex-1 cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 font-bold has-[:checked]:border-ember">
                <input type="radio" value={loc} className="accent-ember" {...register('location')} /> {loc === 'cabin' ? 'In the cabin' : 'Outside'}
              </label>
            ))}
          </div>
          <p className="field-hint mt-1">A fridge in the cabin works against the cabin’s air (heated on cold nights); one in an outside bay against the outdoor air.</p>
        </fieldset>
        <NumberField id={id('surgeWatts')} label="Surge (each, optional)" errorName="Surge" unit="W" registration={register('surgeWatts', numOrNull)} error={err('surgeWatts')} className="sm:col-span-2"
          hint="Its draw while starting or running flat out — a microwave, a compressor, a pump. Empty: its running watts. Checked against the inverter and the low-voltage cutoff." />
        <label className="flex items-start gap-2 rounded-xl bg-sand/50 p-3 sm:col-span-2">
          <input type="checkbox" className="mt-1.5 h-4 w-4 accent-ember" {...register('standby')} />
          <span>
            <span className="font-bold">Standby / parasitic draw</span>
            <br />
            <span className="field-hint">Runs every hour of every day, even with everything “off” (detectors, radio memory, control panels).</span>
          </span>
        </label>

        <Field
          id={id('windows')}
          label="When it runs"
          errorName="Schedule"
          error={err('windows')}
          hint="Hours like 18-23; 6-8. 22-6 runs past midnight. “all day” for every hour, “none” for no window."
          className="sm:col-span-2"
        >
          <input id={id('windows')} className="field-input" autoComplete="off" disabled={standby} {...describedBy(id('windows'), err('windows'), true)} {...register('windows')} />
        </Field>
        <NumberField id={id('dutyPct')} label="Duty" unit="%" registration={register('dutyPct', num)} error={err('dutyPct')} disabled={standby}
          hint={response === 'cooling' ? `Share of the time it runs at ${formatTemp(20, units)}; more in heat.` : response === 'heating' ? `Share of the time it runs when it is ${formatTempDelta(25, units)} colder than the setpoint.` : 'Share of those hours it actually runs.'} />
        <Field id={id('days')} label="Runs on" error={err('days')}>
          <select id={id('days')} className="field-input" disabled={standby} {...describedBy(id('days'), err('days'))} {...register('days')}>
            <option value="all">Every day</option>
            <option value="camp">Camp days only</option>
            <option value="drive">Drive days only</option>
          </select>
        </Field>
        <Field id={id('response')} label="Temperature" error={err('response')} className="sm:col-span-2 lg:col-span-2">
          <select id={id('response')} className="field-input" {...describedBy(id('response'), err('response'))} {...register('response')}>
            <option value="none">Not affected</option>
            <option value="cooling">Cooling (fridge): more in heat</option>
            <option value="heating">Heating (furnace): below a setpoint</option>
          </select>
        </Field>
        {response === 'heating' ? (
          <TemperatureInput control={control} name="setpointC" id={id('setpointC')} label="Thermostat setpoint" errorName="Setpoint" units={units} minC={-30} maxC={40} />
        ) : null}
        <Field id={id('note')} label="Note" error={err('note')} className="sm:col-span-2 lg:col-span-4">
          <input id={id('note')} className="field-input" autoComplete="off" placeholder="Optional: model, where it is, who uses it" {...describedBy(id('note'), err('note'))} {...register('note')} />
        </Field>
      </div>

      <p className="mt-3 text-sm" aria-live="polite">
        {estimate !== null ? (
          <>
            <span className="font-bold">≈ {formatWh(estimate)} · {formatAh(whToAh(estimate, rig.nominalVolts))} a day</span>{' '}
            <span className="text-slate-text">at {formatNumber(rig.nominalVolts, 1)} V — an estimate before temperature response.</span>
          </>
        ) : (
          <span className="text-slate-text">Enter the {byAmps ? 'amps' : 'watts'} to see the daily estimate.</span>
        )}
      </p>
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="submit" className="btn btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Saving…' : submitLabel}</button>
        <button type="button" className="btn btn-quiet" onClick={onCancel}>Cancel</button>
      </div>
    </form>
  );
}

export { loadToForm };
