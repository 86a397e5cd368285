import { db } from '../../server/db';
import { HttpError } from '../../server/errors';
import { json, parseWith, readJson, requireUser, route } from '../../server/http';
import { getPriceList, putPriceList } from '../../server/price-lists';
import { priceListPutSchema } from '../../domain/proposals/proposals.schema';

export const prerender = false;

function installer(ctx: Parameters<Parameters<typeof route>[0]>[0]) {
  const user = requireUser(ctx);
  if ((user as { kind?: string }).kind !== 'installer') throw new HttpError('forbidden', 'Price lists belong to installer accounts.');
  return user;
}

/** The signed-in installer's price list (version 0 and every price 0 until they save one). */
export const GET = route(async (ctx) => json(await getPriceList(db, installer(ctx).id)));

/** Saves the installer's price list; `version` is the one read (0 for a first save), 409 when stale. */
export const PUT = route(async (ctx) => {
  const user = installer(ctx);
  const body = parseWith(priceListPutSchema, await readJson(ctx.request, 16 * 1024));
  return json(await putPriceList(db, user.id, body));
});
