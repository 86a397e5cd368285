import type { APIRoute } from 'astro';
import { auth, CLIENT_IP_HEADER } from '../../../server/auth';
import { AUTH_BODY_MAX_BYTES, checkAuthBody, withoutTokens } from '../../../server/auth-input';
import { readLimited, route } from '../../../server/http';
import { clientKey } from '../../../server/rate-limit';

export const prerender = false;

// Endpoints whose answer lists sessions: the raw tokens are taken out before it reaches the browser.
const SESSION_LISTS = new Set(['/api/auth/list-sessions', '/api/auth/get-session']);

/** better-auth's handler: sign up, sign in, sign out, session, password reset. */
export const ALL: APIRoute = route(async (ctx) => {
  // Rate limits key on the socket address; a header sent by the client is never trusted.
  const headers = new Headers(ctx.request.headers);
  headers.set(CLIENT_IP_HEADER, clientKey(ctx));
  const method = ctx.request.method;
  // Bounded like every other route (413 past 64 KB), and the app's field rules first (400 in our envelope).
  const body =
    method === 'GET' || method === 'HEAD'
      ? undefined
      : checkAuthBody(ctx.url.pathname, await readLimited(ctx.request, AUTH_BODY_MAX_BYTES));
  if (body) headers.delete('content-length');
  const res = await auth.handler(new Request(ctx.request.url, { method, headers, body: body as BodyInit | undefined }));
  if (!SESSION_LISTS.has(ctx.url.pathname.replace(/\/+$/, '')) || !res.ok || !/json/.test(res.headers.get('content-type') ?? ''))
    return res;
  const out = new Headers(res.headers);
  out.delete('content-length');
  return new Response(JSON.stringify(withoutTokens(await res.json())), { status: res.status, headers: out });
});
