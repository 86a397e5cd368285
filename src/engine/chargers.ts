// Chargers and the hour's power dispatch (forecast-engine.md step 12 and "Chargers and battery").

/** Charger fields the engine reads. */
export interface ChargerSpec {
  kind: 'alternator' | 'shore' | 'generator';
  amps: number;
  startSocPct: number;
  stopSocPct: number;
  fuelLitresPerHour: number;
}

/** Watts a charger can deliver: amps × nominal volts. */
export function chargerWatts(amps: number, nominalVolts: number): number {
  return amps * nominalVolts;
}

/** True when the row's local hour lies inside a generator window [from, to) (whole hours). */
export function inGeneratorWindow(localHour: number, window: [number, number]): boolean {
  return localHour >= window[0] && localHour < window[1];
}

/**
 * The generator's state for an hour, decided at its start: where allowed (window, no hookup, not
 * driving) it starts below `startSocPct` and, once running, runs until `stopSocPct` or the
 * window ends.
 */
export function generatorRuns(wasRunning: boolean, allowed: boolean, socPct: number, startSocPct: number, stopSocPct: number): boolean {
  if (!allowed) return false;
  return wasRunning ? socPct < stopSocPct : socPct < startSocPct;
}

/** How an hour's supply is shared between loads, the bank and curtailment (watts). */
export interface Dispatch {
  solarUsed: number;
  chargerUsed: number;
  curtailed: number;
  toBank: number;
  fromBank: number;
}

/**
 * Dispatches an hour: solar and chargers feed the demand first, the rest goes to the bank up to
 * its acceptance; chargers are throttled before solar, and solar that still cannot be taken is
 * curtailed. A deficit is drawn from the bank.
 */
export function dispatch(solar: number, charger: number, demand: number, acceptWatts: number): Dispatch {
  const supply = solar + charger;
  if (supply < demand) {
    return { solarUsed: solar, chargerUsed: charger, curtailed: 0, toBank: 0, fromBank: demand - supply };
  }
  const toBank = Math.min(supply - demand, Math.max(0, acceptWatts));
  const solarUsed = Math.min(solar, demand + toBank);
  const chargerUsed = Math.min(charger, demand + toBank - solarUsed);
  return { solarUsed, chargerUsed, curtailed: solar - solarUsed, toBank, fromBank: 0 };
}
