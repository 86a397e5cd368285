// The /dev page's "turn the weather" control: asks the local fake weather service (scripts/fakes/
// weather.ts) to answer its forecasts with a storm, or normally again. Only when the app's weather
// service is a loopback URL — a real service is never sent a control request. Never in production
// (the API route answers 404 there).
import { HttpError } from './errors';

export interface WeatherTurn {
  mode: 'normal' | 'storm';
  from: string | null;
}

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '[::1]', '::1']);

/** The fake's origin when `forecastUrl` is on loopback (so it can be the local fake), else null. */
export function fakeWeatherOrigin(forecastUrl: string): string | null {
  try {
    const u = new URL(forecastUrl);
    return u.protocol === 'http:' && LOOPBACK.has(u.hostname) ? u.origin : null;
  } catch {
    return null;
  }
}

function originOrRefuse(forecastUrl: string): string {
  const origin = fakeWeatherOrigin(forecastUrl);
  if (!origin)
    throw new HttpError(
      'conflict',
      'The weather comes from a real service (WEATHER_FORECAST_URL is not on this machine), so it cannot be turned. Start the app with the local fake weather service (npm run demo does).',
      [{ path: 'WEATHER_FORECAST_URL', message: 'not a loopback URL' }],
    );
  return origin;
}

async function call(url: string, init?: RequestInit): Promise<WeatherTurn> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, signal: AbortSignal.timeout(3000) });
  } catch {
    throw new HttpError('conflict', 'The local fake weather service did not answer. Is it running (npx tsx scripts/fakes/weather.ts)?', [
      { path: 'WEATHER_FORECAST_URL', message: 'no answer' },
    ]);
  }
  const body = (await res.json().catch(() => null)) as (WeatherTurn & { error?: string }) | null;
  if (!res.ok || !body || (body.mode !== 'normal' && body.mode !== 'storm'))
    throw new HttpError(
      'conflict',
      `The weather service at WEATHER_FORECAST_URL is not the local fake, or refused: ${body?.error ?? `status ${res.status}`}.`,
      [{ path: 'WEATHER_FORECAST_URL', message: 'not the local fake' }],
    );
  return { mode: body.mode, from: body.from ?? null };
}

/** The fake's weather as it is now. */
export async function readFakeWeather(forecastUrl: string): Promise<WeatherTurn> {
  return call(`${originOrRefuse(forecastUrl)}/__fake/turn`);
}

/** Turns the fake's forecast weather to a storm (from local midnight of `from`, or every hour) or back to normal. */
export async function turnFakeWeather(
  forecastUrl: string,
  turn: { mode: WeatherTurn['mode']; from?: string | null },
): Promise<WeatherTurn> {
  return call(`${originOrRefuse(forecastUrl)}/__fake/turn`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(turn.from ? { mode: turn.mode, from: turn.from } : { mode: turn.mode }),
  });
}
