// Hourly ambient temperature from a day's low and high (forecast-engine.md step 10).

/**
 * Fraction of the daily range below the high for hours 1..24, hour-ending
 * (ASHRAE Handbook — Fundamentals 2009, ch. 14, table 6; as used by EnergyPlus design days).
 * Index 0 is hour 1 (the hour ending 01:00).
 */
export const ASHRAE_FRACTIONS: readonly number[] = [
  0.88, 0.92, 0.95, 0.98, 1.0, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13,
  0.05, 0.0, 0.0, 0.06, 0.14, 0.24, 0.39, 0.5, 0.59, 0.68, 0.75, 0.82,
];

/**
 * Ambient °C of the row [h, h+1) in local clock time: the hour-ending fraction of hour h+1,
 * T = Tmax − f·(Tmax − Tmin), with the day's own high and low.
 */
export function ambientForRow(localHour: number, highC: number, lowC: number): number {
  const f = ASHRAE_FRACTIONS[Math.min(23, Math.max(0, Math.floor(localHour)))] ?? 0;
  return highC - f * (highC - lowC);
}

/** Ambient °C at ASHRAE hour `hourEnding` (1..24): T = Tmax − f(h)·(Tmax − Tmin). */
export function ashraeTemperature(hourEnding: number, highC: number, lowC: number): number {
  return ambientForRow(hourEnding - 1, highC, lowC);
}
