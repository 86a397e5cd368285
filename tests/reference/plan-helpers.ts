// Small plan builders shared by the engine's reference and unit tests.
import { forecast, prepareTrip, simulatePrepared, validatePlan, type Forecast, type Plan, type ResolvedPlan, type SimResult } from '../../src/engine/index';

type StopInput = Plan['stops'][number];

/** Weather entries with one constant temperature (high = low) and sky for `days` days from `arrive`. */
export function constantWeather(arrive: string, days: number, tempC: number, cloudOktas = 8): NonNullable<StopInput['weather']> {
  const start = Date.parse(`${arrive}T00:00:00Z`) / 86_400_000;
  return Array.from({ length: days + 1 }, (_, i) => ({
    date: new Date((start + i) * 86_400_000).toISOString().slice(0, 10),
    cloudOktas,
    highC: tempC,
    lowC: tempC,
  }));
}

/** A one-stop plan in a fixed-offset zone with constant weather, no arrays, loads or chargers. */
export function basePlan(over: Partial<Plan> & { stop?: Partial<StopInput>; tempC?: number } = {}): Plan {
  const { stop, tempC = 25, ...rest } = over;
  const arrive = stop?.arrive ?? '2027-06-10';
  const nights = stop?.nights ?? 2;
  return {
    bank: { chemistry: 'lifepo4', capacityAh: 100, initialSocPct: 50 },
    arrays: [],
    chargers: [],
    loads: [],
    drives: [],
    ...rest,
    stops: [
      {
        name: 'Test camp',
        lat: 35,
        lon: -111,
        timeZone: 'America/Phoenix',
        arrive,
        nights,
        arriveHour: 15,
        weather: constantWeather(arrive, nights, tempC),
        ...stop,
      },
    ],
  };
}

/** Validates (throwing with the envelope on failure) and returns the resolved plan. */
export function resolved(plan: Plan): ResolvedPlan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(JSON.stringify(v.envelope));
  return v.plan;
}

/** Forecast of a plan that must validate. */
export function run(plan: Plan): Forecast {
  return forecast(resolved(plan));
}

/** Raw simulation of a plan that must validate. */
export function sim(plan: Plan): SimResult {
  return simulatePrepared(prepareTrip(resolved(plan)));
}
