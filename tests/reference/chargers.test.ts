// Inverter, alternator, shore power and generator behave as the contract says
// (forecast-engine.md steps 11–12, "Loads" and "Chargers and battery").
import { describe, expect, it } from 'vitest';
import { inverterDcWatts } from '../../src/engine/loads';
import { basePlan, run, sim } from './plan-helpers';

const hourOf = (time: string) => Number(time.slice(11, 13));

describe('inverter losses (AC loads draw W/η from the bank, plus idle draw while on)', () => {
  it('90 W AC at 90 % efficiency with 12 W idle draws 112 W DC; off with no AC demand; idle only when always on', () => {
    const inv = { efficiencyPct: 90, idleWatts: 12, alwaysOn: false };
    expect(inverterDcWatts(90, inv)).toBeCloseTo(112, 12);
    expect(inverterDcWatts(0, inv)).toBe(0);
    expect(inverterDcWatts(0, { ...inv, alwaysOn: true })).toBe(12);
  });

  it('in the forecast: loadWatts is 112 in the AC window and 0 outside; 12 outside when alwaysOn', () => {
    const loads = [{ name: 'TV', watts: 90, supply: 'ac' as const, windows: [[18, 22]] as [number, number][] }];
    const bank = { chemistry: 'lifepo4' as const, capacityAh: 300, initialSocPct: 100 };
    const f = run(basePlan({ bank, loads, inverter: { efficiencyPct: 90, idleWatts: 12 } }));
    for (const h of f.hourly) expect(h.loadWatts).toBe(hourOf(h.time) >= 18 && hourOf(h.time) < 22 ? 112 : 0);
    const g = run(basePlan({ bank, loads, inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: true } }));
    for (const h of g.hourly) expect(h.loadWatts).toBe(hourOf(h.time) >= 18 && hourOf(h.time) < 22 ? 112 : 12);
  });
});

describe('alternator through a DC-DC charger: its amps during drive hours only', () => {
  const f = run(
    basePlan({
      bank: { chemistry: 'lifepo4', capacityAh: 200, initialSocPct: 30 },
      chargers: [{ kind: 'alternator', amps: 30 }],
      drives: [{ date: '2027-06-11', startHour: 9, hours: 3 }],
    }),
  );

  it('delivers 30 A × 12.8 V = 384 W in the three drive rows and nothing else', () => {
    for (const h of f.hourly) {
      const inDrive = h.time.startsWith('2027-06-11') && hourOf(h.time) >= 9 && hourOf(h.time) < 12;
      expect(h.driving).toBe(inDrive);
      expect(h.chargeWatts).toBe(inDrive ? 384 : 0);
    }
    expect(f.days.find((d) => d.date === '2027-06-11')?.chargeWh).toBe(3 * 384);
  });

  it('several chargers of one kind add up', () => {
    const g = run(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 200, initialSocPct: 30 },
        chargers: [{ kind: 'alternator', amps: 30 }, { kind: 'alternator', amps: 10 }],
        drives: [{ date: '2027-06-11', startHour: 9, hours: 1 }],
      }),
    );
    expect(g.hourly.find((h) => h.driving)?.chargeWatts).toBe(512);
  });
});

describe('shore power: every hour at a hookup stop except drive hours, AC loads served from shore', () => {
  const f = run(
    basePlan({
      bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 20 },
      chargers: [{ kind: 'shore', amps: 10 }],
      loads: [
        { name: 'AC heater fan', watts: 90, supply: 'ac' },
        { name: 'DC lights', watts: 30 },
      ],
      stop: { hookup: 'shore' },
      drives: [{ date: '2027-06-11', startHour: 9, hours: 3 }],
    }),
  );

  it('charges at 10 A × 12.8 V in every non-drive hour (less only when the bank is full)', () => {
    for (const h of f.hourly) {
      if (h.driving) expect(h.chargeWatts).toBe(0);
      else if (h.socPct < 95) expect(h.chargeWatts).toBe(128);
    }
  });

  it('takes AC loads and the inverter off the bank on shore, and puts them back while driving', () => {
    for (const h of f.hourly) expect(h.loadWatts).toBe(h.driving ? 30 + 100 + 12 : 30);
  });
});

describe('generator: only inside its hours, start below startSocPct, run to stopSocPct or window end; fuel = hours × L/h', () => {
  const plan = basePlan({
    bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 45, peukertExponent: 1 },
    chargers: [{ kind: 'generator', amps: 20, startSocPct: 40, stopSocPct: 80, fuelLitresPerHour: 0.5 }],
    loads: [{ name: '10 A', watts: 128 }],
    stop: { generatorHours: [8, 20] },
    tempC: 30,
  });
  const s = sim(plan);
  const f = run(plan);

  it('runs only inside [8, 20) local', () => {
    let on = 0;
    for (let r = 0; r < s.n; r++) {
      if (s.generatorOn[r]) {
        on++;
        const h = hourOf(f.hourly[r].time);
        expect(h >= 8 && h < 20).toBe(true);
      }
    }
    expect(on).toBeGreaterThan(0);
  });

  it('starts only below 40 %, keeps running below 80 % inside the window, stops at 80 % or the window end', () => {
    for (let r = 0; r < s.n; r++) {
      const h = hourOf(f.hourly[r].time);
      const inWindow = h >= 8 && h < 20;
      const was = r > 0 && s.generatorOn[r - 1] === 1;
      const soc = s.socStartPct[r];
      const expected = inWindow && (was ? soc < 80 : soc < 40);
      expect(s.generatorOn[r] === 1, `row ${f.hourly[r].time}`).toBe(expected);
    }
  });

  it('charges at 20 A × 12.8 V while on and reports hours and litres = hours × 0.5 L/h', () => {
    const hours = s.generatorOn.reduce((a, b) => a + b, 0);
    expect(f.summary.generatorHours).toBe(hours);
    expect(f.summary.generatorLitres).toBeCloseTo(hours * 0.5, 10);
    for (let r = 0; r < s.n; r++) if (s.generatorOn[r]) expect(s.chargeW[r]).toBeCloseTo(256, 9);
  });

  it('follows the worked trace: on at 16:00 (35 %), off at 20:00, floor cut overnight, back on at 08:00 and off at 15:00 (≥ 80 %)', () => {
    // 10 A load, 20 A generator, 100 Ah at 30 °C: −10 points an hour off, +9.9 on (19.8 while disconnected).
    const onTimes = f.hourly.filter((h) => h.generatorOn).map((h) => h.time);
    expect(onTimes[0]).toBe('2027-06-10T16:00-07:00');
    expect(onTimes).toContain('2027-06-10T19:00-07:00');
    expect(onTimes).not.toContain('2027-06-10T20:00-07:00');
    expect(onTimes).toContain('2027-06-11T08:00-07:00');
    expect(onTimes).toContain('2027-06-11T14:00-07:00');
    expect(onTimes).not.toContain('2027-06-11T15:00-07:00');
    expect(f.summary.firstCutoffAt).toBe('2027-06-11T02:00-07:00');
  });

  it('never runs at a hookup stop or while driving', () => {
    const hook = sim(basePlan({ ...plan, stop: { hookup: 'shore', generatorHours: [0, 24] } }));
    expect(hook.summary.generatorHours).toBe(0);
    const drive = sim(basePlan({ ...plan, stop: { generatorHours: [0, 24] }, drives: [{ date: '2027-06-11', startHour: 0, hours: 11 }] }));
    const f2 = run(basePlan({ ...plan, stop: { generatorHours: [0, 24] }, drives: [{ date: '2027-06-11', startHour: 0, hours: 11 }] }));
    for (let r = 0; r < drive.n; r++) if (f2.hourly[r].driving) expect(drive.generatorOn[r]).toBe(0);
  });

  it('takes AC loads off the bank while it runs', () => {
    const g = run(
      basePlan({
        bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 30 },
        chargers: [{ kind: 'generator', amps: 20 }],
        loads: [{ name: 'AC', watts: 90, supply: 'ac' }],
      }),
    );
    for (const h of g.hourly) if (!h.disconnected) expect(h.loadWatts).toBe(h.generatorOn ? 0 : 112);
    expect(g.hourly.some((h) => h.generatorOn)).toBe(true);
  });
});
