import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import { priceListSchema, type PriceList } from '../domain/proposals/proposals.schema';
import { NO_WIRING_PRICES } from '../domain/proposals/document.schema';
import { HttpError } from './errors';
import { conflict, nowIso } from './versions';

// Each installer keeps one price list in one currency. It is versioned like every editable row:
// a save names the version it read (0 before the first save) and a stale one answers 409.

/** The price list as the API shows it; `saved: false` and version 0 until the installer saves one. */
export interface PriceListDto extends PriceList {
  version: number;
  saved: boolean;
  updatedAt: string | null;
}

/** An unsaved list: every price 0, nothing invented. */
function emptyList(): PriceListDto {
  return {
    currency: 'USD',
    bankPerAh: { lifepo4: 0, agm: 0, flooded: 0, gel: 0 },
    bankInstall: 0,
    panelPerWatt: 0,
    arrayInstall: { flat: 0, tilted: 0, portable: 0 },
    dcdcPerAmp: 0,
    dcdcInstall: 0,
    generator: 0,
    generatorPerHour: 0,
    wiring: { ...NO_WIRING_PRICES },
    version: 0,
    saved: false,
    updatedAt: null,
  };
}

/** The installer's price list, or an empty unsaved one. */
export async function getPriceList(db: Kysely<DB>, installerId: string): Promise<PriceListDto> {
  const row = await db.selectFrom('price_lists').selectAll().where('installer_id', '=', installerId).executeTakeFirst();
  if (!row) return emptyList();
  // Stored rows were validated on the way in; parsing again keeps a hand-edited row from reaching the sweep.
  const parsed = priceListSchema.safeParse({ ...JSON.parse(row.prices), currency: row.currency });
  if (!parsed.success) return { ...emptyList(), version: row.version, saved: true, updatedAt: row.updated_at };
  return { ...parsed.data, version: row.version, saved: true, updatedAt: row.updated_at };
}

/** The saved list for a sweep or a proposal, or a 400 naming `prices` when there is none. */
export async function savedPricesOrThrow(db: Kysely<DB>, installerId: string): Promise<PriceList> {
  const dto = await getPriceList(db, installerId);
  if (!dto.saved) {
    throw new HttpError('invalid_request', 'Save your price list first (“First, your price list” on this page): sweeps and proposals are priced from it.', [
      { path: 'prices', message: 'There is no saved price list yet: save yours, or send prices with this request.' },
    ]);
  }
  const { version: _v, saved: _s, updatedAt: _u, ...prices } = dto;
  return prices;
}

/** Saves the installer's list when `version` is the one stored (0 for the first save); 409 with the current list otherwise. */
export async function putPriceList(db: Kysely<DB>, installerId: string, input: PriceList & { version: number }): Promise<PriceListDto> {
  const { version, currency, ...prices } = input;
  const now = nowIso();
  await db.transaction().execute(async (trx) => {
    const row = await trx.selectFrom('price_lists').select('version').where('installer_id', '=', installerId).executeTakeFirst();
    if (!row) {
      if (version !== 0) throw conflict('price list', await getPriceList(trx, installerId));
      await trx.insertInto('price_lists').values({ installer_id: installerId, currency, prices: JSON.stringify(prices), created_at: now, updated_at: now }).execute();
      return;
    }
    const res = await trx
      .updateTable('price_lists')
      .set({ currency, prices: JSON.stringify(prices), version: row.version + 1, updated_at: now })
      .where('installer_id', '=', installerId)
      .where('version', '=', version)
      .executeTakeFirst();
    if (res.numUpdatedRows !== 1n) throw conflict('price list', await getPriceList(trx, installerId));
  });
  return getPriceList(db, installerId);
}
