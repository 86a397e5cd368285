import { z } from 'zod';
import { json, parseWith, route } from '../../server/http';
import { timeZoneAt } from '../../server/places';

/** A query-string number: present, a plain decimal, within bounds (an empty value is not 0). */
function coordinate(label: string, min: number, max: number) {
  const msg = `Give ${label} as a number from ${min} to ${max}.`;
  return z
    .string({ error: msg })
    .trim()
    .regex(/^[+-]?(\d+(\.\d*)?|\.\d+)$/, { error: msg })
    .transform(Number)
    .pipe(z.number().min(min, { error: msg }).max(max, { error: msg }));
}

const query = z.object({ lat: coordinate('the latitude', -90, 90), lon: coordinate('the longitude', -180, 180) });

/** Public: the IANA time zone at a point. */
export const GET = route((ctx) => {
  const { lat, lon } = parseWith(query, Object.fromEntries(ctx.url.searchParams));
  return json({ timeZone: timeZoneAt(lat, lon) }, 200, { 'cache-control': 'public, max-age=86400' });
});
