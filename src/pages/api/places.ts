import { z } from 'zod';
import { json, parseWith, route } from '../../server/http';
import { searchPlaces } from '../../server/places';

const query = z.object({
  q: z
    .string({ error: 'Type at least 2 letters of the place.' })
    .trim()
    .min(2, { error: 'Type at least 2 letters of the place.' })
    .max(100, { error: 'Use at most 100 characters.' }),
});

/** Public place search: up to 10 places starting with `q`, most populous first. */
export const GET = route((ctx) => {
  const { q } = parseWith(query, Object.fromEntries(ctx.url.searchParams));
  return json(searchPlaces(q), 200, { 'cache-control': 'public, max-age=86400' });
});
