import { env } from '../../../server/env';
import { JSON_HEADERS, readJsonText, route } from '../../../server/http';
import { limit } from '../../../server/rate-limit';
import { PREVIEW_MAX_BYTES, previewAnswer, previewDirect } from '../../../server/preview-direct';

export const prerender = false;

// From the first preview on, server.mjs answers the plain case of this route directly, before
// Astro's pipeline (src/server/preview-direct.ts); SUNRECKON_PREVIEW_DIRECT=0 keeps every preview here.
if (process.env.SUNRECKON_PREVIEW_DIRECT !== '0') (globalThis as Record<symbol, unknown>)[Symbol.for('sunreckon.preview')] = previewDirect;

/**
 * Anonymous forecast of a plan sent in full (the quick plan); rate limited per client. The trip's
 * sun comes from the process's cache when the same places, dates and arrays were forecast lately,
 * and the same body sent again gets the answer kept for it.
 * `?hourly=columns` answers the hours as columns (src/lib/forecast-columns.ts), as the quick plan asks.
 */
export const POST = route(async (ctx) => {
  await limit(ctx, 'preview', env.PREVIEW_RATE_LIMIT);
  const text = await readJsonText(ctx.request, PREVIEW_MAX_BYTES, 'invalid_plan');
  const a = previewAnswer(text, ctx.url.searchParams.get('hourly') === 'columns');
  // A copy: the kept answer must not be handed to the Response (which may take its buffer over).
  return new Response(new Uint8Array(a.body), { status: a.status, headers: JSON_HEADERS });
});
