// Unit conversion for display. Everything is stored in SI (°C, metres); a user's units setting
// only changes what the screens show and accept. Pure functions, unit-tested.

export const UNIT_SYSTEMS = ['metric', 'imperial'] as const;
export type Units = (typeof UNIT_SYSTEMS)[number];

/** Narrows anything (a session field, a query string) to a unit system, metric when unknown. */
export function toUnits(value: unknown): Units {
  return value === 'imperial' ? 'imperial' : 'metric';
}

/** °C → °F. */
export function cToF(c: number): number {
  return (c * 9) / 5 + 32;
}

/** °F → °C. */
export function fToC(f: number): number {
  return ((f - 32) * 5) / 9;
}

/** metres → feet. */
export function mToFt(m: number): number {
  return m / 0.3048;
}

/** feet → metres. */
export function ftToM(ft: number): number {
  return ft * 0.3048;
}

function round(n: number, digits: number): number {
  const f = 10 ** digits;
  const r = Math.round(n * f) / f;
  return Object.is(r, -0) ? 0 : r;
}

/** The temperature unit's symbol. */
export function tempUnit(units: Units): '°C' | '°F' {
  return units === 'imperial' ? '°F' : '°C';
}

/** The length unit's symbol. */
export function lengthUnit(units: Units): 'm' | 'ft' {
  return units === 'imperial' ? 'ft' : 'm';
}

/** A stored °C value as the number a user of `units` sees (one decimal). */
export function toDisplayTemp(c: number, units: Units): number {
  return round(units === 'imperial' ? cToF(c) : c, 1);
}

/**
 * A number the user typed in their units, back to °C for storage. Rounded to 0.01 °C so that
 * a typed °F value shows again as typed (one decimal) and stored values stay tidy.
 */
export function fromDisplayTemp(value: number, units: Units): number {
  return round(units === 'imperial' ? fToC(value) : value, 2);
}

/** A stored length in metres as the user sees it (one decimal). */
export function toDisplayLength(m: number, units: Units): number {
  return round(units === 'imperial' ? mToFt(m) : m, 1);
}

/** A length typed in the user's units, back to metres (0.001 m). */
export function fromDisplayLength(value: number, units: Units): number {
  return round(units === 'imperial' ? ftToM(value) : value, 3);
}

/** "−2 °C" / "28 °F": a stored °C value formatted for the user, whole degrees. */
export function formatTemp(c: number, units: Units): string {
  const v = Math.round(units === 'imperial' ? cToF(c) : c);
  return `${v < 0 ? '−' : ''}${Math.abs(v === 0 ? 0 : v)} ${tempUnit(units)}`;
}

/** "6.1 m" / "20.0 ft": a stored length formatted for the user. */
export function formatLength(m: number, units: Units): string {
  return `${toDisplayLength(m, units).toFixed(1)} ${lengthUnit(units)}`;
}

/** The message for a temperature outside [minC, maxC], stated in the user's units. */
export function tempRangeMessage(minC: number, maxC: number, units: Units): string {
  return `must be between ${formatTemp(minC, units)} and ${formatTemp(maxC, units)}`;
}

/** A temperature difference (not a reading) for the user: 25 °C of difference is 45 °F. */
export function formatTempDelta(dc: number, units: Units): string {
  const v = Math.round(units === 'imperial' ? (dc * 9) / 5 : dc);
  return `${v} ${tempUnit(units)}`;
}

/**
 * A sentence written in °C (catalogue notes, typical figures) with each temperature reading in the user's
 * units: "near 4 °C" → "near 39 °F". Only "N °C" readings change; "per °C" rates are left as written.
 */
export function tempsInUnits(text: string, units: Units): string {
  if (units === 'metric') return text;
  return text.replace(/([−-]?\d+(?:\.\d+)?) °C/g, (_, n: string) => formatTemp(Number(n.replace('−', '-')), units));
}
