import { HttpError } from './errors';

// Optimistic concurrency: every editable row has a `version`; a write names the version it read
// and only succeeds while the row still has it.

/** The version a DELETE read: `?version=N`, or else an `If-Match: N` (or `"N"`) header; a 400 naming `version` otherwise. */
export function versionFrom(url: URL, headers: Headers): number {
  const raw = url.searchParams.get('version') ?? headers.get('if-match')?.replace(/^W\//, '').replace(/^"(.*)"$/, '$1') ?? null;
  if (raw === null || raw.trim() === '') {
    throw new HttpError('invalid_request', 'Send the version you read, as ?version=N.', [{ path: 'version', message: 'Send the version you read.' }]);
  }
  const n = Number(raw.trim());
  if (!Number.isInteger(n) || n < 1) {
    throw new HttpError('invalid_request', 'The version must be a whole number of at least 1.', [{ path: 'version', message: 'must be a whole number of at least 1' }]);
  }
  return n;
}

/** The 409 for a write whose version is stale, carrying the row as it is now. */
export function conflict(what: string, current: unknown): HttpError {
  return new HttpError('conflict', `Someone changed this ${what} since you opened it.`, [], { current });
}

/** Now, as stored in created_at / updated_at. */
export function nowIso(): string {
  return new Date().toISOString();
}
