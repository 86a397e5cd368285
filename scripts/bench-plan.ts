// The benchmark's trip (`npm run bench`): shared by the engine's and the weather band's timings.
import type { Plan } from '../src/engine/index';
import { at } from '../src/lib/invariant';

/** A trip of `days` nights over three stops, with 3 arrays, 4 chargers and 40 loads. */
export function benchPlan(days: number): Plan {
  const third = Math.max(1, Math.floor(days / 3));
  const nights = [third, third, days - 2 * third];
  const start = Date.UTC(2027, 5, 1) / 86_400_000;
  const iso = (d: number) => new Date(d * 86_400_000).toISOString().slice(0, 10);
  let day = start;
  const stops = nights.map((n, i) => {
    const s = {
      name: `Stop ${i + 1}`,
      lat: 36 + i * 1.5,
      lon: -110 - i,
      timeZone: i === 2 ? 'America/Phoenix' : 'America/Denver',
      arrive: iso(day),
      nights: n,
      arriveHour: 15,
      shadePct: 10 * i,
      hookup: (i === 1 ? 'shore' : 'none') as 'shore' | 'none',
      weather: Array.from({ length: n + 1 }, (_, k) => ({ date: iso(day + k), cloudOktas: (k * 3) % 9, highC: 24 + (k % 5), lowC: 8 + (k % 4) })),
    };
    day += n;
    return s;
  });
  const loads: NonNullable<Plan['loads']> = [];
  for (let i = 0; i < 40; i++) {
    loads.push({
      name: `Load ${i + 1}`,
      watts: 5 + ((i * 37) % 120),
      quantity: 1 + (i % 3),
      supply: i % 4 === 0 ? 'ac' : 'dc',
      windows: i % 5 === 0 ? [[0, 24]] : [[(i * 7) % 24, (i * 7 + 3) % 24], [(i * 11) % 24, (i * 11 + 2) % 24]],
      dutyPct: 20 + ((i * 13) % 80),
      days: (['all', 'camp', 'drive'] as const)[i % 3],
      response: (['none', 'none', 'cooling', 'heating'] as const)[i % 4],
    });
  }
  return {
    bank: { chemistry: 'lifepo4', capacityAh: 300, cutoffVolts: 11.5 },
    arrays: [
      { name: 'Roof', ratedWatts: 400, controllerMaxAmps: 30 },
      { name: 'Portable', ratedWatts: 200, tiltDeg: 35, aim: 'follow', controller: 'pwm', controllerMaxAmps: 15 },
      { name: 'Side', ratedWatts: 100, tiltDeg: 90, azimuthDeg: 200 },
    ],
    chargers: [
      { kind: 'alternator', amps: 30 },
      { kind: 'alternator', amps: 10 },
      { kind: 'shore', amps: 45 },
      { kind: 'generator', amps: 45, startSocPct: 30, stopSocPct: 80, fuelLitresPerHour: 0.5 },
    ],
    loads,
    stops,
    drives: [
      { date: at(stops, 1, 'stop').arrive, startHour: 9, hours: 5 },
      { date: at(stops, 2, 'stop').arrive, startHour: 8, hours: 6 },
    ],
  };
}
