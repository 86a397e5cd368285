// Fetchers of the quick plan: the place search and the zone lookup, typed by what the server's
// own routes answer (GET /api/places, GET /api/timezone).
import { apiFetch } from '../../lib/query-client';
import type { Place as FoundPlace } from '../../server/places';

/** A found place as the quick plan offers it (a view of the server's Place: region and country in one line). */
export interface PlaceChoice {
  name: string;
  /** Region and country, for telling same-named places apart. */
  where: string;
  lat: number;
  lon: number;
  timeZone: string;
}

/** A found place for the quick plan: region and country by name ("Ontario, Canada"); a bare numeric region code ("06") is left out. */
export function toPlace(p: FoundPlace): PlaceChoice {
  const where = placeWhere(p);
  return { name: p.name, where, lat: p.lat, lon: p.lon, timeZone: p.timeZone };
}

/** "Ontario, Canada" — a place's region and country in words; a region the gazetteer cannot name shows its code unless it is a bare number. */
export function placeWhere(p: Pick<FoundPlace, 'region' | 'adminCode' | 'countryName' | 'country'>): string {
  const region = p.region || (/^\d+$/.test(p.adminCode) ? '' : p.adminCode);
  return [region, p.countryName || p.country].filter(Boolean).join(', ');
}

/** Searches places by name (`GET /api/places?q=`). */
export async function searchPlaces(q: string, signal?: AbortSignal): Promise<PlaceChoice[]> {
  const list = await apiFetch<FoundPlace[]>(`/api/places?q=${encodeURIComponent(q)}`, { signal });
  return list.map(toPlace).slice(0, 8);
}

/** The IANA zone at a point: the server's lookup, else (the server out of reach) the same open data looked up in the browser. */
export async function lookupTimeZone(lat: number, lon: number): Promise<string | null> {
  try {
    const { timeZone } = await apiFetch<{ timeZone: string }>(`/api/timezone?lat=${lat}&lon=${lon}`);
    return timeZone;
  } catch {
    // Fall through to the browser-side lookup.
  }
  try {
    const mod = await import('@photostructure/tz-lookup');
    const tzlookup = (mod as unknown as { default?: (a: number, b: number) => string }).default ?? (mod as unknown as (a: number, b: number) => string);
    return tzlookup(lat, lon);
  } catch {
    return null;
  }
}
