// The plan: one zod 4 schema with every default of the defaults table in forecast-engine.md,
// its limits and its cross-field rules. `Plan` is what a client may send; `ResolvedPlan` is
// the same plan with every default applied, which is all the rest of the engine reads.
import { z } from 'zod';
import { CHEMISTRIES, CHEMISTRY_DEFAULTS, type Chemistry } from './chemistry';
import { dayNumber, isoDate, isValidTimeZone, parseIsoDate } from './tz';
import { planTimeline } from './timeline';

/** Size limits of a plan (forecast-engine.md: 60 days, 30 stops, 10 arrays, 200 loads; the rest are ours). */
export const LIMITS = {
  maxDays: 60,
  maxHours: 60 * 24,
  maxStops: 30,
  maxArrays: 10,
  maxLoads: 200,
  maxChargers: 20,
  maxDrives: 120,
  maxWeatherPerStop: 120,
  maxWindowsPerLoad: 24,
} as const;

// Re-exported: the chemistry table lives in a module without zod, so pages can show it cheaply.
export { CHEMISTRIES, CHEMISTRY_DEFAULTS, type Chemistry };

/** Where a bank sits (Revision 2). */
export const BANK_LOCATIONS = ['outside', 'cabin'] as const;
/** A bank's place. */
export type BankLocation = (typeof BANK_LOCATIONS)[number];
/** Where a load sits (Revision 2). */
export const LOAD_LOCATIONS = ['cabin', 'outside'] as const;
/** A load's place. */
export type LoadLocation = (typeof LOAD_LOCATIONS)[number];

// ---------- small builders, so every number has bounds and a plain-English message ----------

function num(min: number, max: number, opts: { gt?: boolean } = {}) {
  const base = z.number({ error: 'must be a number' });
  const lo = opts.gt
    ? base.gt(min, { error: `must be greater than ${min}` })
    : base.min(min, { error: `must be at least ${min}` });
  return lo.max(max, { error: `must be at most ${max}` });
}

function int(min: number, max: number) {
  return z
    .number({ error: 'must be a number' })
    .int({ error: 'must be a whole number' })
    .min(min, { error: `must be at least ${min}` })
    .max(max, { error: `must be at most ${max}` });
}

const dateString = z
  .string({ error: 'must be a date, such as 2027-10-21' })
  .refine((s) => {
    const c = parseIsoDate(s);
    return c !== null && c.y >= 1950 && c.y <= 2150;
  }, { error: 'must be a real calendar date, such as 2027-10-21' });

const name = z.string({ error: 'must be text' }).trim().min(1, { error: 'must not be empty' }).max(100, { error: 'must be at most 100 characters' });

const hourPair = z.tuple([int(0, 24), int(0, 24)], { error: 'must be a pair of hours [from, to]' });

// ---------- parts of the plan ----------

/** The house battery bank; chemistry-dependent fields are filled by `resolveBank`. */
export const bankSchema = z.object(
    {
    chemistry: z.enum(CHEMISTRIES, { error: 'must be one of lifepo4, agm, flooded, gel' }),
    nominalVolts: num(6, 60).optional(),
    capacityAh: num(0, 20_000, { gt: true }),
    initialSocPct: num(0, 100).default(100),
    floorSocPct: num(0, 95).optional(),
    cutoffVolts: num(0, 100, { gt: true }).nullable().default(null),
    maxChargeAmps: num(0, 10_000, { gt: true }).optional(),
    peukertExponent: num(1, 2).optional(),
    chargeEfficiencyPct: num(50, 100).optional(),
    /** Per 100 Ah (Revision 2): the bank's R = this × 100 / capacityAh. */
    internalResistanceMilliohm: num(0, 1000).optional(),
    /** Read as `location: "cabin"` when `location` is not given (Revision 2). */
    insideHeatedSpace: z.boolean({ error: 'must be true or false' }).default(false),
    selfHeating: z.boolean({ error: 'must be true or false' }).default(false),
    /** Where the bank sits: an outside box or bay (default) or inside the heated cabin (Revision 2). */
    location: z.enum(BANK_LOCATIONS, { error: 'must be outside or cabin' }).optional(),
    /** Thermal time constant τ of the battery, hours (Revision 2; default 6, common practice). 0 = follows its surroundings with one hour's delay. */
    thermalHours: num(0, 240).default(6),
    /** Added: the battery's temperature at the forecast's start (default: its surroundings), e.g. to continue a forecast from a check-in. */
    initialBatteryC: num(-60, 80).optional(),
  },
  { error: 'must be an object with at least chemistry and capacityAh' },
);

/** A solar array and its controller. */
export const arraySchema = z.object({
  name: name.optional(),
  ratedWatts: num(0, 100_000),
  tiltDeg: num(0, 90).default(0),
  azimuthDeg: num(0, 360).default(180),
  aim: z.enum(['fixed', 'follow'], { error: 'must be fixed or follow' }).default('fixed'),
  tempCoeffPctPerC: num(-2, 0.5).default(-0.4),
  nocC: num(20, 80).default(45),
  lossesPct: num(0, 99).default(14),
  controller: z.enum(['mppt', 'pwm'], { error: 'must be mppt or pwm' }).default('mppt'),
  controllerEfficiencyPct: num(50, 100).default(97),
  controllerMaxAmps: num(0, 1000, { gt: true }).nullable().default(null),
  shadePct: num(0, 100).default(0),
  vmpVolts: num(1, 1000).optional(),
});

/** An alternator (DC-DC), shore or generator charger; start/stop/fuel matter for the generator only. */
export const chargerSchema = z.object({
  kind: z.enum(['alternator', 'shore', 'generator'], { error: 'must be alternator, shore or generator' }),
  amps: num(0, 1000, { gt: true }),
  startSocPct: num(0, 100).default(40),
  stopSocPct: num(0, 100).default(80),
  fuelLitresPerHour: num(0, 50).default(0.6),
});

/** The inverter that serves AC loads from the bank. */
export const inverterSchema = z.object({
  efficiencyPct: num(50, 100).default(90),
  idleWatts: num(0, 1000).default(12),
  alwaysOn: z.boolean({ error: 'must be true or false' }).default(false),
  /** AC watts it can deliver continuously (Revision 2; none = not checked). */
  continuousWatts: num(0, 100_000, { gt: true }).nullable().default(null),
  /** AC watts it can deliver for a surge (Revision 2; none = not checked). */
  surgeWatts: num(0, 100_000, { gt: true }).nullable().default(null),
});

/** One appliance (or several alike) with its schedule and duty. */
export const loadSchema = z.object({
  name: name.optional(),
  watts: num(0, 100_000),
  quantity: int(0, 1000).default(1),
  supply: z.enum(['dc', 'ac'], { error: 'must be dc or ac' }).default('dc'),
  windows: z
    .array(hourPair, { error: 'must be a list of [from, to] hour pairs' })
    .max(LIMITS.maxWindowsPerLoad, { error: `at most ${LIMITS.maxWindowsPerLoad} windows` })
    .default([[0, 24]]),
  dutyPct: num(0, 100).default(100),
  days: z.enum(['all', 'camp', 'drive'], { error: 'must be all, camp or drive' }).default('all'),
  response: z.enum(['none', 'cooling', 'heating'], { error: 'must be none, cooling or heating' }).default('none'),
  setpointC: num(-30, 40).default(18),
  /** Where the load sits; cooling loads follow that place's temperature (Revision 2). */
  location: z.enum(LOAD_LOCATIONS, { error: 'must be cabin or outside' }).default('cabin'),
  /** Draw of one unit while starting or running flat out, W (Revision 2; none = its running watts). */
  surgeWatts: num(0, 100_000).nullable().default(null),
});

/** Where a day's weather came from (Revision 2). */
export const WEATHER_SOURCES = ['forecast', 'past-year', 'typed'] as const;

/** One local clock hour of measured or forecast weather (Revision 2, "Weather from a source"). */
export const weatherHourSchema = z.object({
  hour: int(0, 23),
  /** Global horizontal irradiance, W/m²; replaces clear sky × clouds in that hour. */
  ghiWm2: num(0, 1500).optional(),
  /** Air temperature, °C; replaces the ASHRAE profile in that hour. */
  tempC: num(-60, 60).optional(),
  /** Cloud cover, %: shown to people, not used by the engine. */
  cloudPct: num(0, 100).optional(),
});

/** The expected sky and temperatures of one day at a stop. */
export const weatherSchema = z.object({
  date: dateString,
  cloudOktas: num(0, 8),
  highC: num(-60, 60),
  lowC: num(-60, 60),
  source: z.enum(WEATHER_SOURCES, { error: 'must be forecast, past-year or typed' }).optional(),
  hourly: z.array(weatherHourSchema, { error: 'must be a list of hours' }).max(24, { error: 'at most 24 hours' }).optional(),
});

/** A camp: place, zone, dates, shade, hookup, generator window and weather. */
export const stopSchema = z.object({
  name: name.optional(),
  lat: num(-90, 90),
  lon: num(-180, 180),
  timeZone: z.string({ error: 'must be a time zone we know, such as America/Denver' }).refine(isValidTimeZone, {
    error: 'must be a time zone we know, such as America/Denver',
  }),
  arrive: dateString,
  nights: int(1, LIMITS.maxDays),
  arriveHour: int(0, 23).default(15),
  shadePct: num(0, 100).default(0),
  hookup: z.enum(['none', 'shore'], { error: 'must be none or shore' }).default('none'),
  generatorHours: hourPair.default([8, 20]),
  weather: z.array(weatherSchema).max(LIMITS.maxWeatherPerStop, { error: `at most ${LIMITS.maxWeatherPerStop} weather days` }).default([]),
});

/** A drive: local date and start hour (in the owning stop's zone) and whole hours. */
export const driveSchema = z.object({
  date: dateString,
  startHour: int(0, 23),
  hours: int(1, 48),
});

const rawPlanSchema = z.object(
    {
    bank: bankSchema,
    arrays: z.array(arraySchema).max(LIMITS.maxArrays, { error: `at most ${LIMITS.maxArrays} arrays` }).default([]),
    chargers: z.array(chargerSchema).max(LIMITS.maxChargers, { error: `at most ${LIMITS.maxChargers} chargers` }).default([]),
    inverter: inverterSchema.prefault({}),
    loads: z.array(loadSchema).max(LIMITS.maxLoads, { error: `at most ${LIMITS.maxLoads} loads` }).default([]),
    stops: z
      .array(stopSchema, { error: 'must be a list of stops' })
      .min(1, { error: 'a trip needs at least one stop' })
      .max(LIMITS.maxStops, { error: `at most ${LIMITS.maxStops} stops` }),
    drives: z.array(driveSchema).max(LIMITS.maxDrives, { error: `at most ${LIMITS.maxDrives} drives` }).default([]),
  },
  { error: 'the plan must be a JSON object with a bank and stops' },
);

type RawPlan = z.output<typeof rawPlanSchema>;

// ---------- resolved types (every default applied) ----------

/** A bank with every default applied. */
export type ResolvedBank = {
  chemistry: Chemistry;
  nominalVolts: number;
  capacityAh: number;
  initialSocPct: number;
  floorSocPct: number;
  cutoffVolts: number | null;
  maxChargeAmps: number;
  peukertExponent: number;
  chargeEfficiencyPct: number;
  internalResistanceMilliohm: number;
  insideHeatedSpace: boolean;
  selfHeating: boolean;
  location: BankLocation;
  thermalHours: number;
  /** Present only when the plan gives it. */
  initialBatteryC?: number;
};
/** Resolved parts of a plan. */
export type ResolvedArray = Omit<z.output<typeof arraySchema>, 'name'> & { name: string };
export type ResolvedCharger = z.output<typeof chargerSchema>;
export type ResolvedInverter = z.output<typeof inverterSchema>;
export type ResolvedLoad = Omit<z.output<typeof loadSchema>, 'name'> & { name: string };
export type ResolvedStop = Omit<z.output<typeof stopSchema>, 'name'> & { name: string };
export type ResolvedDrive = z.output<typeof driveSchema>;
/** A plan with every default applied: what the rest of the engine reads. */
export type ResolvedPlan = {
  bank: ResolvedBank;
  arrays: ResolvedArray[];
  chargers: ResolvedCharger[];
  inverter: ResolvedInverter;
  loads: ResolvedLoad[];
  stops: ResolvedStop[];
  drives: ResolvedDrive[];
};

/** Applies the chemistry-dependent defaults to a parsed bank. */
export function resolveBank(b: z.output<typeof bankSchema>): ResolvedBank {
  const d = CHEMISTRY_DEFAULTS[b.chemistry];
  return {
    chemistry: b.chemistry,
    nominalVolts: b.nominalVolts ?? d.nominalVolts,
    capacityAh: b.capacityAh,
    initialSocPct: b.initialSocPct,
    floorSocPct: b.floorSocPct ?? d.floorSocPct,
    cutoffVolts: b.cutoffVolts,
    maxChargeAmps: b.maxChargeAmps ?? d.maxChargeC * b.capacityAh,
    peukertExponent: b.peukertExponent ?? d.peukertExponent,
    chargeEfficiencyPct: b.chargeEfficiencyPct ?? d.chargeEfficiencyPct,
    internalResistanceMilliohm: b.internalResistanceMilliohm ?? d.internalResistanceMilliohm,
    insideHeatedSpace: b.insideHeatedSpace,
    selfHeating: b.selfHeating,
    // `location` wins over the older `insideHeatedSpace` when both are given.
    location: b.location ?? (b.insideHeatedSpace ? 'cabin' : 'outside'),
    thermalHours: b.thermalHours,
    ...(b.initialBatteryC !== undefined ? { initialBatteryC: b.initialBatteryC } : {}),
  };
}

function resolve(p: RawPlan): ResolvedPlan {
  return {
    bank: resolveBank(p.bank),
    arrays: p.arrays.map((a, i) => ({ ...a, name: a.name ?? `Array ${i + 1}` })),
    chargers: p.chargers,
    inverter: p.inverter,
    loads: p.loads.map((l, i) => ({ ...l, name: l.name ?? `Load ${i + 1}` })),
    stops: p.stops.map((st, i) => ({ ...st, name: st.name ?? `Stop ${i + 1}` })),
    drives: p.drives,
  };
}

// ---------- cross-field rules ----------

type AddIssue = (path: (string | number)[], message: string) => void;

/** Rules across fields. Runs only on a plan whose fields all passed, so every value is in range. */
function crossCheck(p: RawPlan, issue: AddIssue): void {
  let generators = 0;
  p.chargers.forEach((c, i) => {
    if (c.kind !== 'generator') return;
    generators++;
    if (generators > 1) issue(['chargers', i, 'kind'], 'a plan may have at most one generator');
    if (!(c.startSocPct < c.stopSocPct)) issue(['chargers', i, 'startSocPct'], 'the generator must start below its stop level (startSocPct < stopSocPct)');
  });

  p.stops.forEach((s, i) => {
    const [gFrom, gTo] = s.generatorHours;
    if (!(gFrom < gTo)) issue(['stops', i, 'generatorHours'], 'generator hours must be [start, stop] with start before stop (0 ≤ start < stop ≤ 24); a window across midnight is not allowed, split it if needed');
    const seen = new Map<string, number>();
    s.weather.forEach((w, j) => {
      if (w.highC < w.lowC) issue(['stops', i, 'weather', j, 'highC'], 'the high must not be below the low');
      if (seen.has(w.date)) issue(['stops', i, 'weather', j, 'date'], `weather for ${w.date} is given twice`);
      const hours = new Set<number>();
      (w.hourly ?? []).forEach((h, k) => {
        if (hours.has(h.hour)) issue(['stops', i, 'weather', j, 'hourly', k, 'hour'], `hour ${h.hour} is given twice`);
        hours.add(h.hour);
      });
      seen.set(w.date, j);
    });
    const prevStop = i > 0 ? p.stops[i - 1] : undefined;
    if (prevStop && Math.abs(s.lon - prevStop.lon) > 180) {
      issue(['stops', i, 'lon'], `${s.name ?? `Stop ${i + 1}`}: trips across the date line are not supported yet`);
    }
    if (prevStop) {
      const prev = prevStop;
      const a = dayNumber(s.arrive);
      const pa = dayNumber(prev.arrive);
      if (a <= pa) issue(['stops', i, 'arrive'], 'stops must be in order: each arrives after the one before');
      else if (a < pa + prev.nights) issue(['stops', i, 'arrive'], `overlaps the stop before, which leaves on ${isoDate(pa + prev.nights)}`);
    }
  });

  // Timeline-level checks need valid stop order; skip them if the stops already failed.
  const stopIssues = p.stops.some((s, i) => {
    const prev = i > 0 ? p.stops[i - 1] : undefined;
    return prev !== undefined && (dayNumber(s.arrive) < dayNumber(prev.arrive) + prev.nights || Math.abs(s.lon - prev.lon) > 180);
  });
  if (stopIssues) return;
  const tl = planTimeline(p.stops, p.drives);
  for (let i = 1; i < tl.arrivals.length; i++) {
    if ((tl.arrivals[i] ?? 0) <= (tl.arrivals[i - 1] ?? 0)) issue(['stops', i, 'arriveHour'], 'arrives before the stop before it (check the time zones and arrival hours)');
  }
  if (tl.hours > LIMITS.maxHours) {
    issue(['stops', p.stops.length - 1, 'nights'], `the trip spans ${Math.ceil(tl.hours / 24)} days; at most ${LIMITS.maxDays}`);
  }
  tl.drives.forEach((d, i) => {
    // Revision 2: a drive must start inside the forecast; hours past its end are ignored.
    if (d.startMs < tl.startMs || d.startMs >= tl.endMs) issue(['drives', i, 'date'], 'the drive must start inside the trip (between the first arrival and 11:00 on the last morning)');
  });
}

/** The plan schema: parses a client's plan, applies every default and checks the cross-field rules. */
export const planSchema = rawPlanSchema
  .check((payload) => {
    // zod 4 runs checks even after field-level issues; the cross-field rules parse dates and
    // time zones, so they wait until every field is valid.
    if (payload.issues.length > 0) return;
    crossCheck(payload.value, (path, message) => payload.issues.push({ code: 'custom', path, message, input: payload.value }));
  })
  .transform(resolve);

/** A plan as a client sends it (defaults may be omitted). */
export type Plan = z.input<typeof planSchema>;
