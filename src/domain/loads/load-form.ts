// The load editor's form model: the shared load schema with the schedule typed as text
// ("18-23; 6-8") and read into hour pairs, so a bad schedule gets its message by the field.
import { z } from 'zod';
import { loadInputSchema, type LoadDto, type LoadInput } from './loads.schema';
import { ALL_DAY, parseWindows, windowsToText } from './windows';

const windowsText = z.string().transform((text, ctx) => {
  const r = parseWindows(text);
  if (!r.ok) {
    ctx.addIssue({ code: 'custom', message: r.message });
    return z.NEVER;
  }
  return r.windows;
});

export const loadFormSchema = loadInputSchema.extend({ windows: windowsText }).transform((l) =>
  // Standby (parasitic) draw runs every hour of every day, whatever the other fields say.
  l.standby ? { ...l, windows: ALL_DAY, dutyPct: 100, days: 'all' as const } : l,
);

export type LoadFormValues = z.input<typeof loadFormSchema>;
export type LoadFormOutput = z.output<typeof loadFormSchema>;

/** A load (saved, or about to be added) as form values. */
export function loadToForm(l: LoadDto | LoadInput): LoadFormValues {
  return {
    name: l.name ?? '',
    watts: l.watts,
    quantity: l.quantity ?? 1,
    supply: l.supply ?? 'dc',
    windows: windowsToText(l.windows ?? ALL_DAY),
    dutyPct: l.dutyPct ?? 100,
    days: l.days ?? 'all',
    response: l.response ?? 'none',
    setpointC: l.setpointC ?? 18,
    standby: l.standby ?? false,
    note: l.note ?? '',
  };
}

/** A blank load for "Add a load". */
export function blankLoad(): LoadFormValues {
  return { name: '', watts: undefined as unknown as number, quantity: 1, supply: 'dc', windows: 'all day', dutyPct: 100, days: 'all', response: 'none', setpointC: 18, standby: false, note: '' };
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
  { key: 'setpointC', label: 'Setpoint °C' },
  { key: 'standby', label: 'Standby' },
  { key: 'note', label: 'Note' },
];
