// The battery model (forecast-engine.md step 13, "Chargers and battery") against Peukert's law,
// coulomb counting and the common-practice rules it cites.
import { describe, expect, it } from 'vitest';
import { capacityFactor, coldChargeBlocked, ocvVolts, peukertAh, peukertFactor, taperFactor, terminalVolts } from '../../src/engine/index';
import { basePlan, constantWeather, sim } from './plan-helpers';

describe("Peukert's law (Peukert 1897): Ah removed = I·max(1, (I/I20)^(k−1)), I20 = C/20", () => {
  // check-values §9 (COMPUTED from I^k·t = const): C = 100 Ah at the 20 h rate, k = 1.2.
  // A full bank at constant current I lasts C / (Ah removed per hour) hours.
  it.each([
    [20, 3.789, 75.79],
    [10, 8.706, 87.06],
    [50, 1.262, 63.1],
  ])('I = %f A lasts %f h and delivers %f Ah (check-values §9, COMPUTED)', (i, hours, delivered) => {
    const perHour = peukertAh(i, 100, 1.2);
    expect(100 / perHour).toBeCloseTo(hours, 3);
    expect((i * 100) / perHour).toBeCloseTo(delivered, 1);
  });

  it('at the 20-hour rate (5 A) the bank lasts exactly 20 h', () => {
    expect(100 / peukertAh(5, 100, 1.2)).toBeCloseTo(20, 12);
  });

  it('below the 20-hour rate no bonus capacity is modelled (the contract clamps at 1; Peukert alone would give 137.97 h at 1 A)', () => {
    expect(peukertFactor(1, 100, 1.2)).toBe(1);
    expect(peukertFactor(2.5, 100, 1.2)).toBe(1);
  });

  it('k = 1 is an ideal bank', () => {
    expect(peukertAh(50, 100, 1)).toBe(50);
  });

  it('in the simulation Peukert applies to each sub-step\'s current (Revision 2): 240 W from a 100 Ah AGM, k = 1.2', () => {
    // Revision 2 draws the 240 W at the terminal volts (R = 0 here, so V = OCV: 12.8 → 11.8 V over the
    // run, I = 240/OCV = 18.75 … 20.34 A). Each hour the Peukert-adjusted Ah lie between
    // Ah_raw·(I_lo/5)^0.2 and Ah_raw·(I_hi/5)^0.2 with I_lo/I_hi from the hour's start/end OCV
    // (check-values §9: Ah removed = I·(I/I20)^(k−1), I20 = 5 A). At 20 A that is 4^0.2 = 1.3195.
    const plan = basePlan({
      bank: { chemistry: 'agm', nominalVolts: 12, capacityAh: 100, initialSocPct: 100, floorSocPct: 0, peukertExponent: 1.2, internalResistanceMilliohm: 0 },
      loads: [{ name: '240 W', watts: 240 }],
      tempC: 30, // above 25 °C the cold capacity factor is 1
    });
    const s = sim(plan);
    for (let r = 0; r < 3; r++) {
      const iLo = 240 / ocvVolts('agm', s.socStartPct[r]! / 100, 12);
      const iHi = 240 / ocvVolts('agm', s.socEndPct[r]! / 100, 12);
      const ratio = s.ahOut[r]! / s.ahOutRaw[r]!;
      expect(ratio).toBeGreaterThanOrEqual((iLo / 5) ** 0.2 - 1e-9);
      expect(ratio).toBeLessThanOrEqual((iHi / 5) ** 0.2 + 1e-9);
      // The first hour: I ≈ 240/12.72 ≈ 18.9 A → ≈ 18.9·(18.9/5)^0.2 = 24.4 Ah, vs 26.4 Ah at 20 A.
    }
    expect(s.socEndPct[0]).toBeGreaterThan(100 - 20 * 4 ** 0.2); // fewer amps than 20 A at 12 V nominal
    // At ≈ 19.5 A a full bank lasts about 100/(19.5·3.9^0.2) = 3.92 h (check-values §9: 3.789 h at 20 A).
    expect(s.summary.firstCutoffRow).toBe(3);
  });
});

describe('coulomb counting with charge efficiency (Ah added = I·ηcoulomb)', () => {
  const charging = (chemistry: 'lifepo4' | 'flooded', eff?: number) =>
    sim(
      basePlan({
        bank: { chemistry, capacityAh: 100, initialSocPct: 30, chargeEfficiencyPct: eff, maxChargeAmps: 50 },
        chargers: [{ kind: 'shore', amps: 10 }],
        stop: { hookup: 'shore' },
        tempC: 30,
      }),
    );

  it('LiFePO4 at the default 99 %: 10 A for an hour adds 9.9 Ah = 9.9 points on 100 Ah', () => {
    const s = charging('lifepo4');
    expect(s.socEndPct[0]! - 30).toBeCloseTo(9.9, 9);
    expect(s.socEndPct[1]! - s.socEndPct[0]!).toBeCloseTo(9.9, 9);
  });

  it('flooded lead-acid at the default 85 % (trade notes: 0.80–0.85 [cp]) adds 8.5 Ah per 10 Ah', () => {
    const s = charging('flooded');
    expect(s.socEndPct[0]! - 30).toBeCloseTo(8.5, 9);
  });

  it('the charger reports amps × terminal volts as chargeWatts (Revision 2)', () => {
    // Hand calculation: 30 → 39.9 %, OCV (13.065 + 13.1294)/2 = 13.097 V, + 10 A × 8 mΩ = 13.177 V → 131.77 W.
    const s = charging('lifepo4');
    expect(Math.abs(s.chargeW[0]! - 131.77)).toBeLessThan(0.3);
  });
});

describe('charge taper (common practice): linear to zero from 95 % (LiFePO4) / 80 % (lead-acid), at each sub-step\'s SOC (Revision 2)', () => {
  it('taper factors', () => {
    expect(taperFactor('lifepo4', 0.95)).toBe(1);
    expect(taperFactor('lifepo4', 0.97)).toBeCloseTo(0.6, 12);
    expect(taperFactor('lifepo4', 1)).toBe(0);
    expect(taperFactor('agm', 0.8)).toBe(1);
    expect(taperFactor('agm', 0.9)).toBeCloseTo(0.5, 12);
    expect(taperFactor('flooded', 0.99)).toBeCloseTo(0.05, 12);
  });

  it('in the simulation: 1000 Ah LiFePO4 at 96 %, 40 A acceptance, a 100 A charger: the closed form, charger throttled', () => {
    // Revision 2 closed form inside the taper zone: 1 − SOC(t) = (1 − SOC₀)·exp(−t·Imax·η/(C·(1 − s₀)))
    // = 0.04·exp(−t·40·0.99/(1000·0.05)) = 0.04·e^(−0.792t): t = 1 → 98.188 %, t = 2 → 99.179 %
    // (first model: 32 A all hour from the hour-start taper → 99.168 % after one hour).
    const s = sim(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 1000, initialSocPct: 96, maxChargeAmps: 40 },
        chargers: [{ kind: 'shore', amps: 100 }],
        stop: { hookup: 'shore' },
        tempC: 30,
      }),
    );
    expect(s.socEndPct[0]).toBeCloseTo(100 - 4 * Math.exp(-0.792), 9);
    expect(s.socEndPct[1]).toBeCloseTo(100 - 4 * Math.exp(-1.584), 9);
    // Ah at the terminals = stored / η: (98.188 − 96) % × 1000 Ah / 0.99 = 22.10 Ah.
    expect(s.ahIn[0]).toBeCloseTo(((100 - 4 * Math.exp(-0.792) - 96) * 10) / 0.99, 9);
    // The charger is throttled to what the bank takes, at the terminal volts (between OCV(96 %) and
    // OCV(98.19 %) + 40 A × 0.8 mΩ).
    const v = s.chargeW[0]! / s.ahIn[0]!;
    expect(v).toBeGreaterThanOrEqual(ocvVolts('lifepo4', 0.96, 12.8));
    expect(v).toBeLessThanOrEqual(ocvVolts('lifepo4', 0.9819, 12.8) + 40 * 0.0008);
  });
});

describe('cold (common practice / cell datasheets; trade-notes.md)', () => {
  it('LiFePO4 takes no charge below 0 °C unless self-heating', () => {
    expect(coldChargeBlocked('lifepo4', -0.1, false)).toBe(true);
    expect(coldChargeBlocked('lifepo4', 0, false)).toBe(false);
    expect(coldChargeBlocked('lifepo4', -10, true)).toBe(false);
    expect(coldChargeBlocked('agm', -10, false)).toBe(false);
  });

  const cold = (bank: Record<string, unknown>) =>
    sim(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50, ...bank },
        chargers: [{ kind: 'shore', amps: 20 }],
        loads: [{ name: 'DC load', watts: 50 }],
        stop: { hookup: 'shore', weather: constantWeather('2027-06-10', 2, -5) },
      }),
    );

  it('at −5 °C the bank refuses charge, the charger still powers the loads, and each blocked hour warns', () => {
    const s = cold({});
    for (let r = 0; r < s.n; r++) {
      expect(s.socEndPct[r]).toBeCloseTo(50, 9);
      expect(s.loadW[r]).toBeCloseTo(50, 9);
      expect(s.chargeW[r]).toBeCloseTo(50, 9);
      expect(s.coldBlocked[r]).toBe(1);
    }
    expect(s.warnings.filter((w) => w.code === 'cold-charge-blocked')).toHaveLength(s.n);
  });

  it('a full bank in the cold raises no warning: there was no charge to refuse', () => {
    const s = cold({ initialSocPct: 100 });
    expect(s.warnings.filter((w) => w.code === 'cold-charge-blocked')).toHaveLength(0);
    expect(s.socEndPct[0]).toBe(100);
  });

  it('with self-heating, or inside a cabin heated to 18 °C, it charges; a cabin without heating follows the air (Revision 2)', () => {
    expect(cold({ selfHeating: true }).socEndPct[0]).toBeGreaterThan(50);
    const heated = sim(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50, insideHeatedSpace: true },
        chargers: [{ kind: 'shore', amps: 20 }],
        loads: [{ name: 'Furnace blower', watts: 30, response: 'heating', setpointC: 18 }],
        stop: { hookup: 'shore', weather: constantWeather('2027-06-10', 2, -5) },
      }),
    );
    // Tcab = max(Ta, 18) while the heating has power (shore); the bank starts at its surroundings.
    expect(heated.batteryC[0]).toBe(18);
    expect(heated.socEndPct[0]).toBeGreaterThan(50);
    expect(heated.warnings.filter((w) => w.code === 'cold-charge-blocked')).toHaveLength(0);
    // insideHeatedSpace without any heating load: the cabin, and the bank, follow the −5 °C air.
    const unheated = cold({ insideHeatedSpace: true });
    expect(unheated.batteryC[0]).toBe(-5);
    expect(unheated.socEndPct[0]).toBeCloseTo(50, 9);
  });

  it.each([
    ['lifepo4', 25, 1],
    ['lifepo4', 0, 0.8], // ~80 % at 0 °C (trade notes [spec])
    ['lifepo4', -20, 0.64], // trade notes quote ~70 % at −20 °C [spec]; the contract's k = 0.008 gives 64 %
    ['flooded', -18, 0.484], // ~40 % near −18 °C (trade notes [meas]); the contract's k = 0.012 gives 48 %
    ['agm', -60, 0.3], // never below 0.3
  ] as const)('%s at %f °C keeps a factor of %f (f = max(0.3, 1 − k·max(0, 25 − T)))', (chem, t, f) => {
    expect(capacityFactor(chem, t)).toBeCloseTo(f, 12);
  });

  it('lead-acid factors match the designers\' bank multipliers 1.30 at 4 °C and 1.59 at −7 °C within 0.05 (trade notes [cp])', () => {
    expect(Math.abs(1 / capacityFactor('flooded', 4) - 1.3)).toBeLessThan(0.05);
    expect(Math.abs(1 / capacityFactor('flooded', -7) - 1.59)).toBeLessThan(0.05);
  });

  it('in the simulation charge is conserved (Revision 2): 128 W for an hour at 0 °C takes 9.62 points of true SOC, and the bottom 20 % is not usable', () => {
    // First model: SOC moved by Ah/(C·f) = 10/(100·0.8) = 12.5 points. Revision 2, hand calculation
    // (R = 0, Peukert off): OCV(s) = 13.25 + 0.4·(s − 0.7) between 70 and 90 %; ΔSOC = 128 Wh /
    // OCV(at the midpoint) = 128/(13.25 + 0.4·0.1519)/100 = 128/13.3108/100 = 9.616 points.
    // f(0 °C) = 1 − 0.008·25 = 0.8 → usable = SOC − 20 points.
    const s = sim(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 90, peukertExponent: 1, internalResistanceMilliohm: 0 },
        loads: [{ name: '128 W', watts: 128 }],
        tempC: 0,
      }),
    );
    expect(Math.abs(s.socStartPct[0]! - s.socEndPct[0]! - 9.616)).toBeLessThan(0.02);
    expect(s.usablePct[0]).toBeCloseTo(s.socEndPct[0]! - 20, 9);
  });
});

describe('open-circuit and terminal volts (common-practice tables, forecast-engine.md)', () => {
  it.each([
    ['lifepo4', 1, 13.6],
    ['lifepo4', 0.99, 13.45],
    ['lifepo4', 0.9, 13.33],
    ['lifepo4', 0.7, 13.25],
    ['lifepo4', 0.4, 13.13],
    ['lifepo4', 0.2, 13.0],
    ['lifepo4', 0.14, 12.8],
    ['lifepo4', 0.09, 12.5],
    ['lifepo4', 0, 10.0],
    ['flooded', 1, 12.7],
    ['flooded', 0.75, 12.4],
    ['flooded', 0.5, 12.2],
    ['flooded', 0.25, 12.0],
    ['flooded', 0, 11.8],
    ['agm', 1, 12.8],
    ['agm', 0.75, 12.6],
    ['gel', 0.5, 12.3],
    ['gel', 0.25, 12.0],
    ['agm', 0, 11.8],
  ] as const)('%s at %f → %f V (12.8 V / 12 V bank)', (chem, soc, v) => {
    expect(ocvVolts(chem, soc, chem === 'lifepo4' ? 12.8 : 12)).toBeCloseTo(v, 10);
  });

  it('is linear between points and scales with nominal volts (×2 for 25.6 V / 24 V)', () => {
    expect(ocvVolts('lifepo4', 0.55, 12.8)).toBeCloseTo((13.13 + 13.25) / 2, 10);
    expect(ocvVolts('lifepo4', 0.55, 25.6)).toBeCloseTo(13.13 + 13.25, 10);
    expect(ocvVolts('flooded', 0.625, 24)).toBeCloseTo(2 * 12.3, 10);
  });

  it('terminal volts = OCV − I·R on discharge, + I·R on charge', () => {
    expect(terminalVolts('lifepo4', 0.4, 12.8, -50, 8)).toBeCloseTo(13.13 - 0.4, 10);
    expect(terminalVolts('lifepo4', 0.4, 12.8, 50, 8)).toBeCloseTo(13.13 + 0.4, 10);
  });
});
