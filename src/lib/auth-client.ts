import { createAuthClient } from 'better-auth/react';

/** better-auth's browser client; same origin as the app. */
export const authClient = createAuthClient();

/** Only same-site paths are followed after sign-in (no open redirects). */
export function safeNext(raw: string | null | undefined, fallback = '/trips'): string {
  if (!raw || !raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return fallback;
  return raw;
}
