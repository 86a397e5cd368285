// What changed between two saved forecasts, read from the inputs each one stored: the bank, panels,
// chargers, inverter, loads, stops and drives of its plan, each stop-day's weather, where that weather
// came from, and the engine revision that made it. Pure: the compare page lists these above the overlay.
import type { ResolvedPlan } from '../../engine';
import { CHEMISTRY_LABELS, formatDate, formatHour, formatNumber } from '../../lib/format';
import { formatTemp, type Units } from '../../lib/units';
import type { WeatherSources } from '../weather/band';

/** The stored inputs of one saved forecast. */
export interface SnapshotInputs {
  plan: ResolvedPlan;
  /** Engine revision that made it (snapshots from before revisions were recorded: 1). */
  engineRevision?: number;
  weatherSources?: WeatherSources;
}

/** One difference, in words: "Capacity: 200 Ah → 300 Ah", "Added: Coffee maker (1,200 W AC, …)". */
export interface SnapshotChange {
  kind: 'added' | 'removed' | 'changed';
  /** What the line is about: "Capacity", "Fridge", "Mesa camp, Thu 21 Oct 2027". */
  what: string;
  /** For changes: old → new, field by field ("duty 35 % → 50 %"); for added/removed: the item in short. */
  detail: string;
}

/** The differences of one part of the plan. */
export interface SnapshotSection {
  title: 'Bank' | 'Panels' | 'Chargers' | 'Inverter' | 'Loads' | 'Stops' | 'Drives' | 'Weather' | 'Engine';
  changes: SnapshotChange[];
}

type Fmt = (v: unknown, units: Units) => string;

const num =
  (unit: string, digits = 1): Fmt =>
  (v) =>
    v === null || v === undefined ? 'none' : `${formatNumber(Number(v), digits)}${unit ? `\u00a0${unit}` : ''}`;
const pctF: Fmt = (v) => (v === null || v === undefined ? 'none' : `${formatNumber(Number(v), 1)}\u00a0%`);
const yesNo: Fmt = (v) => (v ? 'yes' : 'no');
const temp: Fmt = (v, u) => (v === null || v === undefined ? 'none' : formatTemp(Number(v), u));
const words =
  (map: Record<string, string>): Fmt =>
  (v) =>
    map[String(v)] ?? String(v);
const hours: Fmt = (v) =>
  Array.isArray(v) && v.length > 0 ? (v as [number, number][]).map(([a, b]) => `${formatHour(a)}–${formatHour(b)}`).join(', ') : 'never';

/** A field of an item: its plain label and how its value reads. */
type Fields = [key: string, label: string, fmt: Fmt][];

const BANK: Fields = [
  ['chemistry', 'Chemistry', words(CHEMISTRY_LABELS)],
  ['nominalVolts', 'Nominal voltage', num('V')],
  ['capacityAh', 'Capacity', num('Ah', 0)],
  ['initialSocPct', 'Charge at the start', pctF],
  ['floorSocPct', 'Floor (lowest charge to use)', pctF],
  ['cutoffVolts', 'Low-voltage cutoff', num('V', 2)],
  ['maxChargeAmps', 'Maximum charge current', num('A')],
  ['peukertExponent', 'Peukert exponent', num('', 2)],
  ['chargeEfficiencyPct', 'Charge efficiency', pctF],
  ['internalResistanceMilliohm', 'Internal resistance per 100 Ah', num('mΩ')],
  ['location', 'Where it sits', words({ cabin: 'in the heated cabin', outside: 'outside the cabin' })],
  ['selfHeating', 'Self-heating', yesNo],
  ['thermalHours', 'Warms and cools over', num('h')],
  ['initialBatteryC', 'Battery temperature at the start', temp],
];
const ARRAY: Fields = [
  ['ratedWatts', 'rated', num('W', 0)],
  ['tiltDeg', 'tilt', num('°', 0)],
  ['azimuthDeg', 'faces', num('°', 0)],
  ['aim', 'aim', words({ fixed: 'fixed', follow: 'turned to follow the sun' })],
  ['shadePct', 'shade', pctF],
  ['controller', 'controller', words({ mppt: 'MPPT', pwm: 'PWM' })],
  ['controllerMaxAmps', 'controller limit', num('A')],
  ['controllerEfficiencyPct', 'controller efficiency', pctF],
  ['lossesPct', 'losses', pctF],
  ['tempCoeffPctPerC', 'power per °C', num('%/°C', 2)],
  ['nocC', 'NOCT', temp],
  ['vmpVolts', 'Vmp', num('V')],
];
const CHARGER: Fields = [
  ['amps', 'current', num('A')],
  ['startSocPct', 'starts below', pctF],
  ['stopSocPct', 'stops at', pctF],
  ['fuelLitresPerHour', 'fuel', num('L/h', 2)],
];
const INVERTER: Fields = [
  ['efficiencyPct', 'Efficiency', pctF],
  ['idleWatts', 'Idle draw', num('W')],
  ['alwaysOn', 'Always on', yesNo],
  ['continuousWatts', 'Continuous rating', num('W', 0)],
  ['surgeWatts', 'Surge rating', num('W', 0)],
];
const LOAD: Fields = [
  ['watts', 'watts', num('W')],
  ['quantity', 'how many', num('', 0)],
  ['supply', 'supply', words({ dc: 'DC', ac: 'AC (through the inverter)' })],
  ['windows', 'hours', hours],
  ['dutyPct', 'duty', pctF],
  ['days', 'days', words({ all: 'every day', camp: 'camp days', drive: 'drive days' })],
  ['response', 'follows the temperature', words({ none: 'no', cooling: 'cooling', heating: 'heating' })],
  ['setpointC', 'thermostat', temp],
  ['location', 'where', words({ cabin: 'in the cabin', outside: 'outside' })],
  ['surgeWatts', 'surge', num('W', 0)],
];
const STOP: Fields = [
  ['name', 'name', (v) => String(v)],
  ['lat', 'latitude', num('°', 3)],
  ['lon', 'longitude', num('°', 3)],
  ['timeZone', 'time zone', (v) => String(v)],
  ['arrive', 'arrives', (v) => formatDate(String(v))],
  ['arriveHour', 'arrival hour', (v) => formatHour(Number(v))],
  ['nights', 'nights', num('', 0)],
  ['hookup', 'hookup', words({ none: 'none', shore: 'shore power' })],
  ['shadePct', 'shade', pctF],
  ['generatorHours', 'generator hours', (v) => (Array.isArray(v) ? `${formatHour(Number(v[0]))}–${formatHour(Number(v[1]))}` : 'none')],
];

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/** The fields that differ, each with its old and new value in words. */
function fieldDiffs(
  a: Record<string, unknown>,
  b: Record<string, unknown>,
  fields: Fields,
  units: Units,
): { label: string; from: string; to: string }[] {
  return fields.filter(([k]) => !same(a[k], b[k])).map(([k, label, f]) => ({ label, from: f(a[k], units), to: f(b[k], units) }));
}

/** "duty 35 % → 50 %; hours 00:00–24:00 → 06:00–22:00" for the fields that differ. */
function fieldChanges(a: Record<string, unknown>, b: Record<string, unknown>, fields: Fields, units: Units): string[] {
  return fieldDiffs(a, b, fields, units).map((d) => `${d.label} ${d.from} → ${d.to}`);
}

/** An item in short: its fields that have a value, "1,200 W, AC (through the inverter), hours 07:00–08:00". */
function short(x: Record<string, unknown>, fields: Fields, units: Units, keys: string[]): string {
  return fields
    .filter(([k]) => keys.includes(k) && x[k] !== undefined && x[k] !== null)
    .map(([k, label, f]) => `${label} ${f(x[k], units)}`)
    .join(', ');
}

/** Pairs items by a key (name, or kind), the nth of a repeated key with the nth: [old, new] or one side missing. */
function pair<T>(a: T[], b: T[], key: (x: T) => string): { k: string; a?: T; b?: T }[] {
  const seen = new Map<string, number>();
  const keyed = (xs: T[]) => {
    seen.clear();
    return xs.map((x) => {
      const k = key(x);
      const n = seen.get(k) ?? 0;
      seen.set(k, n + 1);
      return { id: n === 0 ? k : `${k} (${n + 1})`, x };
    });
  };
  const ka = keyed(a);
  const kb = keyed(b);
  const out: { k: string; a?: T; b?: T }[] = [];
  const inB = new Map(kb.map((e) => [e.id, e.x]));
  for (const e of ka) out.push({ k: e.id, a: e.x, b: inB.get(e.id) });
  const inA = new Set(ka.map((e) => e.id));
  for (const e of kb) if (!inA.has(e.id)) out.push({ k: e.id, b: e.x });
  return out;
}

function listChanges<T extends object>(
  a: T[],
  b: T[],
  key: (x: T) => string,
  fields: Fields,
  units: Units,
  shortKeys: string[],
  label: (k: string) => string = (k) => k,
): SnapshotChange[] {
  const out: SnapshotChange[] = [];
  for (const p of pair(a, b, key)) {
    const ra = p.a as Record<string, unknown> | undefined;
    const rb = p.b as Record<string, unknown> | undefined;
    if (ra && !rb) out.push({ kind: 'removed', what: label(p.k), detail: short(ra, fields, units, shortKeys) });
    else if (!ra && rb) out.push({ kind: 'added', what: label(p.k), detail: short(rb, fields, units, shortKeys) });
    else if (ra && rb) {
      const d = fieldChanges(ra, rb, fields, units);
      if (d.length > 0) out.push({ kind: 'changed', what: label(p.k), detail: d.join('; ') });
    }
  }
  return out;
}

const KIND_WORDS: Record<string, string> = {
  alternator: 'Alternator (DC-DC charger)',
  shore: 'Shore power charger',
  generator: 'Generator',
};
const SOURCE_WORDS: Record<string, string> = {
  forecast: 'weather forecast',
  'past-year': 'a past year',
  typed: 'typed in',
  copied: 'copied from a nearby day',
  assumed: 'assumed (no weather given)',
};

type Weather = ResolvedPlan['stops'][number]['weather'][number];

/** The day's sunshine from its hourly figures, kWh/m² (each hour's W/m² for one hour), or null without them. */
function sunKwh(w: Weather): number | null {
  const h = (w as { hourly?: { ghiWm2?: number }[] }).hourly;
  if (!h || h.length === 0) return null;
  return h.reduce((s, x) => s + (x.ghiWm2 ?? 0), 0) / 1000;
}

function weatherChanges(
  a: ResolvedPlan,
  b: ResolvedPlan,
  sa: WeatherSources | undefined,
  sb: WeatherSources | undefined,
  units: Units,
): SnapshotChange[] {
  const out: SnapshotChange[] = [];
  const n = Math.min(a.stops.length, b.stops.length);
  for (let i = 0; i < n; i++) {
    const stopA = a.stops[i]!;
    const stopB = b.stops[i]!;
    const originA = new Map((sa?.stops[i]?.days ?? []).map((d) => [d.date, d.source as string]));
    const originB = new Map((sb?.stops[i]?.days ?? []).map((d) => [d.date, d.source as string]));
    const wa = new Map(stopA.weather.map((w) => [w.date, w]));
    const wb = new Map(stopB.weather.map((w) => [w.date, w]));
    const dates = [...new Set([...wa.keys(), ...wb.keys(), ...originA.keys(), ...originB.keys()])].sort();
    for (const date of dates) {
      const x = wa.get(date);
      const y = wb.get(date);
      const parts: string[] = [];
      const oa = originA.get(date) ?? (x as { source?: string } | undefined)?.source;
      const ob = originB.get(date) ?? (y as { source?: string } | undefined)?.source;
      if (oa && ob && oa !== ob) parts.push(`from ${SOURCE_WORDS[oa] ?? oa} → ${SOURCE_WORDS[ob] ?? ob}`);
      if (x && y) {
        if (x.cloudOktas !== y.cloudOktas) parts.push(`cloud ${x.cloudOktas} → ${y.cloudOktas} eighths of the sky`);
        if (x.highC !== y.highC) parts.push(`high ${formatTemp(x.highC, units)} → ${formatTemp(y.highC, units)}`);
        if (x.lowC !== y.lowC) parts.push(`low ${formatTemp(x.lowC, units)} → ${formatTemp(y.lowC, units)}`);
        const ka = sunKwh(x);
        const kb = sunKwh(y);
        if (ka !== null && kb !== null && Math.abs(ka - kb) >= 0.05)
          parts.push(`sunshine ${formatNumber(ka, 1)} → ${formatNumber(kb, 1)} kWh/m²`);
        else if ((ka === null) !== (kb === null)) parts.push(ka === null ? 'hour-by-hour figures added' : 'hour-by-hour figures dropped');
      } else if (x && !y) parts.push('typed day removed');
      else if (!x && y) parts.push('typed day added');
      if (parts.length > 0) out.push({ kind: 'changed', what: `${stopB.name}, ${formatDate(date)}`, detail: parts.join('; ') });
    }
  }
  return out;
}

function driveWords(d: ResolvedPlan['drives'][number]): string {
  return `${formatDate(d.date)} from ${formatHour(d.startHour)} for ${formatNumber(d.hours)} h`;
}

/**
 * What changed from `older` to `newer`, section by section; sections without changes are left out.
 * Loads, panels and drives are matched by name (or position), chargers by kind, stops by position.
 */
export function snapshotDiff(older: SnapshotInputs, newer: SnapshotInputs, units: Units = 'metric'): SnapshotSection[] {
  const a = older.plan;
  const b = newer.plan;
  const whole = (d: { label: string; from: string; to: string }): SnapshotChange => ({
    kind: 'changed',
    what: d.label,
    detail: `${d.from} → ${d.to}`,
  });
  const bankChanges = fieldDiffs(
    a.bank as unknown as Record<string, unknown>,
    b.bank as unknown as Record<string, unknown>,
    BANK,
    units,
  ).map(whole);
  const inverterChanges = fieldDiffs(
    a.inverter as unknown as Record<string, unknown>,
    b.inverter as unknown as Record<string, unknown>,
    INVERTER,
    units,
  ).map(whole);
  const driveKey = (d: ResolvedPlan['drives'][number]) => driveWords(d);
  const drives = pair(a.drives, b.drives, driveKey)
    .filter((p) => !(p.a && p.b))
    .map((p): SnapshotChange => ({ kind: p.a ? 'removed' : 'added', what: 'Drive', detail: p.k }));
  const stops: SnapshotChange[] = [];
  const ns = Math.max(a.stops.length, b.stops.length);
  for (let i = 0; i < ns; i++) {
    const x = a.stops[i] as unknown as Record<string, unknown> | undefined;
    const y = b.stops[i] as unknown as Record<string, unknown> | undefined;
    if (x && !y) stops.push({ kind: 'removed', what: String(x.name), detail: short(x, STOP, units, ['arrive', 'nights']) });
    else if (!x && y) stops.push({ kind: 'added', what: String(y.name), detail: short(y, STOP, units, ['arrive', 'nights']) });
    else if (x && y) {
      const d = fieldChanges(x, y, STOP, units);
      if (d.length > 0) stops.push({ kind: 'changed', what: String(y.name), detail: d.join('; ') });
    }
  }
  const ra = older.engineRevision ?? 1;
  const rb = newer.engineRevision ?? 1;
  const sections: SnapshotSection[] = [
    { title: 'Bank', changes: bankChanges },
    { title: 'Panels', changes: listChanges(a.arrays, b.arrays, (x) => x.name, ARRAY, units, ['ratedWatts', 'controller']) },
    {
      title: 'Chargers',
      changes: listChanges(
        a.chargers,
        b.chargers,
        (x) => x.kind,
        CHARGER,
        units,
        ['amps'],
        (k) => KIND_WORDS[k.replace(/ \(\d+\)$/, '')] ?? k,
      ),
    },
    { title: 'Inverter', changes: inverterChanges },
    {
      title: 'Loads',
      changes: listChanges(a.loads, b.loads, (x) => x.name, LOAD, units, ['watts', 'quantity', 'supply', 'windows', 'dutyPct']),
    },
    { title: 'Stops', changes: stops },
    { title: 'Drives', changes: drives },
    { title: 'Weather', changes: weatherChanges(a, b, older.weatherSources, newer.weatherSources, units) },
    {
      title: 'Engine',
      changes:
        ra === rb
          ? []
          : [
              {
                kind: 'changed',
                what: 'Engine revision',
                detail: `${ra} → ${rb}: the two were worked out by different engine rules, so some numbers differ for that reason alone`,
              },
            ],
    },
  ];
  return sections.filter((s) => s.changes.length > 0);
}
