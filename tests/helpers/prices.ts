// One invented installer price list for the tests and the benchmark (sweeps, proposals, the route matrix).

/** Invented test prices in USD (no real supplier's). */
export const TEST_PRICES = {
  currency: 'USD',
  bankPerAh: { lifepo4: 5, agm: 2.2, flooded: 1.5, gel: 2.5 },
  bankInstall: 100,
  panelPerWatt: 1,
  arrayInstall: { flat: 200, tilted: 260, portable: 150 },
  dcdcPerAmp: 8,
  dcdcInstall: 120,
  generator: 900,
  generatorPerHour: 2,
};
