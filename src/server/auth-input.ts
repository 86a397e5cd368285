import { z } from 'zod';
import { HttpError } from './errors';
import { nulError, nulPath, zodIssues } from './http';

/** Largest body any /api/auth/* endpoint reads (sign-up, sign-in, profile and password changes are all small). */
export const AUTH_BODY_MAX_BYTES = 64 * 1024;

/** The one rule for a person's name, on every path that writes one. */
export const personName = z
  .string({ message: 'Enter your name.' })
  .transform((s) => s.trim())
  .pipe(z.string().min(1, 'Enter your name.').max(80, 'Use at most 80 characters.'));

export const ACCOUNT_KIND = z.enum(['camper', 'installer'], { message: 'Choose "camper" or "installer".' });

const signUp = z.looseObject({ name: personName, kind: ACCOUNT_KIND.optional() });

// Only the name can be changed here; the kind is fixed at sign-up and units go through /api/settings.
const updateUser = z.strictObject(
  { name: personName.optional(), image: z.string().max(2048).nullable().optional() },
  { error: (i) => (i.code === 'unrecognized_keys' ? `${i.keys.join(', ')}: cannot be changed here.` : undefined) },
);

const RULES: Record<string, z.ZodType> = {
  '/api/auth/sign-up/email': signUp,
  '/api/auth/update-user': updateUser,
};

/**
 * Checks the fields the app has rules for before better-auth sees the body, and returns the body
 * to pass on (names trimmed). Any bad value is a 400 in the app's envelope, naming the field.
 */
export function checkAuthBody(pathname: string, body: Uint8Array): Uint8Array {
  if (body.byteLength > 0 && body.includes(0x00)) throw nulError('(body)');
  const schema = RULES[pathname.replace(/\/+$/, '')];
  if (!schema || body.byteLength === 0) {
    // Any endpoint: a NUL character in a field (an e-mail, a password) is refused here, not by the database.
    if (body.byteLength > 0 && /\\u0000/i.test(new TextDecoder().decode(body))) {
      let at = '(body)';
      try {
        at = nulPath(JSON.parse(new TextDecoder().decode(body))) ?? at;
      } catch {
        // not JSON: better-auth answers that itself
      }
      throw nulError(at);
    }
    return body;
  }
  let data: unknown;
  try {
    data = JSON.parse(new TextDecoder().decode(body));
  } catch (e) {
    throw new HttpError('invalid_request', 'The body is not valid JSON.', [
      { path: '(body)', message: (e as Error).message.slice(0, 200) },
    ]);
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) {
    throw new HttpError('invalid_request', 'Send a JSON object.', [{ path: '(body)', message: 'expected an object' }]);
  }
  const nul = nulPath(data);
  if (nul) throw nulError(nul);
  const r = schema.safeParse(data);
  if (!r.success) throw new HttpError('invalid_request', 'Some fields need fixing.', zodIssues(r.error));
  return new TextEncoder().encode(JSON.stringify({ ...(data as object), ...(r.data as object) }));
}

/** Session rows as the browser may see them: without the raw token (the cookie stays the only carrier). */
export function withoutTokens(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(withoutTokens);
  if (value && typeof value === 'object') {
    const { token: _token, ...rest } = value as Record<string, unknown>;
    if ('session' in rest) rest.session = withoutTokens(rest.session);
    return rest;
  }
  return value;
}
