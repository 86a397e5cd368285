/**
 * The security headers of every answer (set by the `headers` step in middleware.ts, and by the
 * preview's direct path, which answers before Astro's pipeline).
 */
export const SECURITY_HEADERS: Readonly<Record<string, string>> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'strict-origin-when-cross-origin',
  'X-Frame-Options': 'DENY',
};

/** The CSP with script-src limited to our files and the SHA-256 of each inline script on the page. */
export function policy(scriptHashes: Iterable<string>): string {
  const scripts = ["'self'", ...[...scriptHashes].map((h) => `'sha256-${h}'`)].join(' ');
  // Styles keep 'unsafe-inline': React islands and the chart set style attributes (see DEVELOPERS.md).
  return `default-src 'self'; img-src 'self' data:; font-src 'self'; style-src 'self' 'unsafe-inline'; script-src ${scripts}; connect-src 'self'; frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'`;
}
