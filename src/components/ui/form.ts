// Small helpers shared by the forms: number inputs that hand zod a number (or nothing), element
// ids derived from field paths, and server issues placed next to their fields.
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import type { ApiIssue } from '../../lib/query-client';

/** The element id of a form field path: `stops.1.arrive` → `stops-1-arrive`. */
export function fieldId(path: string): string {
  return path.replace(/\./g, '-');
}

/** What a typed number reads as: nothing, a number, two possible numbers, or not a number. */
export type TypedNumber =
  | { kind: 'empty' }
  | { kind: 'number'; value: number }
  | { kind: 'ambiguous'; readings: [number, number] }
  | { kind: 'invalid' };

/** The browser's locale (its first preferred language); en-US where there is no browser. */
export function userLocale(): string {
  if (typeof navigator !== 'undefined') return navigator.languages?.[0] ?? navigator.language ?? 'en-US';
  return 'en-US';
}

/** The locale's thousands and decimal separators, from Intl's own formatting of 1234567.5. */
export function separatorsOf(locale: string): { group: string; decimal: string } {
  let group = ',';
  let decimal = '.';
  try {
    for (const part of new Intl.NumberFormat(locale).formatToParts(1234567.5)) {
      if (part.type === 'group') group = part.value;
      if (part.type === 'decimal') decimal = part.value;
    }
  } catch {
    // an unknown locale tag: keep the defaults
  }
  // Spaces of every width (fr-FR uses a narrow no-break space) and apostrophes (de-CH) are read alike.
  if (/^[\s\u00a0\u202f]$/.test(group)) group = ' ';
  if (/^['\u2019]$/.test(group)) group = "'";
  return { group, decimal: decimal === ',' ? ',' : '.' };
}

const GROUPED = /^\d{1,3}(\d{3})*$/; // runs joined below: first run 1–3 digits, every later run exactly 3

function groupedValue(runs: string[]): number | undefined {
  if (runs.length === 0 || !/^\d{1,3}$/.test(runs[0] ?? '') || runs.slice(1).some((r) => !/^\d{3}$/.test(r))) return undefined;
  const joined = runs.join('');
  return GROUPED.test(joined) ? Number(joined) : undefined;
}

/**
 * Reads a typed number by the user's locale: "1,200" is 1200 in en-US and 1.2 in de-DE; "1 200" is 1200
 * anywhere. A lone separator that is neither the locale's thousands nor its decimal sign and is followed by
 * exactly three digits ("1.200" in fr-FR) could be either, so it is refused as ambiguous with both readings.
 */
export function parseTypedNumber(v: unknown, locale: string = userLocale()): TypedNumber {
  if (typeof v === 'number') return Number.isFinite(v) ? { kind: 'number', value: v } : { kind: 'invalid' };
  if (v === null || v === undefined) return { kind: 'empty' };
  let s = String(v).trim().replace(/[\u2212\u2012\u2013]/g, '-');
  if (s === '') return { kind: 'empty' };
  let sign = 1;
  if (s.startsWith('-') || s.startsWith('+')) {
    sign = s.startsWith('-') ? -1 : 1;
    s = s.slice(1).trim();
  }
  s = s.replace(/[\s\u00a0\u202f]+/g, ' ').replace(/\u2019/g, "'");
  if (!/^[\d.,' ]+$/.test(s) || !/\d/.test(s)) return { kind: 'invalid' };
  const { group, decimal } = separatorsOf(locale);
  const seps = [...new Set(s.replace(/\d/g, ''))];
  const signed = (n: number | undefined): TypedNumber => (n === undefined || !Number.isFinite(n) ? { kind: 'invalid' } : { kind: 'number', value: sign * n });
  const withDecimal = (intRuns: string[], frac: string): number | undefined => {
    if (!/^\d+$/.test(frac)) return undefined;
    const whole = intRuns.length === 1 && intRuns[0] === '' ? 0 : groupedValue(intRuns);
    return whole === undefined ? undefined : Number(`${whole}.${frac}`);
  };
  if (seps.length === 0) return signed(Number(s));
  if (seps.length > 2) return { kind: 'invalid' };
  const alwaysGroup = (c: string) => c === ' ' || c === "'";
  if (seps.length === 2) {
    // Both kinds: the last one is the decimal sign (once, and not a space), the other groups thousands.
    const last = s.replace(/\d/g, '').slice(-1);
    const other = seps.find((c) => c !== last) ?? '';
    if (alwaysGroup(last) || s.split(last).length !== 2) return { kind: 'invalid' };
    const [intPart = '', frac = ''] = s.split(last);
    return signed(withDecimal(intPart.split(other), frac));
  }
  const c = seps[0] ?? '';
  const runs = s.split(c);
  if (alwaysGroup(c)) return signed(groupedValue(runs));
  const once = runs.length === 2;
  const asDecimal = once ? withDecimal([runs[0] ?? ''], runs[1] ?? '') : undefined;
  const asGroup = groupedValue(runs);
  if (c === decimal) return signed(once ? asDecimal : asGroup); // "1.200.000" can only be grouping
  if (c === group) return signed(asGroup ?? asDecimal); // "1,5" in en-US cannot be grouping: a decimal from elsewhere
  // Neither of the locale's signs (a dot or comma where the locale groups with spaces).
  if (asGroup !== undefined && asDecimal !== undefined) return { kind: 'ambiguous', readings: [sign * asGroup, sign * asDecimal] };
  return signed(asGroup ?? asDecimal);
}

function parseNumber(v: unknown): number | undefined {
  const typed = parseTypedNumber(v);
  if (typed.kind === 'empty') return undefined;
  // Ambiguous or unreadable text stays NaN so zod refuses it; NumberField says why next to the box.
  return typed.kind === 'number' ? typed.value : NaN;
}

/** For a required number: empty → undefined (zod says "must be a number"), text → NaN (same), else the number. */
export const asNumber = (v: unknown): number | undefined => parseNumber(v);

/** For a nullable number: empty → null. */
export const asNumberOrNull = (v: unknown): number | null => {
  const n = parseNumber(v);
  return n === undefined ? null : n;
};

/**
 * Puts each server issue on its field when that field is on the page (found by id), and returns
 * the issues that have no field to sit next to, for a summary at the top of the form.
 */
export function applyServerIssues<T extends FieldValues>(issues: ApiIssue[], setError: UseFormSetError<T>, idPrefix = ''): ApiIssue[] {
  const loose: ApiIssue[] = [];
  for (const issue of issues) {
    const onPage = typeof document !== 'undefined' && document.getElementById(idPrefix + fieldId(issue.path));
    if (onPage) setError(issue.path as Path<T>, { type: 'server', message: issue.message }, { shouldFocus: false });
    else loose.push(issue);
  }
  return loose;
}

/** Reads a nested error message out of react-hook-form's error tree by dot path. */
export function errorAt(errors: unknown, path: string): string | undefined {
  let node: unknown = errors;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  if (node && typeof node === 'object') {
    const msg = (node as { message?: unknown }).message;
    if (typeof msg === 'string') return msg;
    const root = (node as { root?: { message?: unknown } }).root;
    if (root && typeof root.message === 'string') return root.message;
  }
  return undefined;
}
