// Loads by hour (forecast-engine.md step 11 and "Loads").

/** Load fields the demand model reads. */
export interface LoadSpec {
  watts: number;
  quantity: number;
  supply: 'dc' | 'ac';
  windows: [number, number][];
  dutyPct: number;
  days: 'all' | 'camp' | 'drive';
  response: 'none' | 'cooling' | 'heating';
  setpointC: number;
  /** Revision 2: where the load sits (default cabin); cooling loads follow that place's temperature. */
  location?: 'cabin' | 'outside';
  /** Revision 2: one unit's draw while starting or running flat out, W (null: its running watts). */
  surgeWatts?: number | null;
}

/**
 * 24-bit mask of the local hours a load runs. Windows are whole hours [from, to); to < from wraps
 * past midnight; [h, h] is empty; overlapping windows do not add beyond the full hour.
 */
export function windowMask(windows: [number, number][]): number {
  let mask = 0;
  for (const [from, to] of windows) {
    if (from === to) continue;
    for (let h = 0; h < 24; h++) {
      const on = from < to ? h >= from && h < to : h >= from || h < to;
      if (on) mask |= 1 << h;
    }
  }
  return mask;
}

/** True when a load's window mask covers local hour h. */
export function inWindow(mask: number, localHour: number): boolean {
  return ((mask >>> localHour) & 1) === 1;
}

/** True when a load runs on a day of this kind. */
export function runsOnDay(days: LoadSpec['days'], isDriveDay: boolean): boolean {
  return days === 'all' || (days === 'drive') === isDriveDay;
}

function clamp01(x: number): number {
  return x < 0 ? 0 : x > 1 ? 1 : x;
}

/**
 * Duty (0..1) inside a load's windows at outdoor ambient T, common practice with editable
 * parameters: none → dutyPct; cooling → clamp(base·(1 + 0.03·(T − 20))) with dutyPct the duty at
 * 20 °C; heating → clamp((setpoint − T)/25)·dutyPct/100, so dutyPct is the duty 25 °C below setpoint.
 */
export function dutyAt(load: Pick<LoadSpec, 'dutyPct' | 'response' | 'setpointC'>, ambientC: number): number {
  const base = load.dutyPct / 100;
  if (load.response === 'cooling') return clamp01(base * (1 + 0.03 * (ambientC - 20)));
  if (load.response === 'heating') return clamp01((load.setpointC - ambientC) / 25) * base;
  return clamp01(base);
}

/** Average watts a load draws (before any inverter) in a row. */
export function loadWattsAt(load: LoadSpec, mask: number, localHour: number, isDriveDay: boolean, ambientC: number): number {
  if (!inWindow(mask, localHour) || !runsOnDay(load.days, isDriveDay)) return 0;
  return load.watts * load.quantity * dutyAt(load, ambientC);
}

/** Inverter settings the demand model reads. */
export interface InverterSpec {
  efficiencyPct: number;
  idleWatts: number;
  alwaysOn: boolean;
}

/**
 * DC watts the inverter draws from the bank for `acWatts` of AC loads: AC/η plus its idle draw
 * for the whole hour when it is on (any AC demand, or always when `alwaysOn`).
 */
export function inverterDcWatts(acWatts: number, inv: InverterSpec): number {
  const on = acWatts > 0 || inv.alwaysOn;
  if (!on) return 0;
  return acWatts / (inv.efficiencyPct / 100) + inv.idleWatts;
}

/**
 * Cabin temperature (Revision 2): max(Ta, the highest setpoint of the heating loads scheduled in
 * the hour) when such a load has power, else Ta. `maxSetpointC` is −Infinity when none is scheduled.
 */
export function cabinTemp(ambientC: number, maxSetpointC: number, heatingPowered: boolean): number {
  return heatingPowered && maxSetpointC > ambientC ? maxSetpointC : ambientC;
}

/** The temperature a load's duty follows (Revision 2): cooling loads their location's, heating loads the outdoor air. */
export function loadTemp(load: Pick<LoadSpec, 'response' | 'location'>, ambientC: number, cabinC: number): number {
  return load.response === 'cooling' && (load.location ?? 'cabin') === 'cabin' ? cabinC : ambientC;
}

/**
 * Fraction of a row inside a load's windows (Revision 2): a row starting `minuteFrac` of an hour
 * past local hour h counts (1 − minuteFrac) of hour h and minuteFrac of hour h + 1.
 */
export function windowFraction(mask: number, localHour: number, minuteFrac: number): number {
  const a = inWindow(mask, localHour) ? 1 - minuteFrac : 0;
  if (!(minuteFrac > 0)) return a;
  return a + (inWindow(mask, (localHour + 1) % 24) ? minuteFrac : 0);
}
