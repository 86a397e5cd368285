import { z } from 'zod';
import { db } from '../../../server/db';
import { turnFakeWeather, readFakeWeather } from '../../../server/dev-weather';
import { env } from '../../../server/env';
import { HttpError } from '../../../server/errors';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';

export const prerender = false;

// Development only: the local fake weather service's turned weather (the /dev page's control).
const DATE = /^\d{4}-\d{2}-\d{2}$/;
const turnSchema = z.object(
  {
    mode: z.enum(['storm', 'normal'], { error: "must be 'storm' or 'normal'" }),
    from: z
      .string({ error: 'must be a date, YYYY-MM-DD' })
      .refine((s) => DATE.test(s) && new Date(`${s}T00:00:00Z`).toISOString().slice(0, 10) === s, { error: 'must be a date, YYYY-MM-DD' })
      .nullish(),
  },
  { error: 'must be an object with mode' },
);

function devOnly(): void {
  if (env.isProduction) throw new HttpError('not_found', 'Not found.');
}

/** The fake's weather now: `{ mode, from }`. */
export const GET = route(async (ctx) => {
  devOnly();
  requireUser(ctx);
  return json(await readFakeWeather(env.WEATHER_FORECAST_URL));
});

/** `{ mode: 'storm' | 'normal', from?: 'YYYY-MM-DD' }`: turns the fake's forecast weather and forgets the cached forecasts; answers as GET does. */
export const POST = route(async (ctx) => {
  devOnly();
  requireUser(ctx);
  const body = parseWith(
    turnSchema,
    await readJson(ctx.request, 1024),
    'invalid_request',
    'Say which weather: { "mode": "storm" } or "normal".',
  );
  const turned = await turnFakeWeather(env.WEATHER_FORECAST_URL, body);
  // The cached forecast answers came from the weather before the turn: drop them, so the next
  // forecast or watch run asks the fake again (past years never turn and stay cached).
  await db.deleteFrom('weather_cache').where('kind', '=', 'forecast').execute();
  return json(turned);
});
