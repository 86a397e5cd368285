// The one source of typical appliance figures: the load catalogue (rig pages) and the quick plan
// (landing page) both read their draws, schedules and duty from here, so a fridge cannot run half
// the time in one and a third in the other. Pure data, zod-free (the landing island imports it).
//
// Where each figure comes from, per item (`basis` and `source`):
// - "trade notes": /work/shared/reference/trade-notes.md, Loads table — manufacturers' generic
//   category figures [spec] and practitioners' published measurements [meas], amps at 12 V turned
//   into watts (A × 12 V);
// - "common practice": a trade rule of thumb, as campers and installers use it;
// - "from memory": our recollection of typical labels where no published figure is at hand — the
//   weakest kind, shown as such.
// Every figure is TYPICAL: the camper checks the appliance's label and confirms the number before a
// catalogue load is added; the quick plan says "typical" beside each load. No brands.
//
// Schedules: windows are local hours [from, to) and may wrap midnight; `dutyPct` is the share of
// those hours the load draws. For a cooling load it is the duty at 20 °C and for a heating load the
// duty 25 °C below its setpoint (the engine's rules, forecast-engine.md "Loads").

/** Where a typical figure comes from. */
export type FigureBasis = 'trade notes' | 'common practice' | 'from memory';

export interface TypicalLoad {
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
  /** Loads that run only when the rig moves (slide-outs, jacks) run on drive days. */
  days?: 'all' | 'camp' | 'drive';
  /** Typical draw of one unit while starting or running flat out, W (common practice; check the label). */
  surgeWatts?: number;
  /** Where the surge figure comes from, in a line. */
  surgeAbout?: string;
  /** What the range means and when it runs, in a line (shown beside the figure). */
  about: string;
  /** Where the draw figure comes from. */
  basis: FigureBasis;
  /** The source in a line: the trade-notes row and tag, or how the rule of thumb goes. */
  source: string;
}

/** The words that go with every surge figure. */
export const SURGE_TYPICAL = 'Typical — common practice, check the label.';

const TN = 'trade-notes.md, Loads';

// Compressor fridge duty: "~50 % duty above 25 °C ambient" [meas]. The engine raises a cooling
// load's duty 3 % per °C above 20 °C, so 45 % at 20 °C is 45 × 1.15 ≈ 52 % at 25 °C: about half.
const FRIDGE_DUTY_AT_20C = 45;

export const TYPICAL_LOADS: readonly TypicalLoad[] = [
  // ---- cooling
  { id: 'compressor-fridge', name: '12 V compressor fridge', minWatts: 35, maxWatts: 60, watts: 45, supply: 'dc', windows: [[0, 24]], dutyPct: FRIDGE_DUTY_AT_20C, response: 'cooling',
    surgeWatts: 100, surgeAbout: 'The compressor starting draws about twice its running power for a moment (common practice, from memory).',
    about: '35–60 W while the compressor runs (40–90 L); runs about 45 % of the time at 20 °C, about half at 25 °C, more in heat.',
    basis: 'trade notes', source: `${TN}: 35–60 W running, a 63 L unit averaged 2.5 A [meas]; ~50 % duty above 25 °C [meas]` },
  { id: 'compressor-freezer', name: '12 V chest freezer', minWatts: 35, maxWatts: 65, watts: 45, supply: 'dc', windows: [[0, 24]], dutyPct: 60, response: 'cooling',
    surgeWatts: 100, surgeAbout: 'The compressor starting draws about twice its running power for a moment (common practice, from memory).',
    about: 'Like a compressor fridge while running, but on longer: about 60 % of the time at 20 °C (from memory).',
    basis: 'from memory', source: 'draw as the compressor fridge row of trade-notes.md; the longer duty of a freezer from memory' },
  { id: 'absorption-fridge', name: 'Absorption fridge on propane (control board)', minWatts: 3, maxWatts: 18, watts: 6, supply: 'dc', windows: [[0, 24]], dutyPct: 100,
    about: 'The control board draws 0.25–1.5 A, typically 0.5 A; a door heater adds about 3 W.',
    basis: 'trade notes', source: `${TN}: 0.25–1.5 A, typically 0.5 A; +0.24 A door heater [spec]` },
  { id: 'home-fridge', name: 'Household fridge (through the inverter)', minWatts: 100, maxWatts: 200, watts: 150, supply: 'ac', windows: [[0, 24]], dutyPct: 35, response: 'cooling',
    surgeWatts: 1000, surgeAbout: 'An AC compressor starts at five to seven times its running power (common practice, from memory).',
    about: '100–200 W AC while the compressor runs (from memory, common practice); keeps the inverter on all day.',
    basis: 'from memory', source: 'household fridge labels, from memory' },
  { id: 'rooftop-ac', name: 'Rooftop air conditioner (through the inverter)', minWatts: 1200, maxWatts: 1800, watts: 1400, supply: 'ac', windows: [[12, 18]], dutyPct: 50, response: 'cooling',
    surgeWatts: 3000, surgeAbout: 'The compressor starts at two to three times its running power unless a soft starter is fitted (common practice, from memory).',
    about: '1200–1800 W AC while the compressor runs (from memory); a few hours drain most batteries — shore power or a generator is the usual way.',
    basis: 'from memory', source: 'rooftop air conditioner labels, from memory' },

  // ---- heating
  { id: 'furnace-blower', name: 'Propane furnace blower', minWatts: 34, maxWatts: 108, watts: 60, supply: 'dc', windows: [[0, 24]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: '2.8 A on a small furnace to 9 A on a large one; runs more the colder it is outside. The top cold-night drain.',
    basis: 'trade notes', source: `${TN}: 2.8 A (small) … 9 A (large) [spec]; 5–11 A measured [meas]` },
  { id: 'diesel-heater', name: 'Diesel air heater', minWatts: 5, maxWatts: 30, watts: 20, supply: 'dc', windows: [[18, 8]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: 'A few watts to about 30 W running, after a glow-plug start of 2–3 minutes; far below a furnace blower.',
    basis: 'trade notes', source: `${TN}: glow plug for ~2–3 min at start, running a few W to ~30 W [spec]` },
  { id: 'tank-heaters', name: 'Holding-tank heater pads', minWatts: 30, maxWatts: 60, watts: 45, supply: 'dc', windows: [[0, 24]], dutyPct: 100, response: 'heating', setpointC: 4,
    about: 'Several amps per pad, on a thermostat near 4 °C; can dominate in freezing weather.',
    basis: 'common practice', source: `${TN}: several amps per pad, thermostat near 4 °C [cp]` },
  { id: 'heated-blanket-dc', name: '12 V heated blanket', minWatts: 30, maxWatts: 60, watts: 45, supply: 'dc', windows: [[22, 6]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: '30–60 W on its higher settings (from memory); cycles more the colder the night.',
    basis: 'from memory', source: '12 V heated blanket labels, from memory' },
  { id: 'electric-blanket-ac', name: 'Electric blanket (through the inverter)', minWatts: 50, maxWatts: 100, watts: 75, supply: 'ac', windows: [[22, 6]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: '50–100 W AC on its higher settings (from memory); cycles more the colder the night, and keeps the inverter on.',
    basis: 'from memory', source: 'household electric blanket labels, from memory' },
  { id: 'space-heater', name: 'Electric space heater (through the inverter)', minWatts: 750, maxWatts: 1500, watts: 750, supply: 'ac', windows: [[18, 22]], dutyPct: 100, response: 'heating', setpointC: 18,
    about: 'Usually two settings, about 750 W and 1500 W AC (common practice); rarely sensible from a battery — a furnace or diesel heater uses a fraction.',
    basis: 'common practice', source: 'the low and high settings of portable electric heaters, common practice' },
  { id: 'water-heater-igniter', name: 'Propane water heater igniter and board', minWatts: 2, maxWatts: 12, watts: 6, supply: 'dc', windows: [[6, 9], [18, 22]], dutyPct: 50,
    about: 'The electronic ignition board draws well under 1 A while the burner is called for (from memory).',
    basis: 'from memory', source: 'direct-spark ignition boards, from memory' },

  // ---- air and water
  { id: 'vent-fan-low', name: 'Roof vent fan, low speed', minWatts: 10, maxWatts: 14, watts: 12, supply: 'dc', windows: [[22, 7]], dutyPct: 100,
    about: 'About 1.0 A on its low speed; summer nights, 8–10 hours.',
    basis: 'trade notes', source: `${TN}: 1.0 / 1.5 / 1.8 A by speed [meas]; summer nights 8–10 h` },
  { id: 'vent-fan-medium', name: 'Roof vent fan, medium speed', minWatts: 15, maxWatts: 20, watts: 18, supply: 'dc', windows: [[22, 7]], dutyPct: 100,
    about: 'About 1.5 A on its medium speed; summer nights, 8–10 hours.',
    basis: 'trade notes', source: `${TN}: 1.0 / 1.5 / 1.8 A by speed [meas]; summer nights 8–10 h` },
  { id: 'vent-fan-high', name: 'Roof vent fan, high speed', minWatts: 20, maxWatts: 24, watts: 22, supply: 'dc', windows: [[22, 7]], dutyPct: 100,
    about: 'About 1.8 A on its high speed; summer nights, 8–10 hours.',
    basis: 'trade notes', source: `${TN}: 1.0 / 1.5 / 1.8 A by speed [meas]; summer nights 8–10 h` },
  { id: 'water-pump', name: 'Water pump', minWatts: 36, maxWatts: 72, watts: 50, supply: 'dc', windows: [[7, 9], [18, 21]], dutyPct: 8,
    surgeWatts: 100, surgeAbout: 'The motor starting draws about twice its running power (common practice, from memory).',
    about: '3–6 A while it runs; a few minutes an hour around meals.',
    basis: 'trade notes', source: `${TN}: 3–6 A [meas]; minutes a day` },

  // ---- light and sleep
  { id: 'led-lights', name: 'LED lights', minWatts: 1, maxWatts: 3, watts: 1.5, quantity: 6, supply: 'dc', windows: [[6, 8], [18, 23]], dutyPct: 100,
    about: 'About 0.1 A per fixture; mornings and evenings, longer in winter.',
    basis: 'trade notes', source: `${TN}: ~0.1 A per fixture [meas]; evenings, more in winter` },
  { id: 'porch-light', name: 'Porch light (LED)', minWatts: 3, maxWatts: 10, watts: 5, supply: 'dc', windows: [[19, 23]], dutyPct: 100,
    about: 'A few watts for an LED fixture (from memory); evenings.',
    basis: 'from memory', source: 'LED porch fixtures, from memory' },
  { id: 'cpap-dry', name: 'CPAP, no humidifier', minWatts: 15, maxWatts: 30, watts: 25, supply: 'dc', windows: [[22, 6]], dutyPct: 40,
    about: 'About 25 W at its peak, less on average; one per sleeper, about 8 hours a night.',
    basis: 'trade notes', source: `${TN}: ~25 W dry [meas]; 3–8 Ah a day dry` },
  { id: 'cpap-humid', name: 'CPAP with humidifier and heated hose', minWatts: 70, maxWatts: 80, watts: 78, supply: 'dc', windows: [[22, 6]], dutyPct: 45,
    about: '76–80 W while heating; about 8 hours a night.',
    basis: 'trade notes', source: `${TN}: 76–80 W with humidifier and heated hose [meas]; 18–30+ Ah a day` },

  // ---- work, talk and screens
  { id: 'laptop', name: 'Laptop (through the inverter)', minWatts: 40, maxWatts: 90, watts: 60, supply: 'ac', windows: [[9, 12], [13, 17]], dutyPct: 70,
    about: '3.5–8 A from the bank while charging; working hours, charging part of the time.',
    basis: 'trade notes', source: `${TN}: 3.5–8 A via inverter [meas]; work hours` },
  { id: 'phone', name: 'Phone charging', minWatts: 5, maxWatts: 10, watts: 6, quantity: 2, supply: 'dc', windows: [[19, 21]], dutyPct: 100,
    about: 'About 0.5 A each for 1–3 hours.',
    basis: 'trade notes', source: `${TN}: ~0.5 A [meas]; 1–3 h each` },
  { id: 'tablet', name: 'Tablet charging', minWatts: 10, maxWatts: 20, watts: 12, supply: 'dc', windows: [[20, 22]], dutyPct: 100,
    about: '10–20 W while charging (from memory); a couple of hours.',
    basis: 'from memory', source: 'tablet chargers, from memory' },
  { id: 'router', name: 'Wi-Fi router or mobile hotspot', minWatts: 4, maxWatts: 12, watts: 8, supply: 'dc', windows: [[0, 24]], dutyPct: 100,
    about: 'A few watts, usually left on all day (from memory).',
    basis: 'from memory', source: 'small routers and hotspots, from memory' },
  { id: 'signal-booster', name: 'Cell signal booster', minWatts: 4, maxWatts: 15, watts: 8, supply: 'dc', windows: [[8, 23]], dutyPct: 100,
    about: 'About 5–15 W while on (from memory).',
    basis: 'from memory', source: 'cell signal boosters, from memory' },
  { id: 'satellite-dish', name: 'Satellite internet dish (through the inverter)', minWatts: 40, maxWatts: 100, watts: 60, supply: 'ac', windows: [[8, 23]], dutyPct: 100,
    about: 'About 50–75 W AC while on, more when it melts snow (from memory); one of the bigger all-day loads.',
    basis: 'from memory', source: 'consumer satellite internet dishes, from memory' },
  { id: 'tv', name: 'TV', minWatts: 20, maxWatts: 50, watts: 35, supply: 'dc', windows: [[19, 22]], dutyPct: 100,
    about: 'About 35 W for the TV alone; evenings.',
    basis: 'trade notes', source: `${TN}: ~35 W TV [meas]; evenings` },
  { id: 'tv-receiver', name: 'TV with receiver and sound bar', minWatts: 50, maxWatts: 80, watts: 72, supply: 'dc', windows: [[19, 22]], dutyPct: 100,
    about: 'About 6 A with a receiver and sound bar; evenings.',
    basis: 'trade notes', source: `${TN}: 6 A with receiver and sound [meas]` },
  { id: 'radio', name: 'Radio or stereo', minWatts: 5, maxWatts: 20, watts: 10, supply: 'dc', windows: [[17, 22]], dutyPct: 100,
    about: '5–20 W playing at a campsite volume (from memory).',
    basis: 'from memory', source: 'vehicle head units and small stereos, from memory' },
  { id: 'camera-charger', name: 'Camera or drone battery charger (through the inverter)', minWatts: 20, maxWatts: 90, watts: 50, supply: 'ac', windows: [[14, 16]], dutyPct: 100,
    about: '20–90 W AC while charging (from memory); an afternoon charge.',
    basis: 'from memory', source: 'camera and drone battery chargers, from memory' },
  { id: 'ebike-charger', name: 'E-bike charger (through the inverter)', minWatts: 100, maxWatts: 250, watts: 150, supply: 'ac', windows: [[13, 16]], dutyPct: 100,
    about: '100–250 W AC for a few hours per battery (from memory); a full charge is about the battery’s watt-hours plus a tenth.',
    basis: 'from memory', source: 'e-bike chargers (36–48 V at 2–4 A), from memory' },

  // ---- kitchen and bathroom
  { id: 'microwave', name: 'Microwave (through the inverter)', minWatts: 1000, maxWatts: 1100, watts: 1050, supply: 'ac', windows: [[18, 19]], dutyPct: 15,
    surgeWatts: 1500, surgeAbout: 'Up to about 1,500 W AC as the magnetron starts (common practice).',
    about: 'An “800 W” oven draws 1000–1100 W AC (90–100 A from a 12 V bank) for minutes.',
    basis: 'trade notes', source: `${TN}: an "800 W" oven draws ~1000–1100 W AC, ~90–100 A DC [meas]` },
  { id: 'coffee', name: 'Coffee maker (through the inverter)', minWatts: 600, maxWatts: 1000, watts: 800, supply: 'ac', windows: [[7, 8]], dutyPct: 15,
    surgeWatts: 1000, surgeAbout: 'The heating element draws its full rating whenever it is on, up to about 1,000 W (common practice).',
    about: '600–1000 W for 5–15 minutes.',
    basis: 'common practice', source: `${TN}: 600–1000 W [cp]; 5–15 min` },
  { id: 'kettle', name: 'Electric kettle (through the inverter)', minWatts: 1000, maxWatts: 1500, watts: 1200, supply: 'ac', windows: [[7, 8]], dutyPct: 8,
    surgeWatts: 1500, surgeAbout: 'The element draws its full rating whenever it is on (common practice).',
    about: '1000–1500 W for a compact kettle (from memory); about 5 minutes a boil.',
    basis: 'from memory', source: 'compact travel kettles, from memory' },
  { id: 'induction-hob', name: 'Induction hob (through the inverter)', minWatts: 800, maxWatts: 1800, watts: 1400, supply: 'ac', windows: [[18, 19]], dutyPct: 30,
    surgeWatts: 1800, surgeAbout: 'On its boost setting a single-zone hob draws its full rating, often about 1,800 W (common practice, from memory).',
    about: '800–1800 W by setting (from memory); 15–20 minutes for a meal. Often more than a small inverter can deliver.',
    basis: 'from memory', source: 'portable single-zone induction hobs, from memory' },
  { id: 'hair-dryer', name: 'Hair dryer (through the inverter)', minWatts: 800, maxWatts: 1800, watts: 1200, supply: 'ac', windows: [[7, 8]], dutyPct: 10,
    surgeWatts: 1800, surgeAbout: 'On its high setting a dryer draws its full rating, often 1,500–1,800 W (common practice, from memory).',
    about: '800–1800 W by setting (from memory, common practice); minutes a day. Often more than a small inverter can deliver.',
    basis: 'from memory', source: 'hair dryer labels, from memory' },

  // ---- moving parts (on drive days: set up at arrival, packed up before leaving)
  { id: 'slide-out', name: 'Slide-out motor', minWatts: 240, maxWatts: 480, watts: 360, supply: 'dc', windows: [[9, 10], [15, 16]], dutyPct: 2, days: 'drive',
    about: 'About 20–40 A for the minute or so the room moves, in and out on travel days (from memory).',
    basis: 'from memory', source: '12 V slide-out motors, from memory' },
  { id: 'leveling-jacks', name: 'Leveling jacks', minWatts: 150, maxWatts: 700, watts: 300, supply: 'dc', windows: [[9, 10], [15, 16]], dutyPct: 4, days: 'drive',
    about: 'About 10–60 A while the jacks move, a couple of minutes when setting up and leaving (from memory).',
    basis: 'from memory', source: 'electric and hydraulic leveling systems, from memory' },
  { id: 'tongue-jack', name: 'Electric tongue jack', minWatts: 120, maxWatts: 300, watts: 180, supply: 'dc', windows: [[9, 10], [15, 16]], dutyPct: 3, days: 'drive',
    about: 'About 10–25 A under load for a minute or two when hitching and unhitching (from memory).',
    basis: 'from memory', source: '12 V trailer tongue jacks, from memory' },
  { id: 'awning', name: 'Awning motor', minWatts: 60, maxWatts: 120, watts: 90, supply: 'dc', windows: [[9, 10], [18, 19]], dutyPct: 2,
    about: 'About 5–10 A for the minute the awning moves (from memory).',
    basis: 'from memory', source: '12 V awning motors, from memory' },

  // ---- always on
  { id: 'standby', name: 'Standby draw (detectors, radio memory, control panels)', minWatts: 12, maxWatts: 16, watts: 13, supply: 'dc', windows: [[0, 24]], dutyPct: 100, standby: true,
    about: 'About 1–1.2 A in total on a trailer or motorhome with everything “off”: 25–30 Ah a day.',
    basis: 'trade notes', source: `${TN}: ~1–1.2 A total measured on trailers and motorhomes [meas]` },
  { id: 'lp-detector', name: 'Propane/CO detector', minWatts: 0.1, maxWatts: 0.5, watts: 0.2, supply: 'dc', windows: [[0, 24]], dutyPct: 100, standby: true,
    about: 'About 17 mA; stays on even when a disconnect switch is off.',
    basis: 'trade notes', source: `${TN}: a detector alone ~17 mA [spec]` },
];

/** One typical figure by its id (throws naming the id when there is none: a typo in a caller). */
export function typicalLoad(id: string): TypicalLoad {
  const item = TYPICAL_LOADS.find((i) => i.id === id);
  if (!item) throw new Error(`No typical load "${id}"`);
  return item;
}
