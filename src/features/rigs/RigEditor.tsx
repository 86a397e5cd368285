import { useRef, useState } from 'react';
import { useFieldArray, useForm, useWatch, type Control, type UseFormRegister, type UseFormSetValue } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { CHEMISTRIES, type Chemistry } from '../../engine/light';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import { Field, describedBy } from '../../components/ui/Field';
import { NumberField } from '../../components/ui/NumberField';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { useVersionedEditor } from '../../components/ui/useVersionedEditor';
import { asNumber, asNumberOrNull, errorAt, fieldId } from '../../components/ui/form';
import { CHEMISTRY_LABELS, formatNumber, plural, rigSummary } from '../../lib/format';
import { createRig, deleteRig, updateRig } from './rigs.api';
import { rigKeys } from './rigs.queries';
import { BANK_LOCATION_CHOICES, CHARGER_KINDS, bankToSave, emptyRig, newArray, newCharger, newInverter, rigFormSchema, rigToForm, type RigFormOutput, type RigFormValues } from '../../domain/rigs/rig-form';
import { COMPASS, CHEMISTRY_PRESETS, MOUNTINGS, applyMounting, maxChargeAmpsFor, mountingOf, nominalForChemistry, presetBank, seriesParallel, type Mounting } from '../../domain/rigs/presets';
import { DeleteRow, FormProblemBox } from '../../components/ui/SaveProblems';
import { formatTemp, type Units } from '../../lib/units';
import { DeletionQuestion } from '../deleted/DeletionQuestion';

interface RigEditorProps {
  rig?: RigDto;
  /** The reader's units: freezing and typical panel temperatures are stated in them. */
  units?: Units;
}

type Ctx = {
  register: UseFormRegister<RigFormValues>;
  control: Control<RigFormValues>;
  /** A field's message once the camper has left the field or tried to save; nothing before. */
  shown: (path: string) => string | undefined;
  setValue: UseFormSetValue<RigFormValues>;
  units: Units;
};

/** Whether the field at a dot path has been left (react-hook-form's touched tree). */
function touchedAt(touched: unknown, path: string): boolean {
  let node: unknown = touched;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return false;
    node = (node as Record<string, unknown>)[key];
  }
  return node === true;
}

const num = { setValueAs: asNumber };

/** The fields a rig is saved with (the form also carries the crew it goes to). */
const rigBody = (v: RigFormOutput) => ({ name: v.name, bank: bankToSave(v.bank), arrays: v.arrays, chargers: v.chargers, inverter: v.inverter, payloadKg: v.payloadKg, batterySpaceL: v.batterySpaceL });
const numOrNull = { setValueAs: asNumberOrNull };

/** The power-system form: bank (with chemistry presets and a series/parallel helper), solar arrays, chargers, inverter. */
export function RigEditor({ rig, units = 'metric' }: RigEditorProps) {
  const qc = useQueryClient();
  const [presetNote, setPresetNote] = useState<string | null>(null);
  const readOnly = rig?.canEdit === false;

  const form = useForm<RigFormValues, unknown, RigFormOutput>({
    resolver: zodResolver(rigFormSchema),
    defaultValues: rig ? rigToForm(rig) : emptyRig(),
    mode: 'onTouched',
  });
  const { register, control, handleSubmit, setValue, getValues, getFieldState, reset, setError, formState } = form;
  const { errors, isSubmitting, isDirty, isSubmitted, touchedFields } = formState;
  // Adding a panel or charger re-checks the whole list (react-hook-form's field-array rule): its empty
  // boxes would show red before a single key. A message waits until its field is left or the rig is saved.
  const shown = (path: string) => (isSubmitted || touchedAt(touchedFields, path) ? errorAt(errors, path) : undefined);
  const ctx: Ctx = { register, control, shown, setValue, units };

  const chemistry = useWatch({ control, name: 'bank.chemistry' }) as Chemistry;
  const bankLocation = useWatch({ control, name: 'bank.location' });
  const selfHeating = useWatch({ control, name: 'bank.selfHeating' });
  const arrays = useFieldArray({ control, name: 'arrays' });
  const chargers = useFieldArray({ control, name: 'chargers' });
  const inverter = useWatch({ control, name: 'inverter' });
  const chargerKinds = useWatch({ control, name: 'chargers' }) ?? [];
  const hasGenerator = chargerKinds.some((c) => c?.kind === 'generator');

  const { formError, savedAt, conflict, keepMine, takeTheirs, save, remove, onSubmit } = useVersionedEditor<RigDto, RigFormValues, RigFormOutput>({
    what: 'rig',
    row: rig,
    create: (values) => createRig(rigBody(values)),
    update: (id, values, version) => updateRig(id, { ...rigBody(values), version }),
    remove: deleteRig,
    onSaved: (next) => {
      qc.setQueryData(rigKeys.detail(next.id), next);
      void qc.invalidateQueries({ queryKey: rigKeys.list() });
      reset(rigToForm(next));
    },
    onCreated: (next) => {
      void qc.invalidateQueries({ queryKey: rigKeys.list() });
      window.location.assign(`/rigs/${encodeURIComponent(next.id)}?created=1#loads`);
    },
    onDeleted: () => {
      void qc.invalidateQueries({ queryKey: rigKeys.all });
      window.location.assign('/rigs');
    },
    handleSubmit,
    setError,
  });

  /** Fills the chemistry's typical values (keeping the bank's voltage class and capacity). */
  const applyPreset = (chem: Chemistry) => {
    const cap = getValues('bank.capacityAh');
    const volts = nominalForChemistry(chem, getValues('bank.nominalVolts'));
    const p = presetBank(chem, { capacityAh: typeof cap === 'number' ? cap : undefined, nominalVolts: volts });
    const opts = { shouldDirty: true, shouldValidate: false } as const;
    setValue('bank.nominalVolts', p.nominalVolts, opts);
    setValue('bank.floorSocPct', p.floorSocPct, opts);
    setValue('bank.cutoffVolts', p.cutoffVolts, opts);
    setValue('bank.peukertExponent', p.peukertExponent, opts);
    setValue('bank.chargeEfficiencyPct', p.chargeEfficiencyPct, opts);
    setValue('bank.internalResistanceMilliohm', p.internalResistanceMilliohm, opts);
    if (p.maxChargeAmps !== undefined) setValue('bank.maxChargeAmps', p.maxChargeAmps, opts);
    if (chem !== 'lifepo4') setValue('bank.selfHeating', false, opts);
    setPresetNote(`Filled typical ${CHEMISTRY_LABELS[chem]} values. They are common practice, not your battery's: check its label.`);
  };

  // Max charge current follows capacity until the user types their own.
  const lastAutoAmps = useRef<number | undefined>(undefined);
  const onCapacityChange = () => {
    const cap = getValues('bank.capacityAh');
    if (typeof cap !== 'number' || !Number.isFinite(cap) || cap <= 0) return;
    const current = getValues('bank.maxChargeAmps');
    const userTyped = getFieldState('bank.maxChargeAmps').isDirty && current !== lastAutoAmps.current;
    if (current === undefined || !userTyped) {
      const amps = maxChargeAmpsFor(getValues('bank.chemistry') as Chemistry, cap);
      lastAutoAmps.current = amps;
      setValue('bank.maxChargeAmps', amps, { shouldDirty: true });
    }
  };

  const busy = isSubmitting || save.isPending;
  const capacityReg = register('bank.capacityAh', { ...num, onChange: onCapacityChange });

  return (
    <form onSubmit={onSubmit} noValidate aria-label={rig ? `Power system of ${rig.name}` : 'New rig'} className="space-y-5">
      <FormProblemBox problem={formError} />

      {conflict ? (
        <ConflictNotice
          what="rig"
          theirs={conflict.current}
          busy={save.isPending}
          onKeepMine={keepMine}
          onTakeTheirs={takeTheirs}
        >
          <dl className="mt-2 grid grid-cols-[5rem_1fr] gap-x-3 text-sm">
            <dt className="font-bold">Theirs</dt>
            <dd>{conflict.current.name}: {rigSummary(conflict.current)}, {plural(conflict.current.chargers.length, "charger")}, {conflict.current.inverter ? 'inverter' : 'no inverter'}</dd>
            <dt className="font-bold">Yours</dt>
            <dd>{conflict.mine.name}: {rigSummary({ bank: conflict.mine.bank, arrays: conflict.mine.arrays })}, {plural(conflict.mine.chargers.length, "charger")}, {conflict.mine.inverter ? 'inverter' : 'no inverter'}</dd>
          </dl>
        </ConflictNotice>
      ) : null}

      {readOnly ? <p className="caution">You can view this rig. A crew owner or editor can change it.</p> : null}
      <fieldset disabled={readOnly} className="min-w-0 space-y-5">
      <section className="card p-4 sm:p-6" aria-labelledby="rig-name-heading">
        <h2 id="rig-name-heading" className="sr-only">Name</h2>
        <Field id="name" label="Rig name" error={shown('name')} hint="What your crew calls it, e.g. “Van” or “Trailer”.">
          <input id="name" className="field-input" autoComplete="off" {...describedBy('name', shown('name'), true)} {...register('name')} />
        </Field>
      </section>

      {/* ---------------- Battery bank ---------------- */}
      <section className="card space-y-4 p-4 sm:p-6" aria-labelledby="bank-heading">
        <h2 id="bank-heading" className="text-xl">Battery bank</h2>
        <fieldset>
          <legend className="field-label">Chemistry</legend>
          <div className="grid grid-cols-2 gap-2 sm:grid-cols-4">
            {CHEMISTRIES.map((c) => (
              <label key={c} className="flex cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 py-2.5 font-bold has-[:checked]:border-ember has-[:checked]:bg-[#fbf1e6] has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-ember">
                <input type="radio" value={c} className="accent-ember" {...register('bank.chemistry', { onChange: (e) => applyPreset(e.target.value as Chemistry) })} />
                {CHEMISTRY_LABELS[c]}
              </label>
            ))}
          </div>
          <p className="field-hint mt-1">{CHEMISTRY_PRESETS[chemistry]?.why}</p>
        </fieldset>

        <div className="grid gap-4 sm:grid-cols-2">
          <NumberField id="bank-capacityAh" label="Capacity" unit="Ah" registration={capacityReg} error={shown('bank.capacityAh')} hint="The whole bank's rated amp-hours at its nominal volts." />
          <NumberField id="bank-nominalVolts" label="Nominal voltage" unit="V" registration={register('bank.nominalVolts', num)} error={shown('bank.nominalVolts')} hint="12.8 V for a LiFePO4 “12 V” bank; 12 V for lead-acid." />
        </div>

        <fieldset>
          <legend className="field-label">Where the bank sits</legend>
          <div className="grid gap-2 sm:grid-cols-2">
            {BANK_LOCATION_CHOICES.map((c) => (
              <label key={c.value} className="flex cursor-pointer items-start gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 py-2.5 has-[:checked]:border-ember has-[:checked]:bg-[#fbf1e6] has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-ember">
                <input type="radio" value={c.value} className="mt-1.5 accent-ember" {...register('bank.location')} />
                <span><span className="font-bold">{c.label}</span><br /><span className="field-hint">{c.hint}</span></span>
              </label>
            ))}
          </div>
          <p className="field-hint mt-1">Cold shrinks what a battery can deliver and a cold LiFePO4 takes no charge; the forecast follows the battery’s own temperature.</p>
        </fieldset>
        {chemistry === 'lifepo4' ? (
          <label className="flex items-start gap-2">
            <input type="checkbox" className="mt-1.5 h-4 w-4 accent-ember" {...register('bank.selfHeating')} />
            <span><span className="font-bold">Self-heating LiFePO4</span><br /><span className="field-hint">It warms its cells before charging, so it takes charge below {formatTemp(0, units)}.</span></span>
          </label>
        ) : null}
        {chemistry === 'lifepo4' && bankLocation !== 'cabin' && !selfHeating ? (
          <p className="caution text-sm">LiFePO4 must not be charged below freezing: outside in the cold, this bank refuses charge until it warms above {formatTemp(0, units)}.</p>
        ) : null}

        <SeriesParallelHelper chemistry={chemistry} onUse={(v, ah) => {
          setValue('bank.nominalVolts', v, { shouldDirty: true, shouldValidate: true });
          setValue('bank.capacityAh', ah, { shouldDirty: true, shouldValidate: true });
          onCapacityChange();
        }} />

        <div className="rounded-xl border border-sand-dark bg-sand/40 p-3 sm:p-4">
          <div className="flex flex-wrap items-baseline justify-between gap-2">
            <h3 className="text-base font-extrabold">Typical for {CHEMISTRY_LABELS[chemistry]} — check your battery’s label</h3>
            <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => applyPreset(chemistry)}>Fill typical values again</button>
          </div>
          {presetNote ? <p className="field-hint mt-1" role="status">{presetNote}</p> : null}
          <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            <NumberField id="bank-floorSocPct" label="Usable floor" unit="%" registration={register('bank.floorSocPct', num)} error={shown('bank.floorSocPct')} hint="Lowest state of charge you allow." />
            <NumberField id="bank-cutoffVolts" label="Low-voltage cutoff" unit="V" registration={register('bank.cutoffVolts', numOrNull)} error={shown('bank.cutoffVolts')} hint="Where the BMS or inverter disconnects. Leave empty if none." />
            <NumberField id="bank-maxChargeAmps" label="Max charge current" unit="A" registration={register('bank.maxChargeAmps', num)} error={shown('bank.maxChargeAmps')} hint={`Typical ${formatNumber(CHEMISTRY_PRESETS[chemistry].maxChargeC, 1)} C of capacity.`} />
            <NumberField id="bank-peukertExponent" label="Peukert exponent" registration={register('bank.peukertExponent', num)} error={shown('bank.peukertExponent')} hint="How much heavy draw shrinks capacity (1 = not at all)." />
            <NumberField id="bank-chargeEfficiencyPct" label="Charge efficiency" unit="%" registration={register('bank.chargeEfficiencyPct', num)} error={shown('bank.chargeEfficiencyPct')} hint="Share of charge current the bank keeps." />
          </div>
        </div>

        <details className="group">
          <summary className="cursor-pointer font-bold text-slate-text">More battery settings</summary>
          <div className="mt-3 grid gap-4 sm:grid-cols-2">
            <NumberField id="bank-initialSocPct" label="State of charge when a trip starts" unit="%" registration={register('bank.initialSocPct', num)} error={shown('bank.initialSocPct')} />
            <NumberField id="bank-internalResistanceMilliohm" label="Internal resistance" unit="mΩ" registration={register('bank.internalResistanceMilliohm', num)} error={shown('bank.internalResistanceMilliohm')} hint="Sets the voltage sag under load." />
            <NumberField id="bank-thermalHours" label="Battery’s thermal lag" unit="h" registration={register('bank.thermalHours', num)} error={shown('bank.thermalHours')} hint="Hours the battery takes to follow the air around it: about 6 h for a 20–30 kg battery in a box (common practice)." />
          </div>
        </details>
      </section>

      {/* ---------------- Solar ---------------- */}
      <section className="card space-y-4 p-4 sm:p-6" aria-labelledby="solar-heading">
        <h2 id="solar-heading" className="text-xl">Solar</h2>
        {arrays.fields.length === 0 ? <p className="text-slate-text">No panels yet. Add each group of panels that shares a controller and a mounting.</p> : null}
        {arrays.fields.map((f, i) => (
          <ArrayCard key={f.id} index={i} ctx={ctx} onRemove={() => arrays.remove(i)} />
        ))}
        {errorAt(errors, 'arrays') ? <p className="field-error" role="alert">Solar: {errorAt(errors, 'arrays')}</p> : null}
        <div className="flex flex-wrap gap-2">
          <button type="button" className="btn btn-quiet" onClick={() => arrays.append(newArray('roof', arrays.fields.length))}>+ Add roof panels</button>
          <button type="button" className="btn btn-quiet" onClick={() => arrays.append(newArray('portable', arrays.fields.length))}>+ Add a portable panel</button>
        </div>
      </section>

      {/* ---------------- Chargers ---------------- */}
      <section className="card space-y-4 p-4 sm:p-6" aria-labelledby="chargers-heading">
        <h2 id="chargers-heading" className="text-xl">Chargers</h2>
        {chargers.fields.length === 0 ? <p className="text-slate-text">No chargers besides solar. Add a DC-DC charger if the tow vehicle or engine charges the bank while driving.</p> : null}
        {chargers.fields.map((f, i) => (
          <ChargerCard key={f.id} index={i} ctx={ctx} onRemove={() => chargers.remove(i)} />
        ))}
        <div className="flex flex-wrap gap-2">
          <button type="button" className="btn btn-quiet" onClick={() => chargers.append(newCharger('alternator'))}>+ DC-DC charger</button>
          <button type="button" className="btn btn-quiet" onClick={() => chargers.append(newCharger('shore'))}>+ Shore power charger</button>
          <button type="button" className="btn btn-quiet" disabled={hasGenerator} onClick={() => chargers.append(newCharger('generator'))}>+ Generator</button>
        </div>
        {hasGenerator ? (
          <p className="caution text-sm">Run a generator away from windows, doors and vents, and keep the CO alarm working.</p>
        ) : null}
      </section>

      {/* ---------------- Inverter ---------------- */}
      <section className="card space-y-4 p-4 sm:p-6" aria-labelledby="inverter-heading">
        <h2 id="inverter-heading" className="text-xl">Inverter</h2>
        <label className="flex items-center gap-2 font-bold">
          <input
            type="checkbox"
            className="h-4 w-4 accent-ember"
            checked={inverter != null}
            onChange={(e) => setValue('inverter', e.target.checked ? newInverter() : null, { shouldDirty: true })}
          />
          This rig has an inverter (for 120/230 V AC loads)
        </label>
        {inverter != null ? (
          <div className="grid gap-4 sm:grid-cols-3">
            <NumberField id="inverter-efficiencyPct" label="Efficiency" unit="%" registration={register('inverter.efficiencyPct', num)} error={shown('inverter.efficiencyPct')} hint="Typical 85–92 %." />
            <NumberField id="inverter-idleWatts" label="Idle draw" unit="W" registration={register('inverter.idleWatts', num)} error={shown('inverter.idleWatts')} hint="10 W left on all day is about 20 Ah." />
            <label className="flex items-start gap-2 sm:pt-7">
              <input type="checkbox" className="mt-1.5 h-4 w-4 accent-ember" {...register('inverter.alwaysOn')} />
              <span><span className="font-bold">Left on all the time</span><br /><span className="field-hint">Otherwise it counts as on only in hours with AC loads.</span></span>
            </label>
            <NumberField id="inverter-continuousWatts" label="Continuous rating" unit="W" registration={register('inverter.continuousWatts', numOrNull)} error={shown('inverter.continuousWatts')} hint="AC watts it delivers without stopping, from its label. Empty: not checked." />
            <NumberField id="inverter-surgeWatts" label="Surge rating" unit="W" registration={register('inverter.surgeWatts', numOrNull)} error={shown('inverter.surgeWatts')} hint="AC watts it holds for a moment, e.g. a compressor starting. Empty: not checked." />
          </div>
        ) : (
          <p className="text-slate-text">No inverter: every load runs on 12 V DC.</p>
        )}
      </section>

      {/* ---------------- Weight and room ---------------- */}
      <section className="card space-y-4 p-4 sm:p-6" aria-labelledby="limits-heading">
        <h2 id="limits-heading" className="text-xl">Weight and room (optional)</h2>
        <p className="text-sm text-slate-text">An installer’s upgrade sweep checks each bigger bank’s weight and size against these.</p>
        <div className="grid gap-4 sm:grid-cols-2">
          <NumberField id="rig-payloadKg" label="Payload it may still carry" unit="kg" registration={register('payloadKg', numOrNull)} error={shown('payloadKg')} hint="The rated payload less what it carries now. Empty: not stated." />
          <NumberField id="rig-batterySpaceL" label="Room for batteries" unit="L" registration={register('batterySpaceL', numOrNull)} error={shown('batterySpaceL')} hint="The battery box or bay’s inside volume. Empty: not stated." />
        </div>
      </section>

      </fieldset>

      {!readOnly ? (
        <div className="sticky bottom-0 z-10 -mx-4 flex flex-wrap items-center gap-3 border-t border-sand-dark bg-sand/95 px-4 py-3 backdrop-blur sm:static sm:mx-0 sm:border-0 sm:bg-transparent sm:px-0">
          <button type="submit" className="btn btn-primary" disabled={busy}>{busy ? 'Saving…' : rig ? 'Save power system' : 'Create rig'}</button>
          {savedAt && !isDirty ? <span role="status" className="font-semibold text-moss-deep">Saved.</span> : null}
          {rig && isDirty && !busy ? <span className="text-sm text-slate-text">Unsaved changes</span> : null}
        </div>
      ) : null}
      {rig && !readOnly ? (
        rig.canDelete === true ? (
          <DeleteRow label="Delete rig…" question={<DeletionQuestion kind="rig" id={rig.id} name={rig.name} />} onDelete={() => remove.mutate()} busy={remove.isPending} />
        ) : (
          <p className="border-t border-sand-dark pt-4 text-right text-sm text-slate-text">Only the crew’s owners can delete this rig: it takes its trips, saved forecasts and check-ins with it.</p>
        )
      ) : null}
    </form>
  );
}

/** Works out a bank's nominal volts and Ah from its batteries: series adds volts, parallel strings add Ah. */
function SeriesParallelHelper({ chemistry, onUse }: { chemistry: Chemistry; onUse: (volts: number, ah: number) => void }) {
  const [v, setV] = useState(chemistry === 'lifepo4' ? '12.8' : '6');
  const [ah, setAh] = useState('');
  const [series, setSeries] = useState(chemistry === 'lifepo4' ? '1' : '2');
  const [parallel, setParallel] = useState('1');
  const result = seriesParallel({ batteryVolts: Number(v), batteryAh: Number(ah), inSeries: Number(series), parallelStrings: Number(parallel) });
  const small = 'field-input tabular-nums';
  return (
    <details className="rounded-xl border border-sand-dark p-3">
      <summary className="cursor-pointer font-bold">Several batteries? Work out volts and Ah</summary>
      <div className="mt-3 grid grid-cols-2 gap-3 sm:grid-cols-4">
        <div><label className="field-label" htmlFor="sp-volts">Each battery (V)</label><input id="sp-volts" inputMode="decimal" className={small} value={v} onChange={(e) => setV(e.target.value)} /></div>
        <div><label className="field-label" htmlFor="sp-ah">Each battery (Ah)</label><input id="sp-ah" inputMode="decimal" className={small} value={ah} onChange={(e) => setAh(e.target.value)} /></div>
        <div><label className="field-label" htmlFor="sp-series">In series</label><input id="sp-series" inputMode="numeric" className={small} value={series} onChange={(e) => setSeries(e.target.value)} /></div>
        <div><label className="field-label" htmlFor="sp-parallel">Strings in parallel</label><input id="sp-parallel" inputMode="numeric" className={small} value={parallel} onChange={(e) => setParallel(e.target.value)} /></div>
      </div>
      <p className="field-hint mt-2">Series (+ to −) adds volts; parallel strings add amp-hours. Two 6 V 225 Ah batteries in series make a 12 V 225 Ah bank.</p>
      <div className="mt-2 flex flex-wrap items-center gap-3" aria-live="polite">
        {result ? (
          <>
            <span className="font-bold">{result.batteries} {result.batteries === 1 ? 'battery' : 'batteries'} → {formatNumber(result.nominalVolts, 2)} V, {formatNumber(result.capacityAh, 1)} Ah</span>
            <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={() => onUse(result.nominalVolts, result.capacityAh)}>Use {formatNumber(result.nominalVolts, 2)} V {formatNumber(result.capacityAh, 1)} Ah</button>
          </>
        ) : (
          <span className="field-hint">Enter each battery’s volts and Ah, and whole numbers of batteries in series and strings in parallel.</span>
        )}
      </div>
    </details>
  );
}

function ArrayCard({ index, ctx, onRemove }: { index: number; ctx: Ctx; onRemove: () => void }) {
  const { register, control, shown, setValue, units } = ctx;
  const p = (k: string) => `arrays.${index}.${k}` as const;
  const tiltDeg = useWatch({ control, name: `arrays.${index}.tiltDeg` });
  const azimuthDeg = useWatch({ control, name: `arrays.${index}.azimuthDeg` });
  const aim = useWatch({ control, name: `arrays.${index}.aim` });
  const controller = useWatch({ control, name: `arrays.${index}.controller` });
  const name = useWatch({ control, name: `arrays.${index}.name` });
  const mounting = mountingOf({ tiltDeg: tiltDeg as number, aim: aim as 'fixed' | 'follow' });
  const onMounting = (m: Mounting) => {
    const next = applyMounting(m, { tiltDeg: tiltDeg as number, azimuthDeg: azimuthDeg as number });
    setValue(`arrays.${index}.tiltDeg`, next.tiltDeg, { shouldDirty: true });
    setValue(`arrays.${index}.azimuthDeg`, next.azimuthDeg, { shouldDirty: true });
    setValue(`arrays.${index}.aim`, next.aim, { shouldDirty: true });
  };
  const id = (k: string) => fieldId(p(k));
  const err = (k: string) => shown(p(k));
  const compassKnown = COMPASS.some((c) => c.deg === azimuthDeg);

  return (
    <fieldset className="rounded-xl border-2 border-sand-dark p-3 sm:p-4" aria-label={`Solar array ${index + 1}`}>
      <div className="flex items-center justify-between gap-2">
        <h3 className="text-base font-extrabold">{(name as string) || `Array ${index + 1}`}</h3>
        <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onRemove} aria-label={`Remove solar array ${index + 1}`}>Remove</button>
      </div>
      <div className="mt-2 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        <Field id={id('name')} label="Name" error={err('name')}>
          <input id={id('name')} className="field-input" {...describedBy(id('name'), err('name'))} {...register(`arrays.${index}.name`)} />
        </Field>
        <NumberField id={id('ratedWatts')} label="Rated power (all panels)" errorName="Rated power" unit="W" registration={register(`arrays.${index}.ratedWatts`, num)} error={err('ratedWatts')} hint="Nameplate watts added up, e.g. 2 × 200 W = 400 W." />
        <Field id={id('mounting')} label="Mounting" hint={MOUNTINGS.find((m) => m.value === mounting)?.hint}>
          <select id={id('mounting')} className="field-input" value={mounting} onChange={(e) => onMounting(e.target.value as Mounting)} aria-describedby={`${id('mounting')}-hint`}>
            {MOUNTINGS.map((m) => <option key={m.value} value={m.value}>{m.label}</option>)}
          </select>
        </Field>
        {mounting !== 'flat' ? (
          <NumberField id={id('tiltDeg')} label="Tilt from flat" errorName="Tilt" unit="°" registration={register(`arrays.${index}.tiltDeg`, num)} error={err('tiltDeg')} hint={mounting === 'portable' ? 'How steeply it leans while aimed at the sun.' : '0° is flat, 90° upright.'} />
        ) : null}
        {mounting === 'tilted' ? (
          <Field id={id('azimuthDeg')} label="Faces" error={err('azimuthDeg')} hint="South in the northern hemisphere, north in the southern.">
            <select id={id('azimuthDeg')} className="field-input" {...describedBy(id('azimuthDeg'), err('azimuthDeg'), true)} {...register(`arrays.${index}.azimuthDeg`, { setValueAs: (v) => Number(v) })}>
              {!compassKnown && typeof azimuthDeg === 'number' ? <option value={azimuthDeg}>{azimuthDeg}°</option> : null}
              {COMPASS.map((c) => <option key={c.deg} value={c.deg}>{c.label} ({c.deg}°)</option>)}
            </select>
          </Field>
        ) : null}
        <fieldset>
          <legend className="field-label">Controller</legend>
          <div className="flex gap-2">
            {(['mppt', 'pwm'] as const).map((c) => (
              <label key={c} className="flex min-h-[44px] flex-1 cursor-pointer items-center gap-2 rounded-xl border-2 border-sand-dark bg-white px-3 font-bold has-[:checked]:border-ember">
                <input type="radio" value={c} className="accent-ember" {...register(`arrays.${index}.controller`)} /> {c.toUpperCase()}
              </label>
            ))}
          </div>
          <p className="field-hint mt-1">MPPT harvests 10–30 % more than PWM, most in the cold.</p>
        </fieldset>
        <NumberField id={id('controllerMaxAmps')} label="Controller max output" errorName="Controller max output" unit="A" registration={register(`arrays.${index}.controllerMaxAmps`, numOrNull)} error={err('controllerMaxAmps')} hint="Leave empty if you do not know." />
        <NumberField id={id('shadePct')} label="Own shade" unit="%" registration={register(`arrays.${index}.shadePct`, num)} error={err('shadePct')} hint="Shade on these panels wherever you park (a roof rack, an AC unit)." />
      </div>
      <details className="mt-3">
        <summary className="cursor-pointer font-bold text-slate-text">Panel and controller details</summary>
        <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          <NumberField id={id('lossesPct')} label="System losses" unit="%" registration={register(`arrays.${index}.lossesPct`, num)} error={err('lossesPct')} hint="Wiring, dirt, mismatch: 14 % is usual." />
          <NumberField id={id('controllerEfficiencyPct')} label="Controller efficiency" unit="%" registration={register(`arrays.${index}.controllerEfficiencyPct`, num)} error={err('controllerEfficiencyPct')} />
          <NumberField id={id('tempCoeffPctPerC')} label="Power temperature coefficient" unit="%/°C" signed registration={register(`arrays.${index}.tempCoeffPctPerC`, num)} error={err('tempCoeffPctPerC')} hint="From the panel's label, per °C as labels state it; −0.4 is typical." />
          <NumberField id={id('nocC')} label="NOCT" unit="°C" registration={register(`arrays.${index}.nocC`, num)} error={err('nocC')} hint={`Nominal operating cell temperature, in °C as the panel's label states it; 45 °C${units === 'imperial' ? ` (${formatTemp(45, units)})` : ''} is typical.`} />
          {controller === 'pwm' ? (
            <NumberField id={id('vmpVolts')} label="Panel Vmp" unit="V" registration={register(`arrays.${index}.vmpVolts`, num)} error={err('vmpVolts')} hint="About 18 V for a “12 V” panel; PWM pulls it down to battery voltage." />
          ) : null}
        </div>
      </details>
    </fieldset>
  );
}

function ChargerCard({ index, ctx, onRemove }: { index: number; ctx: Ctx; onRemove: () => void }) {
  const { register, control, shown } = ctx;
  const kind = useWatch({ control, name: `chargers.${index}.kind` }) as 'alternator' | 'shore' | 'generator';
  const info = CHARGER_KINDS[kind] ?? CHARGER_KINDS.alternator;
  const p = (k: string) => `chargers.${index}.${k}`;
  const id = (k: string) => fieldId(p(k));
  const err = (k: string) => shown(p(k));
  return (
    <fieldset className="rounded-xl border-2 border-sand-dark p-3 sm:p-4" aria-label={`Charger ${index + 1}`}>
      <div className="flex items-center justify-between gap-2">
        <h3 className="text-base font-extrabold">{info.title}</h3>
        <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onRemove} aria-label={`Remove charger ${index + 1}`}>Remove</button>
      </div>
      <div className="mt-2 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <Field id={id('kind')} label="Kind" error={err('kind')}>
          <select id={id('kind')} className="field-input" {...describedBy(id('kind'), err('kind'))} {...register(`chargers.${index}.kind`)}>
            <option value="alternator">DC-DC charger</option>
            <option value="shore">Shore power</option>
            <option value="generator">Generator</option>
          </select>
        </Field>
        <NumberField id={id('amps')} label={info.ampsLabel} unit="A" registration={register(`chargers.${index}.amps`, num)} error={err('amps')} hint={info.hint} className="sm:col-span-1 lg:col-span-3" />
        {kind === 'generator' ? (
          <>
            <NumberField id={id('startSocPct')} label="Start below" errorName="Start level" unit="%" registration={register(`chargers.${index}.startSocPct`, num)} error={err('startSocPct')} hint="State of charge that starts it." />
            <NumberField id={id('stopSocPct')} label="Stop at" errorName="Stop level" unit="%" registration={register(`chargers.${index}.stopSocPct`, num)} error={err('stopSocPct')} hint="State of charge where it stops." />
            <NumberField id={id('fuelLitresPerHour')} label="Fuel use" unit="L/h" registration={register(`chargers.${index}.fuelLitresPerHour`, num)} error={err('fuelLitresPerHour')} hint="A 2 kW inverter generator: ~0.4 L/h light, 1–1.7 L/h full." />
          </>
        ) : null}
      </div>
    </fieldset>
  );
}
