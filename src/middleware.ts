import { createHash } from 'node:crypto';
import { defineMiddleware, sequence } from 'astro:middleware';
import { auth } from './server/auth';
import { env } from './server/env';
import { errorResponse } from './server/http';
import { policy, SECURITY_HEADERS } from './server/security-headers';
import { cachedSession, dropSession, sessionKey } from './server/session-cache';
// Loaded at start so the background process purges rigs and trips deleted more than 30 days ago.
import './server/purge';

// Loaded at start so the background process runs the trip watch (not with WATCH=off or in tests).
import './server/watch-scheduler';

const PUBLIC_PAGES = new Set(['/', '/sign-in', '/sign-up', '/reset-password', '/about', '/watch/unsubscribe']);
// The dev watch tick answers 404 in production (the route checks); elsewhere it needs no sign-in, like /dev pages.
const PUBLIC_API = [/^\/api\/dev\/watch\/tick$/, /^\/api\/auth\//, /^\/api\/health$/, /^\/api\/forecasts\/preview$/, /^\/api\/places$/, /^\/api\/timezone$/];

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

/**
 * Routes that never read the session: health, the anonymous preview, place search, time zones and
 * static files (a path with an extension). They skip the lookup (a cookie parse, a signature check
 * and a database read per request); their handlers see `locals.user === null`.
 */
const NO_SESSION_API = new Set(['/api/health', '/api/forecasts/preview', '/api/places', '/api/timezone']);
function skipsSession(path: string): boolean {
  return path.startsWith('/_astro/') || path.startsWith('/api/auth/') || NO_SESSION_API.has(path) || (!path.startsWith('/api/') && /\.[a-z0-9]+$/i.test(path));
}

/**
 * Resolves the session once per request and puts it on Astro.locals; a lookup is kept for a few
 * seconds per process (session-cache.ts), and a write ends it in every worker: a write with the
 * session's cookie ends that one (sign-out, settings, password), a write to /api/auth/* or
 * /sign-out ends all (a password reset revokes sessions without a cookie).
 */
const session = defineMiddleware(async (ctx, next) => {
  ctx.locals.user = null;
  ctx.locals.session = null;
  const path = ctx.url.pathname;
  const key = sessionKey(ctx.request.headers.get('cookie'));
  const authWrite = path.startsWith('/api/auth/') || path === '/sign-out';
  const ends = WRITE_METHODS.has(ctx.request.method) && (key !== null || authWrite);
  if (ends) dropSession(authWrite ? null : key);
  if (!skipsSession(path)) {
    try {
      const s = await cachedSession(key, () => auth.api.getSession({ headers: ctx.request.headers }));
      if (s && new Date(s.session.expiresAt).getTime() > Date.now()) {
        ctx.locals.user = s.user;
        ctx.locals.session = s.session;
      }
    } catch (err) {
      console.error('[sunreckon] session lookup failed', err);
    }
  }
  if (!ends) return next();
  try {
    return await next();
  } finally {
    // Again once the write has run: a lookup made meanwhile may have read the session before it ended.
    dropSession(authWrite ? null : key);
  }
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
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];

/**
 * Cross-site form posts are refused, as Astro's checkOrigin refuses them: a write whose body is a
 * form (or has no type) and whose Origin is not this site's answers 403. One exception: a mail
 * program stopping the trip watch's e-mail in one click POSTs `List-Unsubscribe=One-Click` to
 * the address in the e-mail's List-Unsubscribe header from its own servers (RFC 8058). That
 * address carries the signed token, which is the whole authority there (no cookie is read), so a
 * POST to /watch/unsubscribe with a token in its address passes.
 */
const formOrigin = defineMiddleware(async (ctx, next) => {
  if (SAFE_METHODS.has(ctx.request.method)) return next();
  if (ctx.url.pathname === '/watch/unsubscribe' && ctx.url.searchParams.has('token')) return next();
  if (ctx.request.headers.get('origin') === ctx.url.origin) return next();
  const type = ctx.request.headers.get('content-type');
  if (type === null || FORM_TYPES.some((t) => type.toLowerCase().includes(t))) {
    return new Response(`Cross-site ${ctx.request.method} form submissions are forbidden`, { status: 403, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  }
  return next();
});

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

/**
 * Inline scripts are part of the build (Astro's island loader, its hydration directives, our own
 * small scripts): the same few texts on each render of a page. Each page (route pattern, signed in
 * or not) is read in full on its first LEARN_RENDERS renders and then on every RELEARN_EVERY-th;
 * the hashes found there make that page's CSP. The renders in between stream through untouched
 * with it, instead of buffering and scanning every HTML body. A page that may carry an inline
 * script on one render and not on another keeps every hash it has shown (see DEVELOPERS.md).
 */
const LEARN_RENDERS = 3;
const RELEARN_EVERY = 50;
const pages = new Map<string, { renders: number; hashes: Set<string>; policy: string }>();

/** Security headers on every response; HTML pages get the CSP described above. */
const headers = defineMiddleware(async (ctx, next) => {
  let res = await next();
  if (!res.headers.has('Content-Security-Policy') && /^text\/html\b/i.test(res.headers.get('content-type') ?? '') && res.body) {
    const key = `${ctx.routePattern}|${ctx.locals.user ? 'in' : 'out'}`;
    let page = pages.get(key);
    if (!page) pages.set(key, (page = { renders: 0, hashes: new Set(), policy: policy([]) }));
    page.renders += 1;
    if (page.renders <= LEARN_RENDERS || page.renders % RELEARN_EVERY === 0) {
      const html = await res.text();
      const before = page.hashes.size;
      for (const m of html.matchAll(INLINE_SCRIPT)) page.hashes.add(createHash('sha256').update(m[1]!, 'utf8').digest('base64'));
      if (page.hashes.size !== before || page.renders === 1) page.policy = policy(page.hashes);
      const h = new Headers(res.headers);
      h.delete('content-length');
      h.set('Content-Security-Policy', page.policy);
      res = new Response(html, { status: res.status, statusText: res.statusText, headers: h });
    } else {
      res.headers.set('Content-Security-Policy', page.policy);
    }
  }
  const h = res.headers;
  for (const [k, v] of Object.entries(SECURITY_HEADERS)) h.set(k, v);
  if (!h.has('Content-Security-Policy')) h.set('Content-Security-Policy', policy([]));
  return res;
});

/**
 * The landing page is the same for every anonymous visitor (its demo forecast is computed from the
 * invented demo plan and today's date): its HTML is kept for LANDING_TTL_MS and for today only.
 * A request carrying a session cookie never reads nor fills it, and only an answer rendered with
 * no user is kept, so a signed-in page never reaches an anonymous visitor nor the other way round.
 * The page must not depend on anything else of the request (another cookie, Accept-Language).
 */
const LANDING_TTL_MS = 60_000;
type Landing = { body: string; headers: [string, string][]; until: number; day: string };
// Shared with server.mjs, which answers a fresh entry to a request without a session cookie
// before Astro's pipeline (the same rules as below); this step fills it.
const LANDING = Symbol.for('sunreckon.landing');
const shared = globalThis as unknown as Record<symbol, Landing | null>;
let landing: Landing | null = null;
const SESSION_COOKIE = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_(?:token|data)=/;

function hasSessionCookie(cookie: string | null): boolean {
  return cookie !== null && SESSION_COOKIE.test(cookie);
}

const landingCache = defineMiddleware(async (ctx, next) => {
  if (ctx.url.pathname !== '/' || ctx.url.search !== '' || (ctx.request.method !== 'GET' && ctx.request.method !== 'HEAD') || hasSessionCookie(ctx.request.headers.get('cookie'))) {
    return next();
  }
  const now = Date.now();
  const day = new Date(now).toISOString().slice(0, 10);
  if (landing && landing.until > now && landing.day === day) {
    return new Response(ctx.request.method === 'HEAD' ? null : landing.body, { status: 200, headers: [...landing.headers, ['X-Sunreckon-Cache', 'hit']] });
  }
  const res = await next();
  if (res.status !== 200 || ctx.locals.user || !/^text\/html\b/i.test(res.headers.get('content-type') ?? '') || res.headers.has('set-cookie')) return res;
  const body = await res.text();
  const headers = [...res.headers].filter(([k]) => k !== 'content-length');
  landing = { body, headers, until: now + LANDING_TTL_MS, day };
  shared[LANDING] = landing;
  return new Response(ctx.request.method === 'HEAD' ? null : body, { status: 200, headers });
});

export const onRequest = sequence(landingCache, headers, formOrigin, noNul, sameOrigin, session, guard);
