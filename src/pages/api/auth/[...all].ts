import type { APIRoute } from 'astro';
import { auth, CLIENT_IP_HEADER } from '../../../server/auth';
import { clientKey } from '../../../server/rate-limit';

export const prerender = false;

/** better-auth's handler: sign up, sign in, sign out, session, password reset. */
export const ALL: APIRoute = async (ctx) => {
  // Rate limits key on the socket address; a header sent by the client is never trusted.
  const headers = new Headers(ctx.request.headers);
  headers.set(CLIENT_IP_HEADER, clientKey(ctx));
  const body = ctx.request.method === 'GET' || ctx.request.method === 'HEAD' ? undefined : await ctx.request.arrayBuffer();
  return auth.handler(new Request(ctx.request.url, { method: ctx.request.method, headers, body }));
};
