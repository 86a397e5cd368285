// The quick plan: a short form on the landing page, turned into an engine plan (pure, no React).
import { z } from 'zod';
import type { Plan } from '../../engine';
import { isValidTimeZone } from '../../engine/light';
import type { LoadInput } from '../../domain/loads/loads.schema';
import type { RigInput } from '../../domain/rigs/rigs.schema';
import type { TripInput } from '../../domain/trips/trips.schema';
import { SKY_CHOICES } from '../../domain/trips/trips.schema';
import { typicalLoad } from '../../domain/loads/typical';

// ---------------------------------------------------------------------------------------------
// Choices

/** Bank presets: chemistry and the engine's chemistry defaults (floor, charge rate, Peukert) do the rest. */
export const BANK_PRESETS = [
  { value: 'lifepo4', label: 'LiFePO4 (lithium)', hint: '12.8 V; usable down to about 10 %' },
  { value: 'agm', label: 'AGM', hint: '12 V; keep above about 50 %' },
  { value: 'flooded', label: 'Flooded lead-acid', hint: '12 V; keep above about 50 %' },
] as const;
export type BankPreset = (typeof BANK_PRESETS)[number]['value'];

export const MOUNTINGS = [
  { value: 'flat', label: 'Flat on the roof' },
  { value: 'tilted', label: 'Tilted toward the sun' },
  { value: 'portable', label: 'Portable, re-aimed through the day' },
] as const;
export type Mounting = (typeof MOUNTINGS)[number]['value'];

/** The engine load of a typical figure (./domain/loads/typical.ts), named as the quick plan names it. */
function typicalAsLoad(id: string, name: string) {
  const t = typicalLoad(id);
  return {
    name,
    watts: t.watts,
    ...(t.quantity !== undefined && t.quantity !== 1 ? { quantity: t.quantity } : {}),
    ...(t.supply === 'ac' ? { supply: 'ac' as const } : {}),
    windows: t.windows.map(([a, b]) => [a, b] as [number, number]),
    dutyPct: t.dutyPct,
    ...(t.response && t.response !== 'none' ? { response: t.response, setpointC: t.setpointC ?? 18 } : {}),
  };
}

/**
 * Common loads, each one of the typical figures the load catalogue also uses (labelled "typical" on
 * screen, with the figure's own line: the camper checks the appliance's label).
 */
export const LOAD_CATALOGUE = (
  [
    { id: 'fridge', typicalId: 'compressor-fridge', label: '12 V compressor fridge', name: 'Compressor fridge' },
    { id: 'lights', typicalId: 'led-lights', label: 'LED lights', name: 'LED lights' },
    { id: 'pump', typicalId: 'water-pump', label: 'Water pump', name: 'Water pump' },
    { id: 'furnace', typicalId: 'furnace-blower', label: 'Furnace blower', name: 'Furnace blower' },
    { id: 'cpap', typicalId: 'cpap-dry', label: 'CPAP (no humidifier)', name: 'CPAP' },
    { id: 'phones', typicalId: 'phone', label: 'Phones charging', name: 'Phones' },
    { id: 'laptop', typicalId: 'laptop', label: 'Laptop via inverter', name: 'Laptop (via inverter)' },
    { id: 'parasitic', typicalId: 'standby', label: 'Parasitic draw', name: 'Parasitic draw' },
  ] as const
).map((l) => ({ id: l.id, typicalId: l.typicalId, label: l.label, typical: afterColon(typicalLoad(l.typicalId).about), load: typicalAsLoad(l.typicalId, l.name) }));

/** The catalogue's line as it reads after "Typical:" (a leading "About" in lower case). */
function afterColon(about: string): string {
  return /^[A-Z][a-z]/.test(about) ? about.charAt(0).toLowerCase() + about.slice(1) : about;
}
export type LoadId = (typeof LOAD_CATALOGUE)[number]['id'];
const LOAD_IDS = LOAD_CATALOGUE.map((l) => l.id) as [LoadId, ...LoadId[]];

/** A short list of zones for when the place search and the zone lookup are not available. */
export const COMMON_ZONES = [
  'America/Anchorage',
  'America/Los_Angeles',
  'America/Phoenix',
  'America/Denver',
  'America/Chicago',
  'America/New_York',
  'America/Halifax',
  'America/Vancouver',
  'America/Edmonton',
  'America/Toronto',
  'Europe/London',
  'Europe/Paris',
  'Europe/Berlin',
  'Africa/Johannesburg',
  'Australia/Perth',
  'Australia/Adelaide',
  'Australia/Brisbane',
  'Australia/Sydney',
  'Pacific/Auckland',
] as const;

export { SKY_CHOICES };

// ---------------------------------------------------------------------------------------------
// Form

const number = (message: string) => z.number({ error: message });

/** The quick plan's form values, checked in the browser before anything is sent. */
export const quickPlanFormSchema = z
  .object({
    chemistry: z.enum(['lifepo4', 'agm', 'flooded'], { error: 'Choose the bank’s chemistry.' }),
    capacityAh: number('Enter the bank’s size in Ah, for example 100.')
      .gt(0, { error: 'Enter a size above 0 Ah.' })
      .max(20_000, { error: 'Enter at most 20,000 Ah.' }),
    panelWatts: number('Enter the panels’ total watts (0 if you have none).')
      .min(0, { error: 'Enter 0 or more watts.' })
      .max(100_000, { error: 'Enter at most 100,000 W.' }),
    mounting: z.enum(['flat', 'tilted', 'portable'], { error: 'Choose how the panels are mounted.' }),
    shadePct: number('Enter the shade at camp as a percentage (0 for open sky).')
      .min(0, { error: 'Enter a shade from 0 to 100 %.' })
      .max(100, { error: 'Enter a shade from 0 to 100 %.' }),
    loads: z.array(z.enum(LOAD_IDS)),
    placeName: z.string().trim().min(1, { error: 'Name the place, or search for it.' }).max(100, { error: 'Use at most 100 characters.' }),
    lat: number('Enter the latitude, between -90 and 90.').min(-90, { error: 'Enter a latitude between -90 and 90.' }).max(90, { error: 'Enter a latitude between -90 and 90.' }),
    lon: number('Enter the longitude, between -180 and 180.').min(-180, { error: 'Enter a longitude between -180 and 180.' }).max(180, { error: 'Enter a longitude between -180 and 180.' }),
    timeZone: z.string().refine(isValidTimeZone, { error: 'Choose the place’s time zone.' }),
    arrive: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Choose the day you arrive.' })
      .refine((s) => {
        const y = Number(s.slice(0, 4));
        const d = new Date(`${s}T00:00:00Z`);
        return y >= 1950 && y <= 2150 && !Number.isNaN(d.getTime()) && d.toISOString().startsWith(s);
      }, { error: 'Choose a real date.' }),
    nights: number('Enter how many nights, 1 to 60.')
      .int({ error: 'Enter a whole number of nights.' })
      .min(1, { error: 'Enter at least 1 night.' })
      .max(60, { error: 'Enter at most 60 nights.' }),
    cloudOktas: number('Choose the expected sky.').min(0).max(8),
    tempUnit: z.enum(['C', 'F']),
    high: number('Enter the expected daytime high.'),
    low: number('Enter the expected overnight low.'),
  })
  .superRefine((v, ctx) => {
    const hi = toCelsius(v.high, v.tempUnit);
    const lo = toCelsius(v.low, v.tempUnit);
    const range = v.tempUnit === 'C' ? '-60 to 60 °C' : '-76 to 140 °F';
    if (hi < -60 || hi > 60) ctx.addIssue({ code: 'custom', path: ['high'], message: `Enter a high from ${range}.` });
    if (lo < -60 || lo > 60) ctx.addIssue({ code: 'custom', path: ['low'], message: `Enter a low from ${range}.` });
    if (hi < lo) ctx.addIssue({ code: 'custom', path: ['low'], message: 'The low must not be above the high.' });
  });

export type QuickPlanForm = z.infer<typeof quickPlanFormSchema>;
export type QuickPlanField = keyof QuickPlanForm;

/** °F → °C (the engine works in °C); °C passes through. */
export function toCelsius(t: number, unit: 'C' | 'F'): number {
  return unit === 'F' ? ((t - 32) * 5) / 9 : t;
}

function round1(x: number): number {
  return Math.round(x * 10) / 10;
}

/** Default form values: a week from `today` (YYYY-MM-DD), three nights, a small LiFePO4 van. */
export function defaultQuickPlan(today: string): QuickPlanForm {
  const d = new Date(`${today}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 7);
  return {
    chemistry: 'lifepo4',
    capacityAh: 100,
    panelWatts: 200,
    mounting: 'flat',
    shadePct: 0,
    loads: ['fridge', 'lights', 'pump', 'phones', 'parasitic'],
    placeName: 'Your camp',
    lat: 38.6,
    lon: -109.6,
    timeZone: 'America/Denver',
    arrive: d.toISOString().slice(0, 10),
    nights: 3,
    cloudOktas: 2,
    tempUnit: 'C',
    high: 22,
    low: 6,
  };
}

/** The panels' tilt and aim for a mounting: a fixed tilt near the latitude, facing the equator. */
export function mountingGeometry(mounting: Mounting, lat: number): { tiltDeg: number; azimuthDeg: number; aim: 'fixed' | 'follow' } {
  if (mounting === 'flat') return { tiltDeg: 0, azimuthDeg: 180, aim: 'fixed' };
  const tilt = Math.min(60, Math.max(10, Math.round(Math.abs(lat))));
  if (mounting === 'portable') return { tiltDeg: tilt, azimuthDeg: lat >= 0 ? 180 : 0, aim: 'follow' };
  return { tiltDeg: tilt, azimuthDeg: lat >= 0 ? 180 : 0, aim: 'fixed' };
}

/** Builds the engine plan of a quick plan: one stop, the chosen loads, the same expected weather every day. */
export function buildQuickPlan(v: QuickPlanForm): Plan {
  const geometry = mountingGeometry(v.mounting, v.lat);
  const chosen = new Set(v.loads);
  return {
    bank: { chemistry: v.chemistry, capacityAh: v.capacityAh, initialSocPct: 100 },
    arrays:
      v.panelWatts > 0
        ? [{ name: `Panels (${MOUNTINGS.find((m) => m.value === v.mounting)?.label.toLowerCase() ?? v.mounting})`, ratedWatts: v.panelWatts, ...geometry, controller: 'mppt' }]
        : [],
    chargers: [],
    inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false },
    loads: LOAD_CATALOGUE.filter((l) => chosen.has(l.id)).map((l) => structuredClone({ ...l.load }) as NonNullable<Plan['loads']>[number]),
    stops: [
      {
        name: v.placeName.trim(),
        lat: v.lat,
        lon: v.lon,
        timeZone: v.timeZone,
        arrive: v.arrive,
        nights: v.nights,
        arriveHour: 15,
        shadePct: v.shadePct,
        // One day's weather: the engine gives every other day the nearest given day.
        weather: [{ date: v.arrive, cloudOktas: v.cloudOktas, highC: round1(toCelsius(v.high, v.tempUnit)), lowC: round1(toCelsius(v.low, v.tempUnit)) }],
      },
    ],
    drives: [],
  };
}

// ---------------------------------------------------------------------------------------------
// API issues → fields

/**
 * The form field an API issue path belongs to (`bank.capacityAh` → `capacityAh`), or null when it
 * belongs to no single field and is shown above the form.
 */
export function fieldForIssue(path: string): QuickPlanField | null {
  const p = path.split('.');
  if (p[0] === 'bank') return p[1] === 'capacityAh' ? 'capacityAh' : 'chemistry';
  if (p[0] === 'arrays') {
    if (p[2] === 'ratedWatts') return 'panelWatts';
    if (p[2] === 'shadePct') return 'shadePct';
    return 'mounting';
  }
  if (p[0] === 'loads') return 'loads';
  if (p[0] === 'stops') {
    const f = p[2];
    if (f === 'weather') {
      const w = p[4];
      if (w === 'highC') return 'high';
      if (w === 'lowC') return 'low';
      if (w === 'cloudOktas') return 'cloudOktas';
      return 'arrive';
    }
    const map: Record<string, QuickPlanField> = {
      name: 'placeName',
      lat: 'lat',
      lon: 'lon',
      timeZone: 'timeZone',
      arrive: 'arrive',
      nights: 'nights',
      arriveHour: 'arrive',
      shadePct: 'shadePct',
    };
    return f === undefined ? null : (map[f] ?? null);
  }
  return null;
}

// ---------------------------------------------------------------------------------------------
// Keeping the plan after sign-up

/** sessionStorage key under which "Keep this plan" leaves the quick plan for the rig pages. */
export const QUICK_PLAN_STORAGE_KEY = 'sunreckon.quickPlan';

/** Where "Keep this plan" sends the visitor: sign up, then the rigs page picks the plan up. */
export const KEEP_PLAN_URL = `/sign-up?next=${encodeURIComponent('/keep-plan')}`;

/** The stored quick plan, or null (nothing stored, storage blocked, or not JSON). */
export function readStoredQuickPlan(storage: Pick<Storage, 'getItem'> | undefined = typeof sessionStorage === 'undefined' ? undefined : sessionStorage): Plan | null {
  try {
    const raw = storage?.getItem(QUICK_PLAN_STORAGE_KEY);
    return raw ? (JSON.parse(raw) as Plan) : null;
  } catch {
    return null;
  }
}

/**
 * Splits a quick plan into what the rig pages save after sign-up: the rig (bank, panels, chargers,
 * inverter), its loads (the parasitic draw marked as standby) and the trip (without its rig id).
 */
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'] as const;

/**
 * A kept quick plan's trip name: the place and the month it starts ("Lake Verna, December 2026"). The place
 * is the stop's name up to its first comma (a search result's "Lake Verna, Ontario" reads as Lake Verna); the
 * form's own placeholder name, or none, gives the plain "My trip, December 2026".
 */
export function keptTripName(stopName: string | undefined, arrive: string | undefined): string {
  const place = (stopName ?? '').split(',')[0]?.trim() ?? '';
  const known = place !== '' && place.toLowerCase() !== defaultQuickPlan('2000-01-01').placeName.toLowerCase();
  const m = /^(\d{4})-(\d{2})-\d{2}$/.exec(arrive ?? '');
  const month = m ? MONTHS[Number(m[2]) - 1] : undefined;
  const when = m && month ? `${month} ${m[1]}` : '';
  const name = [known ? place : 'My trip', when].filter(Boolean).join(', ');
  return name.slice(0, 80);
}

export function quickPlanToRigAndTrip(plan: Plan): { rig: RigInput; loads: LoadInput[]; trip: Omit<TripInput, 'rigId'> } {
  const stop = plan.stops[0];
  return {
    rig: {
      name: 'My rig',
      bank: { ...plan.bank },
      arrays: (plan.arrays ?? []).map((a) => ({ ...a })),
      chargers: (plan.chargers ?? []).map((c) => ({ ...c })),
      inverter: plan.inverter ? { ...plan.inverter } : null,
    },
    loads: (plan.loads ?? []).map((l, i) => ({
      ...l,
      name: l.name ?? `Load ${i + 1}`,
      note: 'From the quick plan: a typical figure, check the appliance’s label.',
      standby: l.name === 'Parasitic draw',
      position: i,
    })),
    trip: {
      name: keptTripName(stop?.name, stop?.arrive),
      stops: plan.stops.map((s) => ({ ...s })),
      drives: (plan.drives ?? []).map((d) => ({ ...d })),
      reserveSocPct: null,
    },
  };
}
