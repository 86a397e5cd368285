import { toColumns } from '../../../lib/forecast-columns';
import { env } from '../../../server/env';
import { json, readJson, route } from '../../../server/http';
import { limit } from '../../../server/rate-limit';
import { runCachedForecast } from '../../../server/sun-cache';

export const prerender = false;

/**
 * Anonymous forecast of a plan sent in full (the quick plan); rate limited per client. The trip's
 * sun comes from the process's cache when the same places, dates and arrays were forecast lately.
 * `?hourly=columns` answers the hours as columns (src/lib/forecast-columns.ts), as the quick plan asks.
 */
export const POST = route(async (ctx) => {
  await limit(ctx, 'preview', env.PREVIEW_RATE_LIMIT);
  const body = await readJson(ctx.request, 256 * 1024, 'invalid_plan');
  const result = runCachedForecast(body);
  if (!result.ok) return json(result.envelope, 400);
  return json(ctx.url.searchParams.get('hourly') === 'columns' ? toColumns(result.forecast) : result.forecast);
});
