// The load editor's form model: the shared load schema with the schedule typed as text
// ("18-23; 6-8") and read into hour pairs, so a bad schedule gets its message by the field; the
// draw typed in watts or in amps (at the bank's nominal volts for DC, at 120 or 230 V for AC),
// always saved as watts.
import { z } from 'zod';
import { loadInputSchema, type LoadDto, type LoadInput } from './loads.schema';
import { ALL_DAY, parseWindows, windowsToText } from './windows';
import { AC_VOLTS, DRAW_UNITS, ampsToWatts, drawVolts, roundWatts, type AcVolts } from './draw';

/** The largest draw a load may have, W (the engine's limit). */
export const MAX_LOAD_WATTS = 100_000;

const windowsText = z.string().transform((text, ctx) => {
  const r = parseWindows(text);
  if (!r.ok) {
    ctx.addIssue({ code: 'custom', message: r.message });
    return z.NEVER;
  }
  return r.windows;
});

const optionalNumber = z.number({ error: 'must be a number' }).optional();

/**
 * The load form for a rig whose bank has `nominalVolts`: amps typed for a DC load are amps at
 * those volts. The draw in use (watts or amps) is checked by its own field; the output carries
 * watts only, as the load is stored.
 */
export function loadFormSchemaFor(nominalVolts: number) {
  return loadInputSchema
    .extend({
      windows: windowsText,
      watts: optionalNumber,
      drawUnit: z.enum(DRAW_UNITS, { error: 'must be W or A' }).default('W'),
      amps: optionalNumber,
      acVolts: z.union([z.literal(AC_VOLTS[0]), z.literal(AC_VOLTS[1])], { error: `must be ${AC_VOLTS.join(' or ')}` }).default(120),
    })
    .superRefine((l, ctx) => {
      const byAmps = l.drawUnit === 'A';
      const key = byAmps ? 'amps' : 'watts';
      const value = byAmps ? l.amps : l.watts;
      const max = byAmps ? MAX_LOAD_WATTS / drawVolts(l.supply, nominalVolts, l.acVolts) : MAX_LOAD_WATTS;
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        ctx.addIssue({ code: 'custom', path: [key], message: byAmps ? 'Give the amps it draws (a number).' : 'must be a number' });
      } else if (value < 0) {
        ctx.addIssue({ code: 'custom', path: [key], message: 'must be at least 0' });
      } else if (value > max) {
        ctx.addIssue({ code: 'custom', path: [key], message: byAmps ? `must be at most ${Math.floor(max)} A at ${drawVolts(l.supply, nominalVolts, l.acVolts)} V` : `must be at most ${MAX_LOAD_WATTS}` });
      }
    }, { when: () => true })
    .transform(({ drawUnit, amps, acVolts, watts, ...l }) => {
      const w = drawUnit === 'A' ? roundWatts(ampsToWatts(amps ?? 0, l.supply, nominalVolts, acVolts)) : (watts ?? 0);
      const out = { ...l, watts: w };
      // Standby (parasitic) draw runs every hour of every day, whatever the other fields say.
      return out.standby ? { ...out, windows: ALL_DAY, dutyPct: 100, days: 'all' as const } : out;
    });
}

/** The load form with draws typed in watts (amps are read at 12.8 V: use `loadFormSchemaFor` with the rig's volts). */
export const loadFormSchema = loadFormSchemaFor(12.8);

export type LoadFormValues = z.input<ReturnType<typeof loadFormSchemaFor>>;
export type LoadFormOutput = z.output<ReturnType<typeof loadFormSchemaFor>>;

/** A load (saved, or about to be added) as form values, its draw in watts. */
export function loadToForm(l: LoadDto | LoadInput, acVolts: AcVolts = 120): LoadFormValues {
  return {
    name: l.name ?? '',
    watts: l.watts,
    drawUnit: 'W',
    amps: undefined,
    acVolts,
    quantity: l.quantity ?? 1,
    supply: l.supply ?? 'dc',
    windows: windowsToText(l.windows ?? ALL_DAY),
    dutyPct: l.dutyPct ?? 100,
    days: l.days ?? 'all',
    response: l.response ?? 'none',
    setpointC: l.setpointC ?? 18,
    location: l.location ?? 'cabin',
    surgeWatts: l.surgeWatts ?? null,
    standby: l.standby ?? false,
    note: l.note ?? '',
  };
}

/** A blank load for "Add a load". */
export function blankLoad(acVolts: AcVolts = 120): LoadFormValues {
  return {
    name: '', watts: undefined, drawUnit: 'W', amps: undefined, acVolts, quantity: 1, supply: 'dc', windows: 'all day', dutyPct: 100, days: 'all',
    response: 'none', setpointC: 18, location: 'cabin', surgeWatts: null, standby: false, note: '',
  };
}

/** The fields of a load that can differ between two versions, with how to show them. */
export const LOAD_FIELDS: { key: keyof LoadInput; label: string }[] = [
  { key: 'name', label: 'Name' },
  { key: 'watts', label: 'Watts' },
  { key: 'quantity', label: 'Quantity' },
  { key: 'supply', label: 'Supply' },
  { key: 'windows', label: 'Schedule' },
  { key: 'dutyPct', label: 'Duty %' },
  { key: 'days', label: 'Days' },
  { key: 'response', label: 'Temperature response' },
  { key: 'setpointC', label: 'Setpoint' }, // the value shows with its unit (°C or °F)
  { key: 'location', label: 'Where it sits' },
  { key: 'surgeWatts', label: 'Surge watts' },
  { key: 'standby', label: 'Standby' },
  { key: 'note', label: 'Note' },
];

/** Where a load sits, in words. */
export const LOAD_LOCATION_LABELS = { cabin: 'In the cabin', outside: 'Outside (bay, tongue, roof)' } as const;
