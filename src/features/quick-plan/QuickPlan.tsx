import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { validatePlan, type Forecast, type Plan, type ResolvedPlan } from '../../engine';
import { Field, describedBy } from '../../components/ui/Field';
import { ApiError } from '../../lib/query-client';
import AdvicePanel from '../forecast/AdvicePanel';
import CsvButton from '../forecast/CsvButton';
import { PRINT_CHARTS } from '../forecast/ForecastView';
import SocChart from '../forecast/SocChart';
import SummaryCards from '../forecast/SummaryCards';
import VerdictBanner from '../forecast/VerdictBanner';
import type { Units } from '../../lib/units';
import { SignToggle } from '../../components/ui/SignToggle';
import { asNumber } from '../../components/ui/form';
import { previewForecast } from '../forecast/forecast.api';
import { useDelayed } from '../forecast/useWidth';
import {
  BANK_PRESETS,
  buildQuickPlan,
  COMMON_ZONES,
  defaultQuickPlan,
  fieldForIssue,
  KEEP_PLAN_URL,
  LOAD_CATALOGUE,
  MOUNTINGS,
  QUICK_PLAN_STORAGE_KEY,
  quickPlanFormSchema,
  SKY_CHOICES,
  toCelsius,
  type QuickPlanForm,
} from '../../domain/quick-plan/quick-plan';
import { lookupTimeZone, searchPlaces, type PlaceChoice } from './quick-plan.api';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';

export interface QuickPlanProps {
  /** Today's date (YYYY-MM-DD) from the server, so the server and browser render the same defaults. */
  today: string;
}

/** The landing page's quick plan: a short form, an anonymous forecast, and "Keep this plan". */
export default function QuickPlan(props: QuickPlanProps) {
  return (
    <IslandQueryProvider>
      <QuickPlanForm {...props} />
    </IslandQueryProvider>
  );
}

interface Result {
  plan: Plan;
  resolved: ResolvedPlan;
  forecast: Forecast;
}

function QuickPlanForm({ today }: QuickPlanProps) {
  const defaults = useMemo(() => defaultQuickPlan(today), [today]);
  const {
    register,
    handleSubmit,
    setValue,
    getValues,
    setError,
    watch,
    formState: { errors },
  } = useForm<QuickPlanForm>({ resolver: zodResolver(quickPlanFormSchema), defaultValues: defaults });
  // react-hook-form writes the starting values into the fields when the island mounts; the server's HTML carries
  // them too, so the form is not blank while it waits to hydrate (it does when scrolled into view).
  const start = (name: keyof QuickPlanForm) => {
    const v = defaults[name];
    return typeof v === 'string' || typeof v === 'number' ? { defaultValue: v } : {};
  };
  const [result, setResult] = useState<Result | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const resultRef = useRef<HTMLDivElement>(null);

  const run = useMutation({ mutationFn: (plan: Plan) => previewForecast(plan) });
  const slow = useDelayed(run.isPending);

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const plan = buildQuickPlan(values);
    try {
      const forecast = await run.mutateAsync(plan);
      const v = validatePlan(plan);
      if (!v.ok) throw new Error('The plan could not be read back.');
      setResult({ plan, resolved: v.plan, forecast });
      requestAnimationFrame(() => {
        const el = resultRef.current;
        if (el && el.getBoundingClientRect().top > window.innerHeight * 0.6) el.scrollIntoView({ behavior: 'smooth', block: 'start' });
      });
    } catch (e) {
      if (e instanceof ApiError && e.status === 400 && e.issues.length > 0) {
        const loose: string[] = [];
        for (const issue of e.issues) {
          const field = fieldForIssue(issue.path);
          if (field) setError(field, { type: 'server', message: issue.message }, { shouldFocus: true });
          else loose.push(issue.message);
        }
        setFormError(loose.length > 0 ? `The forecast refused the plan: ${loose.join('; ')}` : 'Check the fields marked below.');
      } else if (e instanceof ApiError && e.status === 429) {
        setFormError('Too many forecasts from here in a short time. Wait a minute, then try again.');
      } else {
        setFormError(e instanceof Error ? e.message : 'The forecast failed. Try again.');
      }
    }
  });

  const keep = () => {
    if (!result) return;
    try {
      sessionStorage.setItem(QUICK_PLAN_STORAGE_KEY, JSON.stringify(result.plan));
    } catch {
      // Storage blocked: the sign-up still works; the plan is simply not carried over.
    }
    window.location.assign(KEEP_PLAN_URL);
  };

  const tempUnit = watch('tempUnit');
  const switchUnit = (unit: 'C' | 'F') => {
    const from = getValues('tempUnit');
    if (from === unit) return;
    for (const k of ['high', 'low'] as const) {
      const t = getValues(k);
      if (!Number.isFinite(t)) continue;
      const c = toCelsius(t, from);
      setValue(k, Math.round(unit === 'F' ? (c * 9) / 5 + 32 : c));
    }
    setValue('tempUnit', unit);
  };

  const num = { valueAsNumber: true } as const;
  // Signed boxes are text read by the locale, with a ± button: phone decimal keypads have no minus key.
  const typed = { setValueAs: asNumber } as const;
  const err = (k: keyof QuickPlanForm) => errors[k]?.message as string | undefined;

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,25rem)_minmax(0,1fr)] lg:items-start">
      <form onSubmit={onSubmit} noValidate className="card space-y-5 p-4 sm:p-5" aria-label="Quick plan">
        {formError ? (
          <p role="alert" className="caution font-semibold text-alert" data-testid="quick-plan-form-error">{formError}</p>
        ) : null}

        <fieldset className="space-y-3">
          <legend className="mb-1 text-lg font-extrabold">Battery bank</legend>
          <div role="radiogroup" aria-label="Chemistry" className="grid gap-2 sm:grid-cols-3 lg:grid-cols-1">
            {BANK_PRESETS.map((b) => (
              <label key={b.value} className="flex cursor-pointer items-start gap-2 rounded-xl border-2 border-sand-dark bg-white p-2.5 has-[:checked]:border-ember has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-ember">
                <input type="radio" value={b.value} className="mt-1.5 shrink-0 accent-ember" defaultChecked={defaults.chemistry === b.value} {...register('chemistry')} />
                <span>
                  <span className="block font-bold">{b.label}</span>
                  <span className="block text-xs text-slate-text">{b.hint}</span>
                </span>
              </label>
            ))}
          </div>
          {err('chemistry') ? <p className="field-error" role="alert">{err('chemistry')}</p> : null}
          <Field id="qp-capacityAh" label="Size (Ah)" errorName="Bank size" error={err('capacityAh')} hint="The bank's total amp-hours at 12 V, e.g. 2 × 100 Ah = 200.">
            <input id="qp-capacityAh" type="number" inputMode="decimal" step="any" className="field-input" {...describedBy('qp-capacityAh', err('capacityAh'), true)} {...register('capacityAh', num)} {...start('capacityAh')} />
          </Field>
        </fieldset>

        <fieldset className="space-y-3">
          <legend className="mb-1 text-lg font-extrabold">Solar</legend>
          <div className="grid grid-cols-2 gap-3">
            <Field id="qp-panelWatts" label="Panels (W)" errorName="Panel watts" error={err('panelWatts')}>
              <input id="qp-panelWatts" type="number" inputMode="decimal" step="any" className="field-input" {...describedBy('qp-panelWatts', err('panelWatts'))} {...register('panelWatts', num)} {...start('panelWatts')} />
            </Field>
            <Field id="qp-shadePct" label="Shade at camp (%)" errorName="Shade" error={err('shadePct')}>
              <input id="qp-shadePct" type="number" inputMode="decimal" step="any" className="field-input" {...describedBy('qp-shadePct', err('shadePct'))} {...register('shadePct', num)} {...start('shadePct')} />
            </Field>
          </div>
          <Field id="qp-mounting" label="Mounting" error={err('mounting')} hint="All on an MPPT controller.">
            <select id="qp-mounting" className="field-input" {...describedBy('qp-mounting', err('mounting'), true)} {...register('mounting')} {...start('mounting')}>
              {MOUNTINGS.map((m) => (
                <option key={m.value} value={m.value}>{m.label}</option>
              ))}
            </select>
          </Field>
        </fieldset>

        <fieldset>
          <legend className="mb-1 text-lg font-extrabold">Loads</legend>
          <p className="field-hint mb-2">Typical draws — your appliance's label has the true figure.</p>
          <ul className="space-y-1.5">
            {LOAD_CATALOGUE.map((l) => (
              <li key={l.id}>
                <label className="flex cursor-pointer items-start gap-2.5 rounded-lg px-1 py-1 hover:bg-sand/60">
                  <input type="checkbox" value={l.id} className="mt-1.5 h-4 w-4 shrink-0 accent-ember" defaultChecked={defaults.loads.includes(l.id)} {...register('loads')} />
                  <span>
                    <span className="font-bold">{l.label}</span>
                    <span className="block text-xs text-slate-text">Typical: {l.typical}</span>
                  </span>
                </label>
              </li>
            ))}
          </ul>
          {err('loads') ? <p className="field-error" role="alert">Loads: {err('loads')}</p> : null}
        </fieldset>

        <PlaceFields register={register} setValue={setValue} getValues={getValues} errors={errors} start={start} />

        <fieldset className="space-y-3">
          <legend className="mb-1 text-lg font-extrabold">When</legend>
          <div className="grid grid-cols-2 gap-3">
            <Field id="qp-arrive" label="Arrive" errorName="Arrival date" error={err('arrive')} hint="From 15:00.">
              <input id="qp-arrive" type="date" className="field-input" {...describedBy('qp-arrive', err('arrive'), true)} {...register('arrive')} {...start('arrive')} />
            </Field>
            <Field id="qp-nights" label="Nights" error={err('nights')}>
              <input id="qp-nights" type="number" inputMode="numeric" min={1} max={60} step={1} className="field-input" {...describedBy('qp-nights', err('nights'))} {...register('nights', num)} {...start('nights')} />
            </Field>
          </div>
        </fieldset>

        <fieldset className="space-y-3">
          <legend className="mb-1 text-lg font-extrabold">Expected weather</legend>
          <Field id="qp-cloudOktas" label="Sky" error={err('cloudOktas')} hint="The same sky every day; one cloudy week changes a lot.">
            <select id="qp-cloudOktas" className="field-input" {...describedBy('qp-cloudOktas', err('cloudOktas'), true)} {...register('cloudOktas', num)} {...start('cloudOktas')}>
              {SKY_CHOICES.map((s) => (
                <option key={s.oktas} value={s.oktas}>{s.label}</option>
              ))}
            </select>
          </Field>
          <div className="grid grid-cols-[1fr_1fr_auto] items-start gap-3">
            <Field id="qp-high" label={`High (°${tempUnit})`} errorName="High" error={err('high')}>
              <div className="flex gap-1.5">
                <SignToggle inputId="qp-high" label="High" />
                <input id="qp-high" inputMode="decimal" autoComplete="off" className="field-input min-w-0 flex-1" {...describedBy('qp-high', err('high'))} {...register('high', typed)} {...start('high')} />
              </div>
            </Field>
            <Field id="qp-low" label={`Low (°${tempUnit})`} errorName="Low" error={err('low')}>
              <div className="flex gap-1.5">
                <SignToggle inputId="qp-low" label="Low" />
                <input id="qp-low" inputMode="decimal" autoComplete="off" className="field-input min-w-0 flex-1" {...describedBy('qp-low', err('low'))} {...register('low', typed)} {...start('low')} />
              </div>
            </Field>
            <div role="group" aria-label="Temperature unit" className="mt-6 flex overflow-hidden rounded-[10px] border-[1.5px] border-[#b9ab95]">
              {(['C', 'F'] as const).map((u) => (
                <button
                  key={u}
                  type="button"
                  aria-pressed={tempUnit === u}
                  onClick={() => switchUnit(u)}
                  className={`min-h-[44px] px-3 font-bold ${tempUnit === u ? 'bg-dusk text-white' : 'bg-white text-dusk'}`}
                >
                  °{u}
                </button>
              ))}
            </div>
          </div>
        </fieldset>

        <button type="submit" className="btn btn-primary w-full" disabled={run.isPending}>
          {run.isPending ? 'Forecasting…' : 'Forecast my trip'}
        </button>
        <p className="text-xs text-slate-text">No account needed. Starts with a full bank; figures are estimates.</p>
      </form>

      <div ref={resultRef} className={`scroll-mt-4 space-y-4 ${PRINT_CHARTS}`} aria-live="polite" data-testid="quick-plan-result">
        {run.isPending && slow ? (
          <div role="status" className="card flex h-72 flex-col items-center justify-center gap-3 p-6 text-slate-text" data-testid="quick-plan-progress">
            <span aria-hidden="true" className="inline-block h-6 w-6 animate-spin rounded-full border-[3px] border-sand-dark border-t-ember" />
            Forecasting every hour of your trip…
          </div>
        ) : result ? (
          <QuickResult result={result} onKeep={keep} units={tempUnit === 'F' ? 'imperial' : 'metric'} />
        ) : (
          <div className="rounded-[14px] border-2 border-dashed border-sand-dark bg-card/60 p-6 text-slate-text">
            <p className="text-lg font-extrabold text-dusk">Your forecast appears here</p>
            <p className="mt-1">Fill in the bank, panels and loads, the place and the dates, then choose “Forecast my trip”. You will see when the bank would reach its floor — hour by hour, in the camp's local time.</p>
          </div>
        )}
      </div>
    </div>
  );
}

/** The answer, its temperatures (warnings, advice, CSV) in the unit the camper typed the weather in. */
function QuickResult({ result, onKeep, units }: { result: Result; onKeep: () => void; units: Units }) {
  const { forecast, resolved } = result;
  return (
    <>
      <VerdictBanner forecast={forecast} plan={resolved} as="h3" units={units} />
      <section className="card p-3 sm:p-5" aria-label="State of charge chart">
        <SocChart forecast={forecast} plan={resolved} />
      </section>
      <SummaryCards forecast={forecast} />
      <div className="card flex flex-col gap-3 p-4 sm:flex-row sm:items-center sm:justify-between no-print">
        <p className="text-sm">
          <strong>Keep this plan:</strong> create a free account and it becomes your first rig and trip, ready to refine.
        </p>
        <div className="flex shrink-0 flex-wrap gap-2">
          <button type="button" className="btn btn-primary" onClick={onKeep} data-testid="keep-plan">Keep this plan</button>
          <CsvButton forecast={forecast} name="quick plan" units={units} />
        </div>
      </div>
      <AdvicePanel forecast={forecast} plan={resolved} units={units} />
    </>
  );
}

// ---------------------------------------------------------------------------------------------
// Place: search by name, or coordinates with their time zone

type FormApi = Pick<ReturnType<typeof useForm<QuickPlanForm>>, 'register' | 'setValue' | 'getValues'> & {
  /** The field's starting value for the server's HTML. */
  start: (name: keyof QuickPlanForm) => { defaultValue?: string | number };
  errors: ReturnType<typeof useForm<QuickPlanForm>>['formState']['errors'];
};

type SearchState = 'idle' | 'searching' | 'done' | 'unavailable';

function PlaceFields({ register, setValue, getValues, errors, start }: FormApi) {
  const id = useId();
  const [query, setQuery] = useState('');
  const [places, setPlaces] = useState<PlaceChoice[]>([]);
  const [search, setSearch] = useState<SearchState>('idle');
  const [zoneNote, setZoneNote] = useState<string | null>(null);
  const [zones, setZones] = useState<string[]>(() => {
    const tz = getValues('timeZone');
    return COMMON_ZONES.includes(tz as (typeof COMMON_ZONES)[number]) ? [...COMMON_ZONES] : [tz, ...COMMON_ZONES];
  });

  useEffect(() => {
    const q = query.trim();
    if (q.length < 2 || search === 'unavailable') {
      setPlaces([]);
      return;
    }
    const ctrl = new AbortController();
    const t = setTimeout(async () => {
      setSearch('searching');
      try {
        const found = await searchPlaces(q, ctrl.signal);
        setPlaces(found);
        setSearch('done');
      } catch (e) {
        if (ctrl.signal.aborted) return;
        // A server without the search (or a signed-in-only one): fall back to coordinates.
        setPlaces([]);
        setSearch(e instanceof ApiError && e.status === 429 ? 'done' : 'unavailable');
      }
    }, 300);
    return () => {
      clearTimeout(t);
      ctrl.abort();
    };
    // `search` is read to stop searching once unavailable, not to rerun.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [query]);

  const setZone = (tz: string) => {
    setZones((z) => (z.includes(tz) ? z : [tz, ...z]));
    setValue('timeZone', tz, { shouldValidate: true });
  };

  const pick = async (p: PlaceChoice) => {
    setValue('placeName', p.where ? `${p.name}, ${p.where}`.slice(0, 100) : p.name, { shouldValidate: true });
    setValue('lat', Math.round(p.lat * 1000) / 1000, { shouldValidate: true });
    setValue('lon', Math.round(p.lon * 1000) / 1000, { shouldValidate: true });
    setPlaces([]);
    setQuery('');
    if (p.timeZone) setZone(p.timeZone);
    else await findZone();
  };

  const findZone = async () => {
    const lat = getValues('lat');
    const lon = getValues('lon');
    if (!Number.isFinite(lat) || !Number.isFinite(lon) || Math.abs(lat) > 90 || Math.abs(lon) > 180) return;
    const tz = await lookupTimeZone(lat, lon);
    if (tz) {
      setZone(tz);
      setZoneNote(`Time zone from the coordinates: ${tz}.`);
    } else {
      setZoneNote('Could not find the zone from the coordinates: choose it from the list.');
    }
  };

  const placeReg = register('placeName');
  const latReg = register('lat', { setValueAs: asNumber });
  const lonReg = register('lon', { setValueAs: asNumber });
  const err = (k: keyof QuickPlanForm) => errors[k]?.message as string | undefined;

  return (
    <fieldset className="space-y-3">
      <legend className="mb-1 text-lg font-extrabold">Where</legend>
      <Field
        id="qp-placeName"
        label="Place"
        error={err('placeName')}
        hint={search === 'unavailable' ? 'Place search is not available here: name the camp and enter its coordinates below.' : 'Type a town or camp to search, or just name it and enter coordinates.'}
      >
        <input
          id="qp-placeName"
          className="field-input"
          autoComplete="off"
          {...describedBy('qp-placeName', err('placeName'), true)}
          {...placeReg}
          {...start('placeName')}
          onChange={(e) => {
            void placeReg.onChange(e);
            setQuery(e.target.value);
          }}
          onKeyDown={(e) => {
            if (e.key === 'Escape') setPlaces([]);
          }}
        />
      </Field>
      {search === 'searching' ? <p className="field-hint" role="status">Searching…</p> : null}
      {places.length > 0 ? (
        <ul className="overflow-hidden rounded-xl border border-sand-dark bg-white" aria-label="Places found" id={`${id}-places`}>
          {places.map((p) => (
            <li key={`${p.name}-${p.lat}-${p.lon}`} className="border-t border-sand first:border-t-0">
              <button type="button" className="w-full px-3 py-2 text-left hover:bg-sand/60 focus-visible:bg-sand/60" onClick={() => void pick(p)}>
                <span className="font-bold">{p.name}</span>
                {p.where ? <span className="text-sm text-slate-text">, {p.where}</span> : null}
              </button>
            </li>
          ))}
        </ul>
      ) : search === 'done' && query.trim().length >= 2 ? (
        <p className="field-hint">No place found by that name — enter its coordinates below.</p>
      ) : null}
      <div className="grid grid-cols-2 gap-3">
        <Field id="qp-lat" label="Latitude" error={err('lat')}>
          <div className="flex gap-1.5">
          <SignToggle inputId="qp-lat" label="Latitude" />
          <input
            id="qp-lat"
            inputMode="decimal"
            autoComplete="off"
            className="field-input min-w-0 flex-1"
            {...describedBy('qp-lat', err('lat'))}
            {...latReg}
            {...start('lat')}
            onBlur={(e) => {
              void latReg.onBlur(e);
              void findZone();
            }}
          />
          </div>
        </Field>
        <Field id="qp-lon" label="Longitude" error={err('lon')}>
          <div className="flex gap-1.5">
          <SignToggle inputId="qp-lon" label="Longitude" />
          <input
            id="qp-lon"
            inputMode="decimal"
            autoComplete="off"
            className="field-input min-w-0 flex-1"
            {...describedBy('qp-lon', err('lon'))}
            {...lonReg}
            {...start('lon')}
            onBlur={(e) => {
              void lonReg.onBlur(e);
              void findZone();
            }}
          />
          </div>
        </Field>
      </div>
      <Field id="qp-timeZone" label="Time zone" error={err('timeZone')} hint={zoneNote ?? 'Times in the forecast are the camp’s local time.'}>
        <select id="qp-timeZone" className="field-input" {...describedBy('qp-timeZone', err('timeZone'), true)} {...register('timeZone')} {...start('timeZone')}>
          {zones.map((z) => (
            <option key={z} value={z}>{z.replace(/_/g, ' ')}</option>
          ))}
        </select>
      </Field>
    </fieldset>
  );
}
