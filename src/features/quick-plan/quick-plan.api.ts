// Fetchers of the quick plan: the place search and the zone lookup, both tolerant of a server
// that does not offer them yet (the form then falls back to coordinates and a zone list).
import { apiFetch } from '../../lib/query-client';

/** A place found by the search. */
export interface Place {
  name: string;
  /** Region and country, for telling same-named places apart. */
  where: string;
  lat: number;
  lon: number;
  timeZone: string | null;
}

function num(x: unknown): number | null {
  const n = typeof x === 'string' ? Number(x) : x;
  return typeof n === 'number' && Number.isFinite(n) ? n : null;
}

/** Reads one place from the search's JSON, whatever its exact field names; null when unusable. Numeric region codes ("06") mean nothing to a camper and are left out. */
export function toPlace(raw: unknown): Place | null {
  if (!raw || typeof raw !== 'object') return null;
  const r = raw as Record<string, unknown>;
  const name = typeof r.name === 'string' ? r.name : null;
  const lat = num(r.lat ?? r.latitude);
  const lon = num(r.lon ?? r.lng ?? r.longitude);
  if (!name || lat === null || lon === null) return null;
  const where = [r.region ?? r.adminName ?? r.admin1 ?? r.state ?? r.adminCode, r.country ?? r.countryName ?? r.countryCode].filter((x) => typeof x === 'string' && x && !/^\d+$/.test(x)).join(', ');
  const tz = r.timeZone ?? r.timezone ?? r.tz;
  return { name, where: typeof r.label === 'string' && !where ? r.label : where, lat, lon, timeZone: typeof tz === 'string' ? tz : null };
}

/** Searches places by name (`GET /api/places?q=`). */
export async function searchPlaces(q: string, signal?: AbortSignal): Promise<Place[]> {
  const data = await apiFetch<unknown>(`/api/places?q=${encodeURIComponent(q)}`, { signal });
  const list = Array.isArray(data) ? data : ((data as Record<string, unknown>)?.places ?? (data as Record<string, unknown>)?.results ?? []);
  return (Array.isArray(list) ? list : []).map(toPlace).filter((p): p is Place => p !== null).slice(0, 8);
}

/** The IANA zone at a point: the server's lookup, else the same open data looked up in the browser. */
export async function lookupTimeZone(lat: number, lon: number): Promise<string | null> {
  try {
    const data = await apiFetch<Record<string, unknown>>(`/api/timezone?lat=${lat}&lon=${lon}`);
    const tz = data?.timeZone ?? data?.timezone ?? data?.zone;
    if (typeof tz === 'string') return tz;
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
