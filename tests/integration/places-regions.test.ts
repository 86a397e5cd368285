import { describe, expect, it } from 'vitest';
import { api } from '../helpers/api';

// The place search as the built server answers it: short forms and punctuation read alike, and
// regions by name (GeoNames' admin1 list: Canada's 08 is Ontario).

describe('GET /api/places with short forms and region names', () => {
  it('finds Sault Ste. Marie typed without the dot, named with its province and country', async () => {
    const res = await api(`/api/places?q=${encodeURIComponent('Sault Ste Marie, Ontario')}`);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual([
      expect.objectContaining({
        name: 'Sault Ste. Marie',
        adminCode: '08',
        region: 'Ontario',
        country: 'CA',
        countryName: 'Canada',
        timeZone: 'America/Toronto',
      }),
    ]);
  });

  it('finds Saint Ignace typed as "St. Ignace"', async () => {
    const places = await (await api(`/api/places?q=${encodeURIComponent('St. Ignace')}`)).json();
    expect(places).toContainEqual(expect.objectContaining({ name: 'Saint Ignace', region: 'Michigan', timeZone: 'America/Detroit' }));
  });
});
