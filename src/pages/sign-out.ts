import type { APIRoute } from 'astro';
import { auth } from '../server/auth';

/** Form-post sign-out (works without JavaScript); clears the session cookie and goes home. */
export const POST: APIRoute = async (ctx) => {
  const headers = new Headers({ location: '/' });
  try {
    const res = await auth.api.signOut({ headers: ctx.request.headers, asResponse: true });
    for (const c of res.headers.getSetCookie()) headers.append('set-cookie', c);
  } catch {
    // No session: nothing to clear.
  }
  return new Response(null, { status: 303, headers });
};
