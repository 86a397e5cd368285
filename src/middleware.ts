import { createHash } from 'node:crypto';
import { defineMiddleware, sequence } from 'astro:middleware';
import { auth } from './server/auth';
import { env } from './server/env';
import { errorResponse } from './server/http';

const PUBLIC_PAGES = new Set(['/', '/sign-in', '/sign-up', '/reset-password', '/about']);
const PUBLIC_API = [/^\/api\/auth\//, /^\/api\/health$/, /^\/api\/forecasts\/preview$/, /^\/api\/places$/, /^\/api\/timezone$/];

/**
 * An address holding the NUL character (%00) never reaches a route: no id, place or token of ours
 * contains it, and PostgreSQL cannot compare it. API: 400; a page's query: asked again without it.
 */
const noNul = defineMiddleware(async (ctx, next) => {
  const { pathname, search } = ctx.url;
  if (!/%00/i.test(pathname + search)) return next();
  if (pathname.startsWith('/api/')) {
    return errorResponse('invalid_request', 'This address holds an invisible NUL character (%00); remove it.', [{ path: '(url)', message: 'contains %00' }]);
  }
  // Pages: no page of ours has one in its path; in a query it is dropped and the page asked again.
  if (/%00/i.test(pathname)) return new Response('Not found', { status: 404, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  return ctx.redirect(pathname + search.replace(/%00/gi, ''), 302);
});

/** Resolves the session once per request and puts it on Astro.locals. */
const session = defineMiddleware(async (ctx, next) => {
  ctx.locals.user = null;
  ctx.locals.session = null;
  const path = ctx.url.pathname;
  if (path.startsWith('/_astro/') || path.startsWith('/api/auth/')) return next();
  try {
    const s = await auth.api.getSession({ headers: ctx.request.headers });
    if (s) {
      ctx.locals.user = s.user;
      ctx.locals.session = s.session;
    }
  } catch (err) {
    console.error('[sunreckon] session lookup failed', err);
  }
  return next();
});

/** Anonymous visitors: app pages redirect to /sign-in, API routes answer 401 JSON. */
const guard = defineMiddleware(async (ctx, next) => {
  const path = ctx.url.pathname;
  if (ctx.locals.user || path.startsWith('/_astro/') || path.startsWith('/dev/')) return next();
  if (path.startsWith('/api/')) {
    if (PUBLIC_API.some((r) => r.test(path))) return next();
    return errorResponse('unauthorized', 'Sign in to use this.');
  }
  if (PUBLIC_PAGES.has(path) || path.startsWith('/invite/') || /\.[a-z0-9]+$/i.test(path)) return next();
  const back = encodeURIComponent(path + ctx.url.search);
  return ctx.redirect(`/sign-in?next=${back}`, 302);
});

const WRITE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

const AUTH_ORIGIN = env.authUrl ? new URL(env.authUrl).origin : null;

/**
 * API writes from another site are refused. Astro's checkOrigin covers form content types only, and
 * better-auth checks Origin only when cookies are sent (so a cross-site sign-in would pass). A
 * browser sends Origin on every write; one naming another site is refused. In production with
 * BETTER_AUTH_URL that URL's origin is the only one; elsewhere the origin the request came in on.
 * Requests without Origin (scripts, curl) still need the SameSite=Lax session cookie.
 */
const sameOrigin = defineMiddleware(async (ctx, next) => {
  if (!WRITE_METHODS.has(ctx.request.method) || !ctx.url.pathname.startsWith('/api/')) return next();
  const expected = env.isProduction && AUTH_ORIGIN ? AUTH_ORIGIN : ctx.url.origin;
  const origin = ctx.request.headers.get('origin');
  if (origin !== null && origin !== expected) {
    return errorResponse('forbidden', 'Cross-site requests are refused: send this from Sunreckon itself.', [{ path: '(headers).origin', message: `expected ${expected}` }]);
  }
  return next();
});

const INLINE_SCRIPT = /<script\b(?![^>]*\bsrc\s*=)[^>]*>([\s\S]*?)<\/script>/gi;

/** The CSP with script-src limited to our files and the SHA-256 of each inline script on the page. */
function policy(scriptHashes: string[]): string {
  const scripts = ["'self'", ...scriptHashes.map((h) => `'sha256-${h}'`)].join(' ');
  // Styles keep 'unsafe-inline': React islands and the chart set style attributes (see DEVELOPERS.md).
  return `default-src 'self'; img-src 'self' data:; font-src 'self'; style-src 'self' 'unsafe-inline'; script-src ${scripts}; connect-src 'self'; frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'`;
}

/**
 * Security headers on every response. HTML pages are read once so that each inline script Astro
 * writes (the island loader and hydration directives) is allowed by its hash, and no other.
 */
const headers = defineMiddleware(async (_ctx, next) => {
  let res = await next();
  if (!res.headers.has('Content-Security-Policy') && /^text\/html\b/i.test(res.headers.get('content-type') ?? '') && res.body) {
    const html = await res.text();
    const hashes = new Set<string>();
    for (const m of html.matchAll(INLINE_SCRIPT)) hashes.add(createHash('sha256').update(m[1]!, 'utf8').digest('base64'));
    const h = new Headers(res.headers);
    h.delete('content-length');
    h.set('Content-Security-Policy', policy([...hashes]));
    res = new Response(html, { status: res.status, statusText: res.statusText, headers: h });
  }
  const h = res.headers;
  h.set('X-Content-Type-Options', 'nosniff');
  h.set('Referrer-Policy', 'strict-origin-when-cross-origin');
  h.set('X-Frame-Options', 'DENY');
  if (!h.has('Content-Security-Policy')) h.set('Content-Security-Policy', policy([]));
  return res;
});

export const onRequest = sequence(headers, noNul, sameOrigin, session, guard);
