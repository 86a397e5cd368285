// The load catalogue of the rig pages: typical rig appliances to start a load from. Its figures are
// the one set of typical figures in ./typical.ts (shared with the quick plan), each with where it
// comes from. Every figure is TYPICAL: the camper checks the appliance's label and confirms the
// number before the load is added.
import type { LoadInput } from './loads.schema';
import { TYPICAL_LOADS, SURGE_TYPICAL, type TypicalLoad } from './typical';

export type CatalogueItem = TypicalLoad;
export { SURGE_TYPICAL };

/** The catalogue, in the order the picker shows it. */
export const CATALOGUE: readonly CatalogueItem[] = TYPICAL_LOADS;

/** How the picker names where a figure comes from. */
export function basisLabel(item: Pick<CatalogueItem, 'basis'>): string {
  if (item.basis === 'trade notes') return 'From published measurements and makers’ category figures';
  if (item.basis === 'common practice') return 'Common practice (a rule of thumb)';
  return 'From memory — the roughest kind of typical figure';
}

/** A catalogue item as a load the camper is about to confirm. */
export function catalogueToLoad(item: CatalogueItem): LoadInput {
  return {
    name: item.name,
    watts: item.watts,
    quantity: item.quantity ?? 1,
    supply: item.supply,
    windows: item.windows.map(([a, b]) => [a, b] as [number, number]),
    dutyPct: item.dutyPct,
    days: item.days ?? 'all',
    response: item.response ?? 'none',
    setpointC: item.setpointC ?? 18,
    location: 'cabin',
    surgeWatts: item.surgeWatts ?? null,
    standby: item.standby ?? false,
    note: '',
  };
}
