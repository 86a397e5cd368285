import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { asNumber } from '../../components/ui/form';
import { ErrorState } from '../../components/ui/States';
import { CHEMISTRIES, type Chemistry } from '../../engine/light';
import { CHEMISTRY_LABELS, formatNumber, formatRowTime } from '../../lib/format';
import { ApiError, type ApiIssue } from '../../lib/query-client';
import type { HandPlan, HandPlanInput, HandPlanResult } from '../../domain/proposals/sweep-edit';
import type { Outcome } from '../../domain/proposals/sweep';
import { createHandProposal, runAfterPlan } from './proposals.api';
import { CAUTIONS } from '../../domain/advice/cautions';

// The after-plan edited by hand: bank, arrays, chargers and generator as the installer types them,
// run again against the saved forecast's trip and judged as a sweep option is.

interface ArrayRow {
  name: string;
  ratedWatts: string;
  tiltDeg: string;
  azimuthDeg: string;
  aim: 'fixed' | 'follow';
  controller: 'mppt' | 'pwm';
}
interface GenRow {
  amps: string;
  startHour: string;
  hoursPerDay: string;
  marginPts: string;
  stopPct: string;
}
/** The editor's text fields, as typed. */
export interface EditorState {
  chemistry: Chemistry;
  capacityAh: string;
  floorSocPct: string;
  arrays: ArrayRow[];
  dcdcAmps: string;
  shoreAmps: string;
  generator: GenRow | null;
  payloadKg: string;
  batterySpaceL: string;
}

const s = (x: number | null | undefined) => (x === null || x === undefined ? '' : String(x));

/** The editor's fields from a hand plan (the rig as it is, or a sweep option's plan). */
export function editorStateOf(p: HandPlan): EditorState {
  return {
    chemistry: p.bank.chemistry,
    capacityAh: s(p.bank.capacityAh),
    floorSocPct: s(p.bank.floorSocPct),
    arrays: p.arrays.map((a) => ({
      name: a.name,
      ratedWatts: s(a.ratedWatts),
      tiltDeg: s(a.tiltDeg),
      azimuthDeg: s(a.azimuthDeg),
      aim: a.aim,
      controller: a.controller,
    })),
    dcdcAmps: s(p.dcdcAmps),
    shoreAmps: s(p.shoreAmps),
    generator: p.generator
      ? {
          amps: s(p.generator.amps),
          startHour: s(p.generator.startHour),
          hoursPerDay: s(p.generator.hoursPerDay),
          marginPts: s(p.generator.marginPts),
          stopPct: s(p.generator.stopPct),
        }
      : null,
    payloadKg: s(p.payloadKg),
    batterySpaceL: s(p.batterySpaceL),
  };
}

const n = (x: string) => asNumber(x) ?? (x.trim() === '' ? NaN : (x as unknown as number));
const opt = (x: string) => (x.trim() === '' ? null : n(x));

function toInput(e: EditorState): HandPlanInput {
  return {
    bank: { chemistry: e.chemistry, capacityAh: n(e.capacityAh), floorSocPct: n(e.floorSocPct) },
    arrays: e.arrays.map((a) => ({
      name: a.name,
      ratedWatts: n(a.ratedWatts),
      tiltDeg: n(a.tiltDeg),
      azimuthDeg: n(a.azimuthDeg),
      aim: a.aim,
      controller: a.controller,
    })),
    dcdcAmps: e.dcdcAmps.trim() === '' ? 0 : n(e.dcdcAmps),
    shoreAmps: e.shoreAmps.trim() === '' ? 0 : n(e.shoreAmps),
    generator: e.generator
      ? {
          amps: n(e.generator.amps),
          startHour: n(e.generator.startHour),
          hoursPerDay: n(e.generator.hoursPerDay),
          marginPts: n(e.generator.marginPts),
          stopPct: n(e.generator.stopPct),
        }
      : null,
    payloadKg: opt(e.payloadKg),
    batterySpaceL: opt(e.batterySpaceL),
  };
}

function outcomeText(o: Outcome): string {
  const low = `lowest usable charge ${formatNumber(o.minUsablePct, 1)} % against the ${formatNumber(o.reservePct, 1)} % line`;
  const cut = o.firstCutoffAt
    ? `runs out ${formatRowTime(o.firstCutoffAt)}, ${formatNumber(Math.round(o.unmetWh))} Wh unmet over ${o.hoursShort} h`
    : 'no cutoff';
  return `${low} · ${cut}${o.generatorHours > 0 ? ` · generator ${o.generatorHours} h` : ''}`;
}

/** The hand editor; `state` is lifted so a sweep option can load its plan into it. */
export default function AfterPlanEditor({
  forecastId,
  state,
  setState,
  fallback,
}: {
  forecastId: string;
  state: EditorState;
  setState: (s: EditorState) => void;
  fallback: EditorState;
}) {
  const [issues, setIssues] = useState<ApiIssue[]>([]);
  const run = useMutation({
    mutationFn: (e: EditorState) => runAfterPlan(forecastId, toInput(e)),
    onMutate: () => setIssues([]),
    onError: (e) => {
      if (e instanceof ApiError) setIssues(e.issues);
    },
  });
  const propose = useMutation({
    mutationFn: (e: EditorState) => createHandProposal(forecastId, toInput(e)),
    onSuccess: (p) => window.location.assign(`/proposals/${encodeURIComponent(p.id)}`),
  });
  // The plan just run, while the fields still hold it: only that plan can be proposed.
  const ranNow = run.data && run.variables && JSON.stringify(run.variables) === JSON.stringify(state) ? run.variables : null;
  const at = (path: string) => issues.find((i) => i.path === path)?.message;
  const field = (id: string, label: string, value: string, onChange: (v: string) => void, path: string, unit?: string) => (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <div className="relative">
        <input
          id={id}
          inputMode="decimal"
          className={`field-input tabular-nums ${unit ? 'pr-12' : ''}`}
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={at(path) ? true : undefined}
          aria-describedby={at(path) ? `${id}-error` : undefined}
        />
        {unit ? (
          <span
            aria-hidden="true"
            className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text"
          >
            {unit}
          </span>
        ) : null}
      </div>
      {at(path) ? (
        <p id={`${id}-error`} className="field-error" role="alert">
          {at(path)}
        </p>
      ) : null}
    </div>
  );
  const setArray = (i: number, patch: Partial<ArrayRow>) =>
    setState({ ...state, arrays: state.arrays.map((a, j) => (j === i ? { ...a, ...patch } : a)) });
  const setGen = (patch: Partial<GenRow>) => state.generator && setState({ ...state, generator: { ...state.generator, ...patch } });
  const r: HandPlanResult | undefined = run.data;

  return (
    <section aria-labelledby="hand-heading" className="card space-y-5 p-4 sm:p-5" data-testid="after-plan-editor">
      <div>
        <h2 id="hand-heading" className="text-xl">
          Edit the after-plan by hand
        </h2>
        <p className="text-sm text-slate-text">
          For a change the options above do not cover. Starts from the rig as it is, or from an option’s “Edit by hand”; run it to see the
          trip again.
        </p>
      </div>
      <form
        aria-label="After-plan"
        noValidate
        className="space-y-5"
        onSubmit={(e) => {
          e.preventDefault();
          run.mutate(state);
        }}
      >
        <fieldset className="grid gap-3 sm:grid-cols-3">
          <legend className="field-label text-base">Bank</legend>
          <div>
            <label htmlFor="hand-chemistry" className="field-label">
              Chemistry
            </label>
            <select
              id="hand-chemistry"
              className="field-input"
              value={state.chemistry}
              onChange={(e) => setState({ ...state, chemistry: e.target.value as Chemistry })}
            >
              {CHEMISTRIES.map((c) => (
                <option key={c} value={c}>
                  {CHEMISTRY_LABELS[c]}
                </option>
              ))}
            </select>
          </div>
          {field('hand-capacityAh', 'Capacity', state.capacityAh, (v) => setState({ ...state, capacityAh: v }), 'bank.capacityAh', 'Ah')}
          {field(
            'hand-floorSocPct',
            'Floor (lowest charge)',
            state.floorSocPct,
            (v) => setState({ ...state, floorSocPct: v }),
            'bank.floorSocPct',
            '%',
          )}
        </fieldset>

        <fieldset>
          <legend className="field-label text-base">Arrays</legend>
          <ul className="space-y-3">
            {state.arrays.map((a, i) => (
              <li
                key={i}
                className="grid grid-cols-2 gap-2 rounded-[12px] bg-sand p-3 sm:grid-cols-[minmax(0,1fr)_7rem_5.5rem_5.5rem_11rem_6.5rem_auto] sm:items-end"
              >
                <div className="col-span-2 sm:col-span-1">
                  <label htmlFor={`hand-arrays-${i}-name`} className="field-label">
                    Name
                  </label>
                  <input
                    id={`hand-arrays-${i}-name`}
                    className="field-input"
                    value={a.name}
                    onChange={(e) => setArray(i, { name: e.target.value })}
                  />
                </div>
                {field(
                  `hand-arrays-${i}-ratedWatts`,
                  'Watts',
                  a.ratedWatts,
                  (v) => setArray(i, { ratedWatts: v }),
                  `arrays.${i}.ratedWatts`,
                  'W',
                )}
                {field(`hand-arrays-${i}-tiltDeg`, 'Tilt', a.tiltDeg, (v) => setArray(i, { tiltDeg: v }), `arrays.${i}.tiltDeg`, '°')}
                {field(
                  `hand-arrays-${i}-azimuthDeg`,
                  'Facing',
                  a.azimuthDeg,
                  (v) => setArray(i, { azimuthDeg: v }),
                  `arrays.${i}.azimuthDeg`,
                  '°',
                )}
                <div>
                  <label htmlFor={`hand-arrays-${i}-aim`} className="field-label">
                    Aim
                  </label>
                  <select
                    id={`hand-arrays-${i}-aim`}
                    className="field-input"
                    value={a.aim}
                    onChange={(e) => setArray(i, { aim: e.target.value as ArrayRow['aim'] })}
                  >
                    <option value="fixed">Fixed</option>
                    <option value="follow">Aimed at the sun</option>
                  </select>
                </div>
                <div>
                  <label htmlFor={`hand-arrays-${i}-controller`} className="field-label">
                    Controller
                  </label>
                  <select
                    id={`hand-arrays-${i}-controller`}
                    className="field-input"
                    value={a.controller}
                    onChange={(e) => setArray(i, { controller: e.target.value as ArrayRow['controller'] })}
                  >
                    <option value="mppt">MPPT</option>
                    <option value="pwm">PWM</option>
                  </select>
                </div>
                <button
                  type="button"
                  className="btn btn-quiet text-sm"
                  onClick={() => setState({ ...state, arrays: state.arrays.filter((_, j) => j !== i) })}
                  aria-label={`Remove array ${a.name || i + 1}`}
                >
                  Remove
                </button>
              </li>
            ))}
          </ul>
          <button
            type="button"
            className="btn btn-quiet mt-2 text-sm"
            disabled={state.arrays.length >= 10}
            onClick={() =>
              setState({
                ...state,
                arrays: [
                  ...state.arrays,
                  {
                    name: `Array ${state.arrays.length + 1}`,
                    ratedWatts: '200',
                    tiltDeg: '0',
                    azimuthDeg: '180',
                    aim: 'fixed',
                    controller: 'mppt',
                  },
                ],
              })
            }
          >
            + Add an array
          </button>
        </fieldset>

        <fieldset className="grid gap-3 sm:grid-cols-2">
          <legend className="field-label text-base">Chargers</legend>
          {field('hand-dcdcAmps', 'DC-DC charger (0: none)', state.dcdcAmps, (v) => setState({ ...state, dcdcAmps: v }), 'dcdcAmps', 'A')}
          {field(
            'hand-shoreAmps',
            'Shore converter/charger (0: none)',
            state.shoreAmps,
            (v) => setState({ ...state, shoreAmps: v }),
            'shoreAmps',
            'A',
          )}
        </fieldset>

        <fieldset className="space-y-3">
          <legend className="field-label text-base">Generator</legend>
          <label className="flex items-center gap-2 font-semibold">
            <input
              type="checkbox"
              className="h-5 w-5 accent-ember"
              checked={state.generator !== null}
              onChange={(e) =>
                setState({
                  ...state,
                  generator: e.target.checked ? { amps: '30', startHour: '8', hoursPerDay: '4', marginPts: '10', stopPct: '90' } : null,
                })
              }
            />{' '}
            A generator in the plan
          </label>
          {state.generator ? (
            <div className="grid grid-cols-2 gap-3 sm:grid-cols-5">
              {field('hand-gen-amps', 'Converter/charger', state.generator.amps, (v) => setGen({ amps: v }), 'generator.amps', 'A')}
              {field(
                'hand-gen-startHour',
                'From (hour)',
                state.generator.startHour,
                (v) => setGen({ startHour: v }),
                'generator.startHour',
              )}
              {field(
                'hand-gen-hoursPerDay',
                'Hours a day, at most',
                state.generator.hoursPerDay,
                (v) => setGen({ hoursPerDay: v }),
                'generator.hoursPerDay',
                'h',
              )}
              {field(
                'hand-gen-marginPts',
                'Starts above the line by',
                state.generator.marginPts,
                (v) => setGen({ marginPts: v }),
                'generator.marginPts',
                'pts',
              )}
              {field('hand-gen-stopPct', 'Stops at', state.generator.stopPct, (v) => setGen({ stopPct: v }), 'generator.stopPct', '%')}
            </div>
          ) : null}
        </fieldset>

        <fieldset className="grid gap-3 sm:grid-cols-2">
          <legend className="field-label text-base">The rig’s limits (optional)</legend>
          {field(
            'hand-payloadKg',
            'Payload it may still carry',
            state.payloadKg,
            (v) => setState({ ...state, payloadKg: v }),
            'payloadKg',
            'kg',
          )}
          {field(
            'hand-batterySpaceL',
            'Room for batteries',
            state.batterySpaceL,
            (v) => setState({ ...state, batterySpaceL: v }),
            'batterySpaceL',
            'L',
          )}
        </fieldset>

        {issues
          .filter((i) => !i.path || i.path === '(root)')
          .map((i) => (
            <p key={i.message} role="alert" className="caution font-semibold text-alert">
              {i.message}
            </p>
          ))}
        {run.isError && !(run.error instanceof ApiError && run.error.status === 400) ? (
          <ErrorState error={run.error} title="This plan could not be run." />
        ) : null}
        {run.isError && run.error instanceof ApiError && run.error.status === 400 && issues.length === 0 ? (
          <p role="alert" className="caution font-semibold text-alert">
            {run.error.message}
          </p>
        ) : null}
        <div className="flex flex-wrap gap-3">
          <button type="submit" className="btn btn-primary" disabled={run.isPending}>
            {run.isPending ? 'Running…' : 'Run this plan'}
          </button>
          <button type="button" className="btn btn-quiet" onClick={() => setState(fallback)}>
            Back to the rig as it is
          </button>
        </div>
      </form>

      {r ? (
        <div role="status" aria-live="polite" className="space-y-2 rounded-[14px] bg-sand p-4" data-testid="after-plan-result">
          <p className="text-lg font-extrabold">
            {r.changesNothing
              ? 'This plan changes nothing'
              : r.after.passes
                ? 'This plan makes the trip'
                : r.after.firstCutoffAt
                  ? 'This plan still runs out'
                  : 'This plan stays above the cutoff but dips below the line'}
          </p>
          <p className="text-sm">
            <span className="font-bold">As it is:</span> {outcomeText(r.base)}
          </p>
          <p className="text-sm">
            <span className="font-bold">This plan:</span> {outcomeText(r.after)}
          </p>
          {r.generator ? (
            <p className="text-sm">
              Its generator starts below {formatNumber(r.generator.startSocPct, 1)} % (the {formatNumber(r.generator.linePct, 1)} % line +{' '}
              {formatNumber(r.generator.marginPts, 1)} points
              {r.generator.strandedPts > 0 ? ` + ${formatNumber(r.generator.strandedPts, 1)} points the cold strands` : ''}) and stops at{' '}
              {formatNumber(r.generator.stopSocPct, 1)} %.
            </p>
          ) : null}
          {r.weight ? (
            <p className={`text-sm ${r.weight.flagged ? 'font-bold text-alert' : ''}`}>
              Bank about {formatNumber(r.weight.kg, 1)} kg and {formatNumber(r.weight.litres)} L (common practice per kWh),{' '}
              {r.weight.addedKg >= 0 ? `${formatNumber(r.weight.addedKg, 1)} kg more` : `${formatNumber(-r.weight.addedKg, 1)} kg less`}{' '}
              than now.{r.weight.note ? ` ${r.weight.note}` : ''}
            </p>
          ) : null}
          <p className="caution text-sm">
            {CAUTIONS.wiring} {r.generator ? CAUTIONS.generator : ''} {CAUTIONS.estimate}
          </p>
          {!r.changesNothing ? (
            ranNow ? (
              <div className="flex flex-wrap items-center gap-3">
                <button type="button" className="btn btn-primary" disabled={propose.isPending} onClick={() => propose.mutate(ranNow)}>
                  {propose.isPending ? 'Drafting…' : 'Propose this plan'}
                </button>
                <span className="text-sm text-slate-text">A draft with its parts priced from your list; you edit it before sending.</span>
              </div>
            ) : (
              <p className="text-sm text-slate-text">You changed the plan since this run: run it again to propose it.</p>
            )
          ) : null}
          {propose.isError ? (
            propose.error instanceof ApiError && propose.error.status === 400 ? (
              <p role="alert" className="caution font-semibold text-alert">{propose.error.message}</p>
            ) : (
              <ErrorState error={propose.error} title="The proposal could not be drafted." />
            )
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
