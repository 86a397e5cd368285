// Small helpers shared by the forms: number inputs that hand zod a number (or nothing), element
// ids derived from field paths, and server issues placed next to their fields.
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import type { ApiIssue } from '../../lib/query-client';

/** The element id of a form field path: `stops.1.arrive` → `stops-1-arrive`. */
export function fieldId(path: string): string {
  return path.replace(/\./g, '-');
}

function parseNumber(v: unknown): number | undefined {
  if (typeof v === 'number') return v;
  if (v === null || v === undefined) return undefined;
  const s = String(v).trim().replace(/\u2212/g, '-');
  if (s === '') return undefined;
  // A comma decimal ("1,5") is read as a decimal point; anything else non-numeric stays NaN so zod names it.
  const n = Number(/^-?\d+,\d+$/.test(s) ? s.replace(',', '.') : s);
  return n;
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
