// An after-plan the installer edits by hand (bank, arrays, chargers, generator) and runs again
// against the saved forecast's trip: for the change no sweep option covers. Same judging as the
// sweep (the option's line, the one generator rule, the weight check).
import { z } from 'zod';
import {
  arraySchema,
  CHEMISTRIES,
  CHEMISTRY_DEFAULTS,
  prepareTrip,
  simulatePrepared,
  type ResolvedArray,
  type ResolvedCharger,
  type ResolvedPlan,
} from '../../engine';
import { generatorRule, type GeneratorRule } from '../advice/generator-rule';
import type { Changes } from './proposals.schema';
import { arrayFrom, bankFrom, lineFor, outcomeOf, sameOutcome, strandedOf, type Outcome } from './sweep';
import { bankWeight, type BankWeight } from './sweep-weight';

function num(what: string, min: number, max: number, unit = '') {
  const msg = `${what} must be a number from ${min} to ${max}${unit ? ` ${unit}` : ''}.`;
  return z.number({ error: msg }).min(min, { error: msg }).max(max, { error: msg });
}

/** One array of the hand-edited plan. */
export const handArraySchema = z.object({
  name: z
    .string({ error: 'An array’s name must be text.' })
    .trim()
    .min(1, { error: 'Give each array a name.' })
    .max(80, { error: 'An array’s name can be at most 80 characters.' }),
  ratedWatts: num('Panel watts', 1, 100_000, 'W'),
  tiltDeg: num('Tilt', 0, 90, '°'),
  azimuthDeg: num('Facing (azimuth)', 0, 360, '°'),
  aim: z.enum(['fixed', 'follow'], { error: 'An array is fixed or aimed at the sun.' }),
  controller: z.enum(['mppt', 'pwm'], { error: 'The controller is MPPT or PWM.' }),
});

/** The after-plan, as the installer types it. */
export const handPlanSchema = z
  .object({
    bank: z.object({
      chemistry: z.enum(CHEMISTRIES, { error: 'The chemistry is LiFePO4, AGM, flooded or gel.' }),
      capacityAh: num('The bank’s capacity', 1, 20_000, 'Ah'),
      floorSocPct: num('The bank’s floor', 0, 95, '%'),
    }),
    arrays: z.array(handArraySchema).max(10, { error: 'At most 10 arrays.' }),
    /** DC-DC charging from the alternator, A (0: none). */
    dcdcAmps: num('The DC-DC charger', 0, 500, 'A'),
    /** The converter/charger on shore power, A (0: none). */
    shoreAmps: num('The shore charger', 0, 500, 'A'),
    generator: z
      .object({
        amps: num('The generator’s converter/charger', 1, 300, 'A'),
        startHour: num('The generator’s first hour', 0, 23).int({ error: 'The generator’s first hour is a whole hour, 0 to 23.' }),
        hoursPerDay: num('Generator hours', 1, 24, 'a day').int({ error: 'Generator hours are whole hours a day.' }),
        marginPts: num('The generator’s margin', 0, 90, 'points'),
        stopPct: num('The generator’s stop level', 10, 100, '%'),
      })
      .nullable(),
    payloadKg: num('The rig’s payload', 1, 20_000, 'kg').nullable().default(null),
    batterySpaceL: num('The battery space', 1, 5_000, 'L').nullable().default(null),
  })
  .superRefine((p, ctx) => {
    if (p.generator && p.generator.startHour + p.generator.hoursPerDay > 24)
      ctx.addIssue({
        code: 'custom',
        path: ['generator', 'hoursPerDay'],
        message: 'The generator’s hours run past midnight: start earlier or run fewer hours.',
      });
  });
export type HandPlan = z.output<typeof handPlanSchema>;
export type HandPlanInput = z.input<typeof handPlanSchema>;

/** What a hand-edited plan does, against the plan as it is. */
export interface HandPlanResult {
  base: Outcome;
  after: Outcome;
  changesNothing: boolean;
  generator: GeneratorRule | null;
  weight: BankWeight | null;
}

/** The hand edit that reproduces a plan as it is (the editor's starting point). */
export function handPlanOf(plan: ResolvedPlan): HandPlan {
  const gen = plan.chargers.find((c) => c.kind === 'generator');
  const window = plan.stops.find((s) => s.hookup === 'none')?.generatorHours ?? [8, 20];
  return {
    bank: { chemistry: plan.bank.chemistry, capacityAh: plan.bank.capacityAh, floorSocPct: plan.bank.floorSocPct },
    arrays: plan.arrays.map((a) => ({
      name: a.name,
      ratedWatts: a.ratedWatts,
      tiltDeg: a.tiltDeg,
      azimuthDeg: a.azimuthDeg,
      aim: a.aim,
      controller: a.controller,
    })),
    dcdcAmps: plan.chargers.filter((c) => c.kind === 'alternator').reduce((t, c) => t + c.amps, 0),
    shoreAmps: plan.chargers.filter((c) => c.kind === 'shore').reduce((t, c) => t + c.amps, 0),
    generator: gen
      ? { amps: gen.amps, startHour: window[0], hoursPerDay: window[1] - window[0], marginPts: 10, stopPct: Math.round(gen.stopSocPct) }
      : null,
    payloadKg: null,
    batterySpaceL: null,
  };
}

/** The plan a hand edit makes, and its generator rule (which needs a run of the plan without it). */
export function handPlanApplied(
  plan: ResolvedPlan,
  edit: HandPlan,
  reserveSocPct: number | null,
): { plan: ResolvedPlan; rule: GeneratorRule | null } {
  const sameBank =
    edit.bank.chemistry === plan.bank.chemistry &&
    edit.bank.capacityAh === plan.bank.capacityAh &&
    edit.bank.floorSocPct === plan.bank.floorSocPct;
  const bank = sameBank ? plan.bank : bankFrom(plan.bank, edit.bank);
  const arrays: ResolvedArray[] = edit.arrays.map((a, i) => {
    const old = plan.arrays.find((x) => x.name === a.name) ?? plan.arrays[i];
    const base = old ?? { ...arraySchema.parse({ ratedWatts: a.ratedWatts }), name: a.name };
    return { ...base, ...a };
  });
  const fixed: ResolvedCharger[] = [];
  if (edit.dcdcAmps > 0) fixed.push({ kind: 'alternator', amps: edit.dcdcAmps, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 });
  if (edit.shoreAmps > 0) fixed.push({ kind: 'shore', amps: edit.shoreAmps, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 });
  const withoutGen: ResolvedPlan = { ...plan, bank, arrays, chargers: fixed };
  if (!edit.generator) return { plan: withoutGen, rule: null };
  const g = edit.generator;
  const window: [number, number] = [g.startHour, g.startHour + g.hoursPerDay];
  const stops = plan.stops.map((s) => (s.hookup === 'none' ? { ...s, generatorHours: window } : s));
  const stranded = strandedOf(simulatePrepared(prepareTrip({ ...withoutGen, stops })));
  const rule = generatorRule({
    floorSocPct: lineFor(plan.bank, bank, reserveSocPct),
    marginPts: g.marginPts,
    stopSocPct: g.stopPct,
    strandedPts: stranded,
  });
  const fuel = plan.chargers.find((c) => c.kind === 'generator')?.fuelLitresPerHour ?? 0.6;
  return {
    plan: {
      ...withoutGen,
      stops,
      chargers: [
        ...fixed,
        { kind: 'generator', amps: g.amps, startSocPct: rule.startSocPct, stopSocPct: rule.stopSocPct, fuelLitresPerHour: fuel },
      ],
    },
    rule,
  };
}

/** Runs a hand-edited after-plan and judges it as the sweep judges an option. */
export function runHandPlan(input: { plan: ResolvedPlan; reserveSocPct: number | null; edit: HandPlan }): HandPlanResult {
  const { plan, reserveSocPct, edit } = input;
  const basePrepared = prepareTrip(plan);
  const base = outcomeOf(basePrepared, simulatePrepared(basePrepared), lineFor(plan.bank, plan.bank, reserveSocPct));
  const applied = handPlanApplied(plan, edit, reserveSocPct);
  const prepared = prepareTrip(applied.plan);
  const after = outcomeOf(prepared, simulatePrepared(prepared), lineFor(plan.bank, applied.plan.bank, reserveSocPct));
  const changedBank = applied.plan.bank !== plan.bank;
  return {
    base,
    after,
    changesNothing: sameOutcome(after, base),
    generator: applied.rule,
    weight: changedBank ? bankWeight(applied.plan.bank, plan.bank, { payloadKg: edit.payloadKg, batterySpaceL: edit.batterySpaceL }) : null,
  };
}

/** The hand edit a sweep option makes (the editor's starting point when the installer picks "Edit by hand"). */
export function handPlanFromOption(
  plan: ResolvedPlan,
  c: Changes,
  limits: { payloadKg: number | null; batterySpaceL: number | null },
): HandPlan {
  const now = handPlanOf(plan);
  const sameChem = c.bank?.chemistry === plan.bank.chemistry;
  const added = c.panel ? arrayFrom(plan, c.panel) : null;
  const gen = plan.chargers.find((x) => x.kind === 'generator');
  return {
    ...now,
    bank: c.bank
      ? {
          chemistry: c.bank.chemistry,
          capacityAh: c.bank.capacityAh,
          floorSocPct: c.bank.floorSocPct ?? (sameChem ? plan.bank.floorSocPct : CHEMISTRY_DEFAULTS[c.bank.chemistry].floorSocPct),
        }
      : now.bank,
    arrays: added
      ? [
          ...now.arrays,
          {
            name: added.name,
            ratedWatts: added.ratedWatts,
            tiltDeg: added.tiltDeg,
            azimuthDeg: added.azimuthDeg,
            aim: added.aim,
            controller: added.controller,
          },
        ]
      : now.arrays,
    dcdcAmps: c.dcdcAmps ?? now.dcdcAmps,
    generator:
      c.generatorHours !== null
        ? {
            amps: gen?.amps ?? c.generatorAmps,
            startHour: c.generatorStartHour,
            hoursPerDay: c.generatorHours,
            marginPts: c.generatorMarginPts,
            stopPct: c.generatorStopPct,
          }
        : now.generator,
    ...limits,
  };
}
