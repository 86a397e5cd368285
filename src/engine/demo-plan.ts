// The invented demo trip of product.md: the "Reyes-Okafor" camper van, five nights in late
// October 2027 at two high-desert stops with a drive day between them. All names, places and
// numbers are invented for the product; load figures sit inside the ranges of trade-notes.md.
import type { Plan } from './schema';

/** Builds a fresh copy of the demo plan (plan input form, defaults omitted where the table gives them). */
export function demoPlan(): Plan {
  return {
    bank: { chemistry: 'lifepo4', nominalVolts: 12.8, capacityAh: 300, initialSocPct: 95 },
    arrays: [
      // 2 × 200 W flat on the roof, on one MPPT controller rated 30 A.
      { name: 'Roof (2 × 200 W)', ratedWatts: 400, tiltDeg: 0, azimuthDeg: 180, controller: 'mppt', controllerMaxAmps: 30 },
    ],
    chargers: [{ kind: 'alternator', amps: 30 }],
    inverter: { efficiencyPct: 90, idleWatts: 12, alwaysOn: false },
    loads: [
      // ~45 W while running, 35 % duty at 20 °C, more when hot (trade notes: 35–60 W, ~50 % above 25 °C).
      { name: 'Compressor fridge', watts: 45, supply: 'dc', dutyPct: 35, response: 'cooling' },
      // Six LED fixtures at ~0.1 A each, mornings and evenings.
      { name: 'LED lights', watts: 1.5, quantity: 6, windows: [[6, 8], [18, 23]] },
      // A 4 A pump, a few minutes an hour at mealtimes.
      { name: 'Water pump', watts: 50, windows: [[7, 9], [18, 21]], dutyPct: 8 },
      // A small furnace's blower (~3 A) on a thermostat at 18 °C, lowered to 15 °C overnight.
      { name: 'Furnace blower (day)', watts: 36, windows: [[6, 22]], response: 'heating', setpointC: 18 },
      { name: 'Furnace blower (night)', watts: 36, windows: [[22, 6]], response: 'heating', setpointC: 15 },
      // Two phones at ~10 W for two hours each evening.
      { name: 'Phones', watts: 10, quantity: 2, windows: [[19, 21]] },
      // A laptop on the inverter during working hours on camp days.
      { name: 'Laptop', watts: 60, supply: 'ac', windows: [[9, 12], [13, 17]], dutyPct: 70, days: 'camp' },
      // CPAP without humidifier, run on 12 V through the night.
      { name: 'CPAP', watts: 25, windows: [[22, 6]] },
      // Detectors, control boards and radio standby: ~1 A.
      { name: 'Parasitic draw', watts: 13 },
    ],
    stops: [
      {
        name: 'Juniper Mesa',
        lat: 38.62,
        lon: -109.78,
        timeZone: 'America/Denver',
        arrive: '2027-10-21',
        nights: 3,
        arriveHour: 15,
        shadePct: 5,
        weather: [
          { date: '2027-10-21', cloudOktas: 1, highC: 19, lowC: 4 },
          { date: '2027-10-22', cloudOktas: 2, highC: 17, lowC: 2 },
          { date: '2027-10-23', cloudOktas: 5, highC: 12, lowC: 0 },
          { date: '2027-10-24', cloudOktas: 3, highC: 13, lowC: -4 },
        ],
      },
      {
        name: 'Cinder Flat',
        lat: 35.37,
        lon: -111.5,
        timeZone: 'America/Phoenix',
        arrive: '2027-10-24',
        nights: 2,
        arriveHour: 15,
        shadePct: 0,
        weather: [
          { date: '2027-10-24', cloudOktas: 2, highC: 15, lowC: 1 },
          { date: '2027-10-25', cloudOktas: 1, highC: 16, lowC: 1 },
          { date: '2027-10-26', cloudOktas: 0, highC: 17, lowC: 2 },
        ],
      },
    ],
    drives: [{ date: '2027-10-24', startHour: 9, hours: 5 }],
  };
}
