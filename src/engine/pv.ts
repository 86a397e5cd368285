// Panels and controllers (forecast-engine.md, model steps 7–9 and "Solar").

/** Cell temperature, °C, NOCT model (Ross 1981; NOCT at 800 W/m², 20 °C, 1 m/s per IEC 61215): Ta + (NOCT − 20)/800·POA. */
export function cellTempNoct(ambientC: number, poaWm2: number, nocC: number): number {
  return ambientC + ((nocC - 20) / 800) * poaWm2;
}

/**
 * DC output per rated watt (W/W): POA/1000·(1 + γ·(Tc − 25))·(1 − losses), with STC 1000 W/m²
 * and 25 °C (IEC 60904-3) and the PVWatts v5 structure (Dobos 2014, NREL/TP-6A20-62641).
 * Never negative.
 */
export function dcPerWatt(poaWm2: number, cellC: number, tempCoeffPctPerC: number, lossesPct: number): number {
  const p = (poaWm2 / 1000) * (1 + (tempCoeffPctPerC / 100) * (cellC - 25)) * (1 - lossesPct / 100);
  return p > 0 ? p : 0;
}

/** PVWatts v5 total system loss, %, from its component losses: 100·(1 − Π(1 − Li/100)) (Dobos 2014). */
export function combinedLossesPct(components: number[]): number {
  let keep = 1;
  for (const l of components) keep *= 1 - l / 100;
  return 100 * (1 - keep);
}

/** The slice of an array the controller step needs. */
export interface ControllerSpec {
  controller: 'mppt' | 'pwm';
  controllerEfficiencyPct: number;
  controllerMaxAmps: number | null;
  vmpVolts?: number;
}

/**
 * Fraction of the panel's DC power a controller passes to the battery. MPPT: its efficiency.
 * PWM: the panel is pulled to battery voltage, Vnominal/Vmp, capped at 1, no further efficiency
 * (Vmp default 18 V per 12 V class: 18 × round(nominal/12)).
 */
export function controllerFactor(spec: ControllerSpec, nominalVolts: number): number {
  if (spec.controller === 'mppt') return spec.controllerEfficiencyPct / 100;
  const vmp = spec.vmpVolts ?? 18 * Math.max(1, Math.round(nominalVolts / 12));
  return Math.min(1, nominalVolts / vmp);
}

/** Controller output cap in watts: its amps at the bank's nominal volts (Infinity when none). */
export function controllerCapWatts(spec: ControllerSpec, nominalVolts: number): number {
  return spec.controllerMaxAmps === null ? Infinity : spec.controllerMaxAmps * nominalVolts;
}

/** Battery-side watts a controller delivers from `dcWatts` of panel output. */
export function controllerOutput(dcWatts: number, spec: ControllerSpec, nominalVolts: number): number {
  return Math.min(dcWatts * controllerFactor(spec, nominalVolts), controllerCapWatts(spec, nominalVolts));
}
