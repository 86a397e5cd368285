// The trip planner's form model: the shared trip schema, plus the itinerary rules the form can
// check before the server does (stops in order, high above low; drives through the trip schema), and
// the small date helpers the planner needs. Pure and unit-tested.
import type { z } from 'zod';
import { tripInputSchema, type TripDto } from './trips.schema';
import { addDaysIso, formatDate } from '../../lib/format';

const ISO = /^\d{4}-\d{2}-\d{2}$/;
const isDate = (s: unknown): s is string => typeof s === 'string' && ISO.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`));
const dayNo = (s: string) => Math.round(Date.parse(`${s}T00:00:00Z`) / 86_400_000);

/** The shared trip schema with the itinerary rules checked in the form too. */
export const tripFormSchema = tripInputSchema.superRefine((trip, ctx) => {
  const stops = (Array.isArray(trip.stops) ? trip.stops : []).filter((s) => s && typeof s === 'object');
  const add = (path: (string | number)[], message: string) => ctx.addIssue({ code: 'custom', path, message });
  stops.forEach((s, i) => {
    if (Array.isArray(s.generatorHours) && !(s.generatorHours[0] < s.generatorHours[1])) add(['stops', i, 'generatorHours'], 'Generator hours must start before they stop.');
    (s.weather ?? []).forEach((w, j) => {
      if (typeof w.highC === 'number' && typeof w.lowC === 'number' && w.highC < w.lowC) add(['stops', i, 'weather', j, 'lowC'], 'must not be above the high');
    });
    const prev = stops[i - 1];
    if (!prev) return;
    if (!isDate(s.arrive) || !isDate(prev.arrive) || !Number.isInteger(prev.nights)) return;
    const leaves = dayNo(prev.arrive) + prev.nights;
    if (dayNo(s.arrive) <= dayNo(prev.arrive)) add(['stops', i, 'arrive'], 'must be after the stop before: stops go in the order you travel.');
    else if (dayNo(s.arrive) < leaves) add(['stops', i, 'arrive'], `overlaps the stop before, which you leave on ${formatDate(addDaysIso(prev.arrive, prev.nights))}.`);
  });
  // Where drives may lie (inside the trip, ending by the next arrival, not overlapping) is the trip
  // schema's own rule (drives.ts), so the form and the API give the same words.
  // Run even when some other field is wrong, so every problem shows at once (each rule guards its own inputs).
}, { when: () => true });

export type TripFormValues = z.input<typeof tripFormSchema>;
export type TripFormOutput = z.output<typeof tripFormSchema>;
type StopValues = TripFormValues['stops'][number];

/** First arrival to the last departure day, when the stops' dates are readable. */
export function tripSpan(stops: readonly { arrive?: unknown; nights?: unknown }[]): { from: string; to: string; nights: number } | null {
  const first = stops[0];
  const last = stops.at(-1);
  if (!first || !last) return null;
  if (!isDate(first.arrive) || !isDate(last.arrive) || typeof last.nights !== 'number' || !Number.isInteger(last.nights)) return null;
  const to = addDaysIso(last.arrive, last.nights);
  return { from: first.arrive, to, nights: dayNo(to) - dayNo(first.arrive) };
}

/** The days a stop's weather covers: arrival day through departure morning. */
export function stopDays(arrive: unknown, nights: unknown): string[] {
  if (!isDate(arrive) || typeof nights !== 'number' || !Number.isInteger(nights) || nights < 1 || nights > 60) return [];
  return Array.from({ length: nights + 1 }, (_, i) => addDaysIso(arrive, i));
}

/** A new stop; its arrival follows the stop before (the day it leaves) when there is one. */
export function newStop(prev?: { arrive?: unknown; nights?: unknown }): StopValues {
  const arrive = prev && isDate(prev.arrive) && typeof prev.nights === 'number' && Number.isInteger(prev.nights) ? addDaysIso(prev.arrive, prev.nights) : '';
  return {
    name: '',
    lat: undefined as unknown as number,
    lon: undefined as unknown as number,
    timeZone: '',
    arrive,
    nights: 2,
    arriveHour: 15,
    shadePct: 0,
    hookup: 'none',
    generatorHours: [8, 20],
    weather: [],
  };
}

/** A drive on the day the travellers leave stop `afterStop` (or empty), 10:00 for 3 hours. */
export function newDrive(stops: readonly { arrive?: unknown; nights?: unknown }[], afterStop = 0) {
  const s = stops[afterStop];
  const date = s && isDate(s.arrive) && typeof s.nights === 'number' && Number.isInteger(s.nights) ? addDaysIso(s.arrive, s.nights) : '';
  return { date, startHour: 10, hours: 3 };
}

/** A new trip on a rig. */
export function emptyTrip(rigId = ''): TripFormValues {
  return { rigId, name: '', stops: [newStop()], drives: [], reserveSocPct: null };
}

/** A saved trip as form values. */
export function tripToForm(t: TripDto): TripFormValues {
  return {
    rigId: t.rigId,
    name: t.name,
    stops: t.stops.map((s) => ({ ...s, generatorHours: [...s.generatorHours] as [number, number], weather: s.weather.map((w) => ({ ...w })) })),
    drives: t.drives.map((d) => ({ ...d })),
    reserveSocPct: t.reserveSocPct,
  };
}

/** "Thu 21 Oct – Tue 26 Oct 2027 · 5 nights" for a saved trip. */
export function describeSpan(stops: readonly { arrive: string; nights: number }[]): string {
  const span = tripSpan(stops);
  if (!span) return '';
  const sameYear = span.from.slice(0, 4) === span.to.slice(0, 4);
  return `${formatDate(span.from, !sameYear)} – ${formatDate(span.to)} · ${span.nights} ${span.nights === 1 ? 'night' : 'nights'}`;
}
