import { runForecast } from '../../../engine';
import { env } from '../../../server/env';
import { json, readJson, route } from '../../../server/http';
import { limit } from '../../../server/rate-limit';

export const prerender = false;

/** Anonymous forecast of a plan sent in full (the quick plan); rate limited per client. */
export const POST = route(async (ctx) => {
  await limit(ctx, 'preview', env.PREVIEW_RATE_LIMIT);
  const body = await readJson(ctx.request, 256 * 1024, 'invalid_plan');
  const result = runForecast(body);
  if (!result.ok) return json(result.envelope, 400);
  return json(result.forecast);
});
