import { createAuthClient } from 'better-auth/react';

/** better-auth's browser client; same origin as the app. */
export const authClient = createAuthClient();

// Any origin works as the yardstick: a path is followed only when it stays on it.
const HOME = 'http://sunreckon.invalid';

/**
 * Only same-site paths are followed after sign-in (no open redirects). Control characters are taken
 * out first (a browser drops tabs and line breaks, so `/\t/evil.host` would become `//evil.host`),
 * then the path must resolve onto our own origin; the answer is the normalised path, so it is
 * always a valid Location header.
 */
export function safeNext(raw: string | null | undefined, fallback = '/trips'): string {
  if (!raw) return fallback;
  // eslint-disable-next-line no-control-regex
  const cleaned = raw.replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
  if (!cleaned.startsWith('/') || cleaned.startsWith('//') || cleaned.startsWith('/\\')) return fallback;
  let url: URL;
  try {
    url = new URL(cleaned, HOME);
  } catch {
    return fallback;
  }
  if (url.origin !== HOME) return fallback;
  // Dot segments are resolved by the URL parser: "/.//evil.example" becomes the path "//evil.example",
  // which a browser reads as another site. The normalised path must itself be a plain path.
  if (url.pathname.startsWith('//') || url.pathname.startsWith('/\\')) return fallback;
  return url.pathname + url.search + url.hash;
}
