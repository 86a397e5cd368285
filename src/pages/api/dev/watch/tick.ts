import { z } from 'zod';
import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { env } from '../../../../server/env';
import { errorResponse, json, parseWith, readJson, route } from '../../../../server/http';
import { runWatchTick } from '../../../../server/watch-run';

export const prerender = false;

const tickSchema = z.object({
  now: z.iso.datetime({ offset: true, error: 'must be an ISO date and time, e.g. 2026-12-04T18:00:00Z' }).optional(),
});

/**
 * Development and tests only (404 in production): one trip watch tick now, on the clock `now` when
 * given (no waiting for real time). Answers what it did: `{ ran, changed, mailed }`.
 */
export const POST = route(async (ctx) => {
  if (env.isProduction) return errorResponse('not_found', 'Not found.');
  const hasBody = (ctx.request.headers.get('content-length') ?? '0') !== '0' || ctx.request.headers.has('content-type');
  const body = hasBody ? parseWith(tickSchema, await readJson(ctx.request, 1024), 'invalid_request', 'The tick needs fixing.') : {};
  const now = body.now ? new Date(body.now) : new Date();
  return json(await runWatchTick(db, { now, origin: appOrigin(ctx.url) }));
});
