import { beforeAll, describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/engine';
import { savedForecastFromJson } from '../../src/features/forecast/forecast.api';
import { formatWh, pct } from '../../src/lib/format';
import { api, signUp, type Session } from '../helpers/api';

/**
 * The saved forecast page hands its island the forecast as one JSON string with the hours as
 * columns (savedForecastToJson) instead of an object prop, which Astro writes value by value; the
 * string is written once into a template beside the island, not as a prop (page-text.ts). The
 * island must still get every figure the API gives, and the page still shows them from the server.
 */

function decodeAttr(s: string): string {
  return s.replaceAll('&quot;', '"').replaceAll('&#39;', "'").replaceAll('&lt;', '<').replaceAll('&gt;', '>').replaceAll('&amp;', '&');
}

/** The props of the forecast island on a page, as Astro wrote them ([type, value] pairs). */
function islandProps(html: string): Record<string, [number, unknown]> {
  const island = [...html.matchAll(/<astro-island\b[^>]*>/g)].map((m) => m[0]).find((tag) => /component-url="[^"]*ForecastFromApi/.test(tag));
  if (!island) throw new Error('no ForecastFromApi island on the page');
  const props = /\sprops="([^"]*)"/.exec(island);
  if (!props) throw new Error('the island has no props');
  return JSON.parse(decodeAttr(props[1]!)) as Record<string, [number, unknown]>;
}

/** The forecast's text the page writes for its island (a template's text content). */
function pageText(html: string, id: string): string {
  const m = new RegExp(`<template id="forecast-data-${id}">([^<]*)</template>`).exec(html);
  if (!m) throw new Error('no forecast text on the page');
  return m[1]!.replaceAll('&lt;', '<').replaceAll('&amp;', '&');
}

describe('the saved forecast page', () => {
  let owner: Session;
  let tripId: string;
  let forecastId: string;

  beforeAll(async () => {
    owner = await signUp({ name: 'Page Owner' });
    const plan = demoPlan() as Record<string, any>;
    const rig = await (await api('/api/rigs', { method: 'POST', session: owner, json: { name: 'Props van', bank: plan.bank, arrays: plan.arrays, chargers: plan.chargers, inverter: plan.inverter ?? null } })).json();
    for (const load of plan.loads) expect((await api(`/api/rigs/${rig.id}/loads`, { method: 'POST', session: owner, json: load })).status).toBe(201);
    const trip = await (await api('/api/trips', { method: 'POST', session: owner, json: { rigId: rig.id, name: 'Props loop', stops: plan.stops, drives: plan.drives } })).json();
    tripId = trip.id;
    const saved = await api(`/api/trips/${tripId}/forecasts`, { method: 'POST', session: owner, json: { name: 'Props check' } });
    expect(saved.status).toBe(201);
    forecastId = (await saved.json()).id;
  });

  it('gives the island the saved forecast as one string that decodes to what the API answers', async () => {
    const res = await api(`/trips/${tripId}/forecasts/${forecastId}`, { session: owner });
    expect(res.status).toBe(200);
    const html = await res.text();
    const props = islandProps(html);
    expect(props.initial).toBeUndefined();
    // The text is written once, in a template before the island, not as a prop (page-text.ts).
    expect(props.initialJson).toBeUndefined();
    expect(props.pageText).toEqual([0, {}]);
    const text = pageText(html, forecastId);
    expect(html.indexOf(`<template id="forecast-data-${forecastId}">`)).toBeLessThan(html.indexOf('<astro-island'));

    const fromApi = await (await api(`/api/forecasts/${forecastId}`, { session: owner })).json();
    const { rigId: _rig, ...expected } = fromApi;
    const decoded = savedForecastFromJson(text);
    expect(decoded).toEqual(expected);
    expect(decoded.forecast.hourly).toHaveLength(fromApi.forecast.summary.hoursSimulated);
    // The hours travel as columns: each field's name once, not once an hour.
    expect(text.split('"socPct"').length - 1).toBe(1);
    expect(text.length).toBeLessThan(JSON.stringify(expected).length);

    // The page itself, rendered on the server, shows the forecast's figures.
    const s = fromApi.forecast.summary;
    expect(html).toContain('data-testid="forecast-view"');
    expect(html).toContain(pct(s.minSocPct));
    expect(html).toContain(formatWh(s.solarWh));
  });
});
