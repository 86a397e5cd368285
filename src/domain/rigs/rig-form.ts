// The rig editor's form model: the shared rig schema plus the rules a form can check before the
// server does, and conversions between a saved rig and the form's values.
import type { z } from 'zod';
import { rigInputSchema, type RigDto } from './rigs.schema';
import type { Chemistry } from '../../engine/light';
import { presetBank } from './presets';

/** The shared rig schema with the generator rules of the engine checked in the form too. */
export const rigFormSchema = rigInputSchema.superRefine((rig, ctx) => {
  let generators = 0;
  (Array.isArray(rig.chargers) ? rig.chargers : []).forEach((c, i) => {
    if (!c || c.kind !== 'generator') return;
    generators += 1;
    if (generators > 1) ctx.addIssue({ code: 'custom', path: ['chargers', i, 'kind'], message: 'A rig has at most one generator. Remove this one or change its kind.' });
    if (typeof c.startSocPct === 'number' && typeof c.stopSocPct === 'number' && !(c.startSocPct < c.stopSocPct)) {
      ctx.addIssue({ code: 'custom', path: ['chargers', i, 'stopSocPct'], message: 'must be above the start level' });
    }
  });
  // Run even when another field is wrong, so every problem shows at once.
}, { when: () => true });

export type RigFormValues = z.input<typeof rigFormSchema>;
export type RigFormOutput = z.output<typeof rigFormSchema>;
type ArrayValues = NonNullable<RigFormValues['arrays']>[number];
type ChargerValues = NonNullable<RigFormValues['chargers']>[number];

/** A new rig: a LiFePO4 bank with its typical values, no capacity yet (the user must give it). */
export function emptyRig(chemistry: Chemistry = 'lifepo4'): RigFormValues {
  const p = presetBank(chemistry);
  return {
    name: '',
    bank: {
      chemistry,
      capacityAh: undefined as unknown as number,
      nominalVolts: p.nominalVolts,
      floorSocPct: p.floorSocPct,
      cutoffVolts: p.cutoffVolts,
      maxChargeAmps: undefined,
      peukertExponent: p.peukertExponent,
      chargeEfficiencyPct: p.chargeEfficiencyPct,
      internalResistanceMilliohm: p.internalResistanceMilliohm,
      initialSocPct: 100,
      insideHeatedSpace: false,
      selfHeating: false,
      location: 'outside',
      thermalHours: DEFAULT_THERMAL_HOURS,
    },
    arrays: [],
    chargers: [],
    inverter: null,
    payloadKg: null,
    batterySpaceL: null,
  };
}

/** A saved rig as form values; bank values the rig leaves to the engine's defaults are shown filled in. */
export function rigToForm(rig: RigDto): RigFormValues {
  const p = presetBank(rig.bank.chemistry, { capacityAh: rig.bank.capacityAh, nominalVolts: rig.bank.nominalVolts });
  return {
    name: rig.name,
    bank: {
      ...rig.bank,
      nominalVolts: rig.bank.nominalVolts ?? p.nominalVolts,
      floorSocPct: rig.bank.floorSocPct ?? p.floorSocPct,
      maxChargeAmps: rig.bank.maxChargeAmps ?? p.maxChargeAmps,
      peukertExponent: rig.bank.peukertExponent ?? p.peukertExponent,
      chargeEfficiencyPct: rig.bank.chargeEfficiencyPct ?? p.chargeEfficiencyPct,
      internalResistanceMilliohm: rig.bank.internalResistanceMilliohm ?? p.internalResistanceMilliohm,
      location: bankLocationOf(rig.bank),
      thermalHours: rig.bank.thermalHours ?? DEFAULT_THERMAL_HOURS,
    },
    // Every key present (optional ones as undefined): the form compares keys to tell whether it is dirty.
    arrays: rig.arrays.map((a) => ({ ...a, name: a.name, vmpVolts: a.vmpVolts, controllerMaxAmps: a.controllerMaxAmps ?? null })),
    chargers: rig.chargers.map((c) => ({ ...c })),
    inverter: rig.inverter ? { ...rig.inverter, continuousWatts: rig.inverter.continuousWatts ?? null, surgeWatts: rig.inverter.surgeWatts ?? null } : null,
    payloadKg: rig.payloadKg ?? null,
    batterySpaceL: rig.batterySpaceL ?? null,
  };
}

/** The battery's thermal lag the engine assumes, hours (a 20–30 kg battery in a box: common practice). */
export const DEFAULT_THERMAL_HOURS = 6;

/** Where a saved bank sits: its `location`, else the older `insideHeatedSpace` flag (as the engine reads them). */
export function bankLocationOf(bank: { location?: 'outside' | 'cabin'; insideHeatedSpace?: boolean }): 'outside' | 'cabin' {
  return bank.location ?? (bank.insideHeatedSpace ? 'cabin' : 'outside');
}

/** A bank as saved: `insideHeatedSpace` kept in step with `location`, so both readings agree. */
export function bankToSave<B extends { location?: 'outside' | 'cabin'; insideHeatedSpace?: boolean }>(bank: B): B {
  const location = bankLocationOf(bank);
  return { ...bank, location, insideHeatedSpace: location === 'cabin' };
}

/** A new inverter: the engine's efficiency and idle draw, ratings not given yet. */
export function newInverter() {
  return { efficiencyPct: 90, idleWatts: 12, alwaysOn: false, continuousWatts: null, surgeWatts: null };
}

/** Where the bank can sit, in words. */
export const BANK_LOCATION_CHOICES = [
  { value: 'outside', label: 'Outside box or bay', hint: 'A tongue box or an outside compartment: the battery follows the outdoor air, hours behind.' },
  { value: 'cabin', label: 'Inside the heated cabin', hint: 'Under a seat or bed: it stays near the furnace setpoint while the furnace has power.' },
] as const;

/** A new solar array of a given mounting, with the engine's defaults. */
export function newArray(kind: 'roof' | 'portable', index: number): ArrayValues {
  return {
    name: kind === 'portable' ? 'Portable panel' : index === 0 ? 'Roof' : `Roof ${index + 1}`,
    ratedWatts: undefined as unknown as number,
    tiltDeg: kind === 'portable' ? 30 : 0,
    azimuthDeg: 180,
    aim: kind === 'portable' ? 'follow' : 'fixed',
    controller: 'mppt',
    controllerMaxAmps: null,
    controllerEfficiencyPct: 97,
    shadePct: 0,
    lossesPct: 14,
    tempCoeffPctPerC: -0.4,
    nocC: 45,
    vmpVolts: undefined,
  };
}

/** A new charger of a kind, with the engine's defaults for the generator's levels and fuel. */
export function newCharger(kind: ChargerValues['kind']): ChargerValues {
  return { kind, amps: undefined as unknown as number, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.6 };
}

export const CHARGER_KINDS: Record<ChargerValues['kind'], { title: string; ampsLabel: string; hint: string }> = {
  alternator: {
    title: 'DC-DC charger (alternator, while driving)',
    ampsLabel: 'Charger output',
    hint: 'Its rated amps; common sizes 10–60 A. The trailer plug alone delivers little.',
  },
  shore: {
    title: 'Converter/charger on shore power',
    ampsLabel: 'Charger output',
    hint: 'Charges in every hour at a stop with hookup. Older converters may push only a few amps.',
  },
  generator: {
    title: 'Generator (through the converter/charger)',
    ampsLabel: 'Charging current while it runs',
    hint: 'The converter/charger, not the generator, sets how fast the bank charges.',
  },
};
