import { describe, expect, it } from 'vitest';
import { dailyTotals, inverterIdleWhPerDay, loadWhPerDay, whToAh, type EnergyRig } from '../../src/domain/loads/energy';
import { coveredHours, describeWindows, hoursInWindows, isAllDay, parseWindows, windowsToText } from '../../src/domain/loads/windows';

const dcRig: EnergyRig = { nominalVolts: 12, inverter: null };
const acRig: EnergyRig = { nominalVolts: 12.8, inverter: { efficiencyPct: 90, idleWatts: 10, alwaysOn: false } };

describe('schedule windows', () => {
  it.each([
    [[[18, 23]], 5],
    [[[22, 6]], 8], // wraps past midnight
    [[[0, 24]], 24],
    [[[18, 23], [6, 8]], 7],
    [[[18, 23], [20, 24]], 6], // overlap counts once
    [[[5, 5]], 0], // [h, h] is empty (forecast-engine.md, Loads)
    [[[24, 6]], 6],
    [[], 0],
  ] as [number, number][][][])('%j covers %d hours', (windows, hours) => {
    expect(hoursInWindows(windows as [number, number][])).toBe(hours);
  });

  it('marks the right clock hours of a wrapping window', () => {
    const on = coveredHours([[22, 2]]);
    expect(on.map((v, h) => (v ? h : -1)).filter((h) => h >= 0)).toEqual([0, 1, 22, 23]);
  });

  it('reads what people type', () => {
    expect(parseWindows('18-23; 6-8')).toEqual({ ok: true, windows: [[18, 23], [6, 8]] });
    expect(parseWindows('22–6')).toEqual({ ok: true, windows: [[22, 6]] });
    expect(parseWindows('18:00-23:00, 6 to 8')).toEqual({ ok: true, windows: [[18, 23], [6, 8]] });
    expect(parseWindows('all day')).toEqual({ ok: true, windows: [[0, 24]] });
    expect(parseWindows('  ')).toEqual({ ok: true, windows: [[0, 24]] });
    expect(parseWindows('None')).toEqual({ ok: true, windows: [] });
    expect(parseWindows('7-7')).toEqual({ ok: true, windows: [[7, 7]] }); // an empty window, as the engine reads it
  });

  it.each(['18-', 'evening', '18-25', '30-40', '6.5-8', '18-23;;x'])('refuses “%s” with a message saying how to write it', (text) => {
    const r = parseWindows(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message.length).toBeGreaterThan(10);
  });

  it('writes windows back as text and as words', () => {
    expect(windowsToText([[18, 23], [6, 8]])).toBe('18-23; 6-8');
    expect(windowsToText([[0, 24]])).toBe('all day');
    expect(windowsToText([[0, 12], [12, 24]])).toBe('all day');
    expect(windowsToText([])).toBe('none');
    expect(describeWindows([[22, 6]])).toBe('22:00–06:00');
    expect(isAllDay([[6, 6]])).toBe(false);
  });
});

describe('daily energy of a load (estimate before temperature response)', () => {
  it('is watts × quantity × hours × duty for a DC load', () => {
    // 45 W compressor fridge at 50 % duty all day: 45 × 24 × 0.5 = 540 Wh
    expect(loadWhPerDay({ watts: 45, windows: [[0, 24]], dutyPct: 50 }, dcRig)).toBe(540);
    expect(loadWhPerDay({ watts: 1.5, quantity: 4, windows: [[18, 23]] }, dcRig)).toBe(30);
    expect(loadWhPerDay({ watts: 60, windows: [[22, 6]], dutyPct: 100 }, dcRig)).toBe(480);
  });

  it('divides an AC load by the inverter efficiency', () => {
    expect(loadWhPerDay({ watts: 90, supply: 'ac', windows: [[9, 17]] }, acRig)).toBeCloseTo(800, 9);
    // With no inverter on the rig the engine's default efficiency (90 %) applies.
    expect(loadWhPerDay({ watts: 90, supply: 'ac', windows: [[9, 17]] }, dcRig)).toBeCloseTo(800, 9);
    expect(loadWhPerDay({ watts: 90, supply: 'ac', windows: [[9, 17]] }, { inverter: { efficiencyPct: 80 } })).toBeCloseTo(900, 9);
  });

  it('is zero for an empty schedule or no duty, never NaN', () => {
    expect(loadWhPerDay({ watts: 50, windows: [[7, 7]] }, dcRig)).toBe(0);
    expect(loadWhPerDay({ watts: 50, dutyPct: 0 }, dcRig)).toBe(0);
    expect(loadWhPerDay({ watts: Number.NaN }, dcRig)).toBe(0);
  });

  it('converts Wh to Ah at the bank nominal volts', () => {
    expect(whToAh(540, 12)).toBe(45);
    expect(whToAh(540, 12.8)).toBeCloseTo(42.1875, 9);
    expect(whToAh(100, 0)).toBe(0);
  });

  // trade-notes.md, Loads table, "parasitic standby": ~1–1.2 A total measured on trailers and
  // motorhomes [meas]; product.md: "around 1 A at 12-13 V (12-16 W, ~25-30 Ah a day)".
  it('puts a 1 A-class standby draw at 25–30 Ah a day at 12 V', () => {
    const ah = whToAh(loadWhPerDay({ watts: 13, windows: [[0, 24]] }, dcRig), 12);
    expect(ah).toBeGreaterThanOrEqual(25);
    expect(ah).toBeLessThanOrEqual(30);
  });
});

describe('inverter idle draw', () => {
  // trade-notes.md, Loads table, "inverter idle": "10 W idle ≈ 20 Ah/day" [spec/meas] at 12 V.
  it('counts a 10 W idle draw left on all day as about 20 Ah at 12 V', () => {
    const wh = inverterIdleWhPerDay([], { nominalVolts: 12, inverter: { idleWatts: 10, alwaysOn: true } });
    expect(wh).toBe(240);
    expect(whToAh(wh, 12)).toBe(20);
  });

  it('counts idle only in hours some AC load is scheduled, once per hour', () => {
    const loads = [
      { watts: 45, supply: 'ac' as const, windows: [[9, 17]] as [number, number][] },
      { watts: 800, supply: 'ac' as const, windows: [[7, 8], [16, 18]] as [number, number][] },
      { watts: 50, supply: 'dc' as const, windows: [[0, 24]] as [number, number][] },
    ];
    // AC hours: 7, 9..16, 17 → 7 + 8 hours + 17 = 10 hours
    expect(inverterIdleWhPerDay(loads, acRig)).toBe(100);
    expect(inverterIdleWhPerDay(loads, dcRig)).toBe(0);
  });
});

describe('day totals', () => {
  it('adds the loads of each kind of day and the inverter idle draw', () => {
    const loads = [
      { watts: 45, windows: [[0, 24]] as [number, number][], dutyPct: 50 }, // 540 every day
      { watts: 100, windows: [[9, 11]] as [number, number][], days: 'drive' as const }, // 200 on drive days
      { watts: 90, supply: 'ac' as const, windows: [[18, 20]] as [number, number][], days: 'camp' as const }, // 200 on camp days + 2 h idle
    ];
    const t = dailyTotals(loads, acRig);
    expect(t.camp.loadsWh).toBeCloseTo(740, 9);
    expect(t.camp.inverterIdleWh).toBe(20);
    expect(t.camp.wh).toBeCloseTo(760, 9);
    expect(t.camp.ah).toBeCloseTo(760 / 12.8, 9);
    expect(t.drive.loadsWh).toBeCloseTo(740, 9);
    expect(t.drive.inverterIdleWh).toBe(0);
  });
});
