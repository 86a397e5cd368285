// Our own catalogue of typical rig appliances. Draw ranges come from the trade notes
// (/work/shared/reference/trade-notes.md: manufacturer category figures and practitioners'
// measurements, converted from amps at 12 V). Every figure is TYPICAL: the camper checks the
// appliance's label and confirms the number before the load is added. Surge figures (a motor or
// magnetron starting, a heating element at full power) are common practice, from memory where the
// trade notes give none, and marked so wherever they are shown.
import type { LoadInput } from './loads.schema';

export interface CatalogueItem {
  id: string;
  name: string;
  /** Typical running draw range in watts (AC watts for AC loads). */
  minWatts: number;
  maxWatts: number;
  /** The starting value offered, inside the range. */
  watts: number;
  supply: 'dc' | 'ac';
  windows: [number, number][];
  dutyPct: number;
  quantity?: number;
  response?: 'none' | 'cooling' | 'heating';
  setpointC?: number;
  standby?: boolean;
  /** Typical draw of one unit while starting or running flat out, W (common practice; check the label). */
  surgeWatts?: number;
  /** Where the surge figure comes from, in a line. */
  surgeAbout?: string;
  /** What the range means and when it runs, in a line. */
  about: string;
}

/** The words that go with every catalogue surge figure. */
export const SURGE_TYPICAL = 'Typical — common practice, check the label.';

export const CATALOGUE: CatalogueItem[] = [
  { id: 'compressor-fridge', name: '12 V compressor fridge', minWatts: 35, maxWatts: 60, watts: 45, supply: 'dc', windows: [[0, 24]], dutyPct: 50, response: 'cooling',
    surgeWatts: 100, surgeAbout: 'The compressor starting draws about twice its running power for a moment (common practice, from memory).',
    about: 'Draws 35–60 W while the compressor runs (40–90 L); cycles about half the time, more in heat.' },
  { id: 'absorption-fridge', name: 'Absorption fridge on propane (control board)', minWatts: 3, maxWatts: 18, watts: 6, supply: 'dc', windows: [[0, 24]], dutyPct: 100,
    about: 'The control board draws 0.25–1.5 A, typically 0.5 A; a door heater adds about 3 W.' },
  { id: 'furnace-blower', name: 'Propane furnace blower', minWatts: 34, maxWatts: 108, watts: 60, supply: 'dc', windows: [[18, 8]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: '2.8 A on a small furnace to 9 A on a large one; runs more the colder it is outside. The top cold-night drain.' },
  { id: 'diesel-heater', name: 'Diesel air heater', minWatts: 5, maxWatts: 30, watts: 20, supply: 'dc', windows: [[18, 8]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: 'A few watts to about 30 W running, after a glow-plug start of 2–3 minutes.' },
  { id: 'water-pump', name: 'Water pump', minWatts: 36, maxWatts: 72, watts: 50, supply: 'dc', windows: [[7, 8], [19, 20]], dutyPct: 20,
    surgeWatts: 100, surgeAbout: 'The motor starting draws about twice its running power (common practice, from memory).',
    about: '3–6 A while it runs; minutes a day.' },
  { id: 'led-lights', name: 'LED lights', minWatts: 1, maxWatts: 3, watts: 1.5, quantity: 6, supply: 'dc', windows: [[18, 23]], dutyPct: 100,
    about: 'About 0.1 A per fixture; evenings, longer in winter.' },
  { id: 'vent-fan', name: 'Roof vent fan', minWatts: 12, maxWatts: 22, watts: 18, supply: 'dc', windows: [[21, 7]], dutyPct: 100,
    about: '1.0, 1.5 or 1.8 A by speed; summer nights.' },
  { id: 'cpap-dry', name: 'CPAP, no humidifier', minWatts: 15, maxWatts: 30, watts: 25, supply: 'dc', windows: [[22, 6]], dutyPct: 40,
    about: 'About 25 W; one per sleeper, about 8 hours a night.' },
  { id: 'cpap-humid', name: 'CPAP with humidifier and heated hose', minWatts: 70, maxWatts: 80, watts: 78, supply: 'dc', windows: [[22, 6]], dutyPct: 45,
    about: '76–80 W while heating; about 8 hours a night.' },
  { id: 'laptop', name: 'Laptop (through the inverter)', minWatts: 40, maxWatts: 90, watts: 45, supply: 'ac', windows: [[9, 17]], dutyPct: 100,
    about: '3.5–8 A from the bank while charging; work hours.' },
  { id: 'phone', name: 'Phone charging', minWatts: 5, maxWatts: 10, watts: 6, quantity: 2, supply: 'dc', windows: [[20, 22]], dutyPct: 100,
    about: 'About 0.5 A each for 1–3 hours.' },
  { id: 'tv', name: 'TV', minWatts: 30, maxWatts: 75, watts: 35, supply: 'dc', windows: [[19, 22]], dutyPct: 100,
    about: 'About 35 W; up to 6 A with a receiver and sound bar.' },
  { id: 'microwave', name: 'Microwave (through the inverter)', minWatts: 1000, maxWatts: 1100, watts: 1050, supply: 'ac', windows: [[18, 19]], dutyPct: 15,
    surgeWatts: 1500, surgeAbout: 'Up to about 1,500 W AC as the magnetron starts (common practice).',
    about: 'An “800 W” oven draws 1000–1100 W AC (90–100 A from a 12 V bank) for minutes.' },
  { id: 'coffee', name: 'Coffee maker (through the inverter)', minWatts: 600, maxWatts: 1000, watts: 800, supply: 'ac', windows: [[7, 8]], dutyPct: 15,
    surgeWatts: 1000, surgeAbout: 'The heating element draws its full rating whenever it is on, up to about 1,000 W (common practice).',
    about: '600–1000 W for 5–15 minutes.' },
  { id: 'hair-dryer', name: 'Hair dryer (through the inverter)', minWatts: 800, maxWatts: 1800, watts: 1200, supply: 'ac', windows: [[7, 8]], dutyPct: 10,
    surgeWatts: 1800, surgeAbout: 'On its high setting a dryer draws its full rating, often 1,500–1,800 W (common practice, from memory).',
    about: '800–1800 W by setting (from memory, common practice); minutes a day. Often more than a small inverter can deliver.' },
  { id: 'home-fridge', name: 'Household fridge (through the inverter)', minWatts: 100, maxWatts: 200, watts: 150, supply: 'ac', windows: [[0, 24]], dutyPct: 35, response: 'cooling',
    surgeWatts: 1000, surgeAbout: 'An AC compressor starts at five to seven times its running power (common practice, from memory).',
    about: '100–200 W AC while the compressor runs (from memory, common practice); keeps the inverter on all day.' },
  { id: 'tank-heaters', name: 'Holding-tank heater pads', minWatts: 30, maxWatts: 60, watts: 45, supply: 'dc', windows: [[0, 24]], dutyPct: 100, response: 'heating', setpointC: 4,
    about: 'Several amps per pad, on a thermostat near 4 °C; can dominate in freezing weather.' },
  { id: 'standby', name: 'Standby draw (detectors, radio memory, control panels)', minWatts: 12, maxWatts: 16, watts: 13, supply: 'dc', windows: [[0, 24]], dutyPct: 100, standby: true,
    about: 'About 1–1.2 A in total on a trailer or motorhome with everything “off”: 25–30 Ah a day.' },
  { id: 'lp-detector', name: 'Propane/CO detector', minWatts: 0.1, maxWatts: 0.5, watts: 0.2, supply: 'dc', windows: [[0, 24]], dutyPct: 100, standby: true,
    about: 'About 17 mA; stays on even when a disconnect switch is off.' },
];

/** A catalogue item as a load the camper is about to confirm. */
export function catalogueToLoad(item: CatalogueItem): LoadInput {
  return {
    name: item.name,
    watts: item.watts,
    quantity: item.quantity ?? 1,
    supply: item.supply,
    windows: item.windows,
    dutyPct: item.dutyPct,
    days: 'all',
    response: item.response ?? 'none',
    setpointC: item.setpointC ?? 18,
    location: 'cabin',
    surgeWatts: item.surgeWatts ?? null,
    standby: item.standby ?? false,
    note: '',
  };
}
