import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeWeather, type FakeWeather } from '../../scripts/fakes/weather';
import { fakeWeatherOrigin, readFakeWeather, turnFakeWeather } from '../../src/server/dev-weather';
import { HttpError } from '../../src/server/errors';

// The /dev page's weather control, against the real local fake: it turns the fake's weather only
// when the app's weather service is on loopback, and says plainly when it cannot.

let fake: FakeWeather;
beforeAll(async () => {
  fake = await startFakeWeather({ quiet: true });
});
afterAll(async () => {
  await fake.stop();
});

describe('turning the weather from /dev', () => {
  it('treats only a plain-http loopback weather URL as the local fake', () => {
    expect(fakeWeatherOrigin('http://127.0.0.1:8642/v1/forecast')).toBe('http://127.0.0.1:8642');
    expect(fakeWeatherOrigin('http://localhost:8642/v1/forecast')).toBe('http://localhost:8642');
    expect(fakeWeatherOrigin('http://[::1]:8642/v1/forecast')).toBe('http://[::1]:8642');
    expect(fakeWeatherOrigin('https://api.open-meteo.com/v1/forecast')).toBeNull();
    expect(fakeWeatherOrigin('http://10.0.0.5:8642/v1/forecast')).toBeNull();
    expect(fakeWeatherOrigin('not a url')).toBeNull();
  });

  it('turns the fake to a storm and back, and reads it back', async () => {
    expect(await turnFakeWeather(fake.forecastUrl, { mode: 'storm', from: '2026-12-08' })).toEqual({ mode: 'storm', from: '2026-12-08' });
    expect(await readFakeWeather(fake.forecastUrl)).toEqual({ mode: 'storm', from: '2026-12-08' });
    expect(await (await fetch(`${fake.url}/__fake/turn`)).json()).toEqual({ mode: 'storm', from: '2026-12-08' });
    expect(await turnFakeWeather(fake.forecastUrl, { mode: 'normal' })).toEqual({ mode: 'normal', from: null });
  });

  it('refuses a real service, and says so when the fake does not answer', async () => {
    const real = await turnFakeWeather('https://api.open-meteo.com/v1/forecast', { mode: 'storm' }).catch((e: unknown) => e);
    expect(real).toBeInstanceOf(HttpError);
    expect((real as HttpError).issues).toEqual([{ path: 'WEATHER_FORECAST_URL', message: 'not a loopback URL' }]);
    const gone = await startFakeWeather({ quiet: true });
    await gone.stop();
    const silent = await readFakeWeather(gone.forecastUrl).catch((e: unknown) => e);
    expect(silent).toBeInstanceOf(HttpError);
    expect((silent as HttpError).message).toMatch(/did not answer/);
  });
});
