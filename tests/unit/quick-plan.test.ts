import { describe, expect, it } from 'vitest';
import { runForecast, validatePlan } from '../../src/engine';
import { rigInputSchema } from '../../src/domain/rigs/rigs.schema';
import { loadInputSchema } from '../../src/domain/loads/loads.schema';
import { tripInputSchema } from '../../src/domain/trips/trips.schema';
import {
  buildQuickPlan,
  defaultQuickPlan,
  fieldForIssue,
  mountingGeometry,
  quickPlanFormSchema,
  quickPlanToRigAndTrip,
  readStoredQuickPlan,
  QUICK_PLAN_STORAGE_KEY,
  toCelsius,
  type QuickPlanForm,
} from '../../src/domain/quick-plan/quick-plan';
import { toPlace } from '../../src/features/quick-plan/quick-plan.api';

const values = (over: Partial<QuickPlanForm> = {}): QuickPlanForm => ({ ...defaultQuickPlan('2027-10-14'), ...over });

describe('quick plan form', () => {
  it('accepts its own defaults, a week after today', () => {
    const v = values();
    expect(quickPlanFormSchema.safeParse(v).success).toBe(true);
    expect(v.arrive).toBe('2027-10-21');
  });

  it.each([
    ['capacityAh', { capacityAh: 0 }, 'Enter a size above 0 Ah.'],
    ['capacityAh', { capacityAh: Number.NaN }, 'Enter the bank’s size in Ah, for example 100.'],
    ['panelWatts', { panelWatts: -5 }, 'Enter 0 or more watts.'],
    ['lat', { lat: 95 }, 'Enter a latitude between -90 and 90.'],
    ['nights', { nights: 2.5 }, 'Enter a whole number of nights.'],
    ['arrive', { arrive: '2027-02-30' }, 'Choose a real date.'],
    ['timeZone', { timeZone: 'Mars/Olympus' }, 'Choose the place’s time zone.'],
    ['low', { high: 5, low: 10 }, 'The low must not be above the high.'],
    ['high', { tempUnit: 'F' as const, high: 150, low: 50 }, 'Enter a high from -76 to 140 °F.'],
    ['placeName', { placeName: '   ' }, 'Name the place, or search for it.'],
  ])('names the field %s in its message', (field, over, message) => {
    const r = quickPlanFormSchema.safeParse(values(over));
    expect(r.success).toBe(false);
    const issue = r.error!.issues.find((i) => i.path[0] === field);
    expect(issue?.message).toBe(message);
  });

  it('converts °F to °C (32 °F is 0 °C, 212 °F is 100 °C)', () => {
    expect(toCelsius(32, 'F')).toBe(0);
    expect(toCelsius(212, 'F')).toBe(100);
    expect(toCelsius(21, 'C')).toBe(21);
  });
});

describe('buildQuickPlan', () => {
  it('builds a plan the engine accepts and forecasts', () => {
    const plan = buildQuickPlan(values({ loads: ['fridge', 'parasitic', 'laptop'] }));
    const v = validatePlan(plan);
    expect(v.ok).toBe(true);
    const r = runForecast(plan);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.forecast.hourly.length).toBe(3 * 24 - 4); // 15:00 on day 1 to 11:00 after the 3rd night
    expect(plan.loads?.map((l) => l.name)).toEqual(['Compressor fridge', 'Laptop (via inverter)', 'Parasitic draw']);
    expect(plan.loads?.[1]?.supply).toBe('ac');
  });

  it('stores temperatures in °C whatever unit the form used', () => {
    const plan = buildQuickPlan(values({ tempUnit: 'F', high: 68, low: 23 }));
    expect(plan.stops[0]?.weather?.[0]).toMatchObject({ highC: 20, lowC: -5 });
  });

  it('leaves the panels out when there are 0 W', () => {
    expect(buildQuickPlan(values({ panelWatts: 0 })).arrays).toEqual([]);
  });

  it.each([
    ['flat', 38.6, { tiltDeg: 0, azimuthDeg: 180, aim: 'fixed' }],
    ['tilted', 38.6, { tiltDeg: 39, azimuthDeg: 180, aim: 'fixed' }],
    ['portable', -33.9, { tiltDeg: 34, azimuthDeg: 0, aim: 'follow' }],
    ['tilted', 2, { tiltDeg: 10, azimuthDeg: 180, aim: 'fixed' }],
  ] as const)('mounting %s at latitude %s', (m, lat, expected) => {
    expect(mountingGeometry(m, lat)).toEqual(expected);
  });
});

describe('fieldForIssue', () => {
  it.each([
    ['bank.capacityAh', 'capacityAh'],
    ['bank.chemistry', 'chemistry'],
    ['arrays.0.ratedWatts', 'panelWatts'],
    ['arrays.0.tiltDeg', 'mounting'],
    ['loads.3.watts', 'loads'],
    ['stops.0.lat', 'lat'],
    ['stops.0.timeZone', 'timeZone'],
    ['stops.0.nights', 'nights'],
    ['stops.0.name', 'placeName'],
    ['stops.0.weather.0.highC', 'high'],
    ['stops.0.weather.0.lowC', 'low'],
    ['stops.0.weather.0.cloudOktas', 'cloudOktas'],
    ['drives.0.date', null],
    ['', null],
  ])('%s → %s', (path, field) => {
    expect(fieldForIssue(path)).toBe(field);
  });

  it('maps every issue the engine raises for a broken quick plan to a field', () => {
    const plan = buildQuickPlan(values());
    const broken = { ...plan, bank: { ...plan.bank, capacityAh: -1 }, stops: [{ ...plan.stops[0], lat: 123 }] };
    const v = validatePlan(broken);
    expect(v.ok).toBe(false);
    if (!v.ok) {
      expect(v.envelope.issues.map((i) => fieldForIssue(i.path)).sort()).toEqual(['capacityAh', 'lat']);
    }
  });
});

describe('quickPlanToRigAndTrip', () => {
  it('splits a quick plan into a rig, its loads and a trip that the rig and trip schemas accept', () => {
    const plan = buildQuickPlan(values({ loads: ['fridge', 'parasitic'] }));
    const { rig, loads, trip } = quickPlanToRigAndTrip(plan);
    expect(rigInputSchema.safeParse(rig).success).toBe(true);
    for (const l of loads) expect(loadInputSchema.safeParse(l).success).toBe(true);
    expect(tripInputSchema.safeParse({ ...trip, rigId: 'rig-1' }).success).toBe(true);
    expect(rig.bank).toEqual(plan.bank);
    expect(loads.map((l) => [l.name, l.standby])).toEqual([
      ['Compressor fridge', false],
      ['Parasitic draw', true],
    ]);
    expect(trip.stops).toEqual(plan.stops);
    // Named from the place and the month; the form's placeholder place gives the plain fallback (issue 16, item 16).
    expect(trip.name).toBe('My trip, October 2027');
  });

  it('reads the stored plan back, and nothing from empty or broken storage', () => {
    const plan = buildQuickPlan(values());
    const store = new Map<string, string>([[QUICK_PLAN_STORAGE_KEY, JSON.stringify(plan)]]);
    expect(readStoredQuickPlan({ getItem: (k) => store.get(k) ?? null })).toEqual(plan);
    expect(readStoredQuickPlan({ getItem: () => null })).toBeNull();
    expect(readStoredQuickPlan({ getItem: () => '{not json' })).toBeNull();
  });
});

describe('toPlace', () => {
  it('reads the place search’s rows, naming region and country in words, leaving out numeric region codes it cannot name', () => {
    expect(toPlace({ name: 'Moab', country: 'US', countryName: 'United States', adminCode: 'UT', region: 'Utah', lat: 38.57332, lon: -109.54984, population: 5235, timeZone: 'America/Denver' })).toEqual({
      name: 'Moab',
      where: 'Utah, United States',
      lat: 38.57332,
      lon: -109.54984,
      timeZone: 'America/Denver',
    });
    expect(toPlace({ name: 'Springs', country: 'ZA', countryName: 'South Africa', adminCode: '06', region: '', lat: -26.25, lon: 28.4, population: 1, timeZone: 'Africa/Johannesburg' }).where).toBe('South Africa');
    expect(toPlace({ name: 'Sault Ste. Marie', country: 'CA', countryName: 'Canada', adminCode: '08', region: 'Ontario', lat: 46.5, lon: -84.3, population: 1, timeZone: 'America/Toronto' }).where).toBe('Ontario, Canada');
  });
});
