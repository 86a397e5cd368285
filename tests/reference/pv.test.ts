// Panels and controllers (forecast-engine.md steps 8–9) against published values.
import { describe, expect, it } from 'vitest';
import { prepareTrip, SUBSTEPS } from '../../src/engine/index';
import { cellTempNoct, combinedLossesPct, controllerFactor, controllerOutput, dcPerWatt } from '../../src/engine/pv';
import { basePlan, resolved, sim } from './plan-helpers';

describe('NOCT cell temperature Tc = Ta + (NOCT − 20)/800·POA (Ross 1981; NOCT per IEC 61215)', () => {
  // pvlib tests/test_temperature.py::test_ross (VERIFIED, check-values §8a): (POA, Tair) with NOCT 50.
  it.each([
    [1000, 30, 50, 67.5],
    [800, 20, 50, 50.0],
    [700, 30, 50, 56.25],
    [600, 40, 50, 62.5],
  ])('POA %f, Ta %f, NOCT %f → %f °C (pvlib ross fixture)', (poa, ta, noct, tc) => {
    expect(cellTempNoct(ta, poa, noct)).toBeCloseTo(tc, 10);
  });

  it.each([
    [800, 25, 45, 50.0],
    [1000, 0, 45, 31.25],
  ])('POA %f, Ta %f, NOCT %f → %f °C (check-values §8a, COMPUTED)', (poa, ta, noct, tc) => {
    expect(cellTempNoct(ta, poa, noct)).toBeCloseTo(tc, 10);
  });
});

describe('temperature-corrected DC output P = Prated·POA/1000·(1 + γ(Tc − 25))·(1 − losses) (PVWatts v5, Dobos 2014)', () => {
  it('G = 900, Tc = 30, Pdc0 = 100, γ = −0.003/°C → 88.65 W (pvlib pvwatts_dc fixture, VERIFIED)', () => {
    expect(100 * dcPerWatt(900, 30, -0.3, 0)).toBeCloseTo(88.65, 10);
  });

  it('STC (1000 W/m², 25 °C, IEC 60904-3) gives rated power before losses', () => {
    expect(dcPerWatt(1000, 25, -0.4, 0)).toBe(1);
  });

  it('PVWatts v5 default component losses combine to 14.075660688264469 % (pvlib pvwatts_losses, VERIFIED)', () => {
    // soiling 2, shading 3, snow 0, mismatch 2, wiring 2, connections 0.5, LID 1.5, nameplate 1, age 0, availability 3.
    expect(combinedLossesPct([2, 3, 0, 2, 2, 0.5, 1.5, 1, 0, 3])).toBeCloseTo(14.075660688264469, 12);
    // With age = 1: 14.934904 % (VERIFIED).
    expect(combinedLossesPct([2, 3, 0, 2, 2, 0.5, 1.5, 1, 1, 3])).toBeCloseTo(14.934904, 6);
  });

  it("the engine's default 14 % loss (PVWatts manual's rounded figure) scales STC output to 0.86", () => {
    expect(dcPerWatt(1000, 25, -0.4, 14)).toBeCloseTo(0.86, 12);
  });

  it('output never goes negative', () => {
    expect(dcPerWatt(0, 25, -0.4, 14)).toBe(0);
    expect(dcPerWatt(1000, 400, -0.4, 14)).toBe(0);
  });
});

describe('controllers (forecast-engine.md step 9 and "Solar")', () => {
  const mppt = { controller: 'mppt' as const, controllerEfficiencyPct: 97, controllerMaxAmps: 30 };
  const pwm = { controller: 'pwm' as const, controllerEfficiencyPct: 97, controllerMaxAmps: 10 };

  it('MPPT passes P·ηc and caps at amps × nominal volts', () => {
    expect(controllerOutput(200, mppt, 12.8)).toBeCloseTo(194, 10);
    expect(controllerOutput(500, mppt, 12.8)).toBeCloseTo(384, 10); // 30 A × 12.8 V
  });

  it('PWM pulls the panel to battery volts: P·(Vnominal/Vmp), Vmp 18 V for a 12 V-class bank, 36 V for 24 V, no further efficiency', () => {
    expect(controllerFactor(pwm, 12.8)).toBeCloseTo(12.8 / 18, 12);
    expect(controllerFactor(pwm, 12)).toBeCloseTo(12 / 18, 12);
    expect(controllerFactor(pwm, 25.6)).toBeCloseTo(25.6 / 36, 12);
    expect(controllerFactor({ ...pwm, vmpVolts: 12 }, 12.8)).toBe(1); // ratio capped at 1
    expect(controllerOutput(100, pwm, 12)).toBeCloseTo(66.6667, 3);
    expect(controllerOutput(300, pwm, 12)).toBeCloseTo(120, 10); // 10 A × 12 V
  });

  it('the simulation caps each sub-step at the controller amps, not just the hour average', () => {
    const plan = basePlan({
      bank: { chemistry: 'lifepo4', capacityAh: 2000, initialSocPct: 20 },
      arrays: [{ name: 'Big', ratedWatts: 2000, controllerMaxAmps: 40 }],
      stop: { lat: 35, lon: -111, arrive: '2027-06-10', nights: 1, weather: [{ date: '2027-06-11', cloudOktas: 0, highC: 25, lowC: 25 }] },
    });
    const p = prepareTrip(resolved(plan));
    const s = sim(plan);
    const capW = 40 * 12.8;
    for (let r = 0; r < p.n; r++) {
      let expected = 0;
      for (let k = 0; k < SUBSTEPS; k++) expected += Math.min(p.arrays[0]!.perWattSub[r * SUBSTEPS + k]! * 2000 * 0.97, capW) / SUBSTEPS;
      expect(s.solarW[r]! + s.curtailedW[r]!).toBeCloseTo(expected, 9);
      expect(s.solarW[r]).toBeLessThanOrEqual(capW + 1e-9);
    }
  });
});
