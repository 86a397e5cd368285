// The short safety cautions of product.md, in a module of their own so pages can show them without loading the engine.
import { formatTemp, type Units } from '../../lib/units';

/** Safety cautions of product.md, shown wherever the advice touches generators, cold charging or sizing. */
export const CAUTIONS = {
  generator: 'Run a generator well away from windows, doors and vents, and keep a working CO alarm inside the rig.',
  cold: 'LiFePO4 must not be charged below freezing (0 °C): keep the bank in the heated space, or use a bank with self-heating.',
  wiring: 'Disconnect shore power and the bank before working on wiring, and fuse every positive conductor close to the battery.',
  ventedBox: 'Flooded lead-acid gives off hydrogen while it charges: inside the cabin it needs a sealed battery box vented outside.',
  estimate:
    'Figures are estimates from the forecast model, not measurements. Wiring and sizing follow local codes (e.g. NEC Article 551 for RVs in the US) and a qualified electrician’s judgement.',
} as const;

/** The cold-charging caution with freezing stated in the user's units ("32 °F" for imperial). */
export function coldCaution(units: Units = 'metric'): string {
  return `LiFePO4 must not be charged below freezing (${formatTemp(0, units)}): keep the bank in the heated space, or use a bank with self-heating.`;
}
