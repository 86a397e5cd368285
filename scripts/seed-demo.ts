import type { Kysely } from 'kysely';
import type { DB } from '../db/schema';
import { demoPlan, ENGINE_REVISION } from '../src/engine';
import { rigInputSchema } from '../src/domain/rigs/rigs.schema';
import { loadInputSchema } from '../src/domain/loads/loads.schema';
import { tripInputSchema } from '../src/domain/trips/trips.schema';
import { createRig, toRigDto } from '../src/server/rigs';
import { createLoad, listLoads } from '../src/server/loads';
import { createTrip, toTripDto } from '../src/server/trips';
import { createForecast } from '../src/server/forecasts';

// The Reyes-Okafor crew's two invented rigs (product.md, "Demo scenario") and the same five-night
// late-October loop planned for each: the van makes it, the older trailer runs out. The van also
// has a watched trip a week from today, for the trip watch and the /dev "turn the weather" control.

const trailer = {
  name: 'Travel trailer (5.5 m)',
  // Two 6 V flooded golf-cart batteries in series: 12 V, 225 Ah.
  bank: { chemistry: 'flooded', nominalVolts: 12, capacityAh: 225, initialSocPct: 100, cutoffVolts: 10.5 },
  arrays: [{ name: 'Portable panel (100 W)', ratedWatts: 100, tiltDeg: 45, aim: 'follow', controller: 'pwm', controllerMaxAmps: 10 }],
  chargers: [],
  inverter: null,
};

const trailerLoads = [
  { name: 'Absorption fridge control board', watts: 6, note: 'Runs on propane; the board draws ~0.5 A.' },
  {
    name: 'LED lights',
    watts: 1.2,
    quantity: 8,
    windows: [
      [6, 8],
      [18, 23],
    ],
  },
  {
    name: 'Water pump',
    watts: 55,
    windows: [
      [7, 9],
      [18, 21],
    ],
    dutyPct: 8,
  },
  { name: 'Furnace blower', watts: 60, windows: [[0, 24]], response: 'heating', setpointC: 17, note: 'Larger older furnace, ~5 A.' },
  { name: 'Phones', watts: 10, quantity: 2, windows: [[19, 21]] },
  { name: 'Radio', watts: 15, windows: [[17, 22]] },
  { name: 'Parasitic draw', watts: 14, standby: true, note: 'LP/CO detector, radio memory, control panel (~1.1 A).' },
];

const DEMO_TRIPS = ['High desert loop, late October', 'High desert loop with the trailer'];

/** The van's watched trip (issue #20): always a week from today, inside the trip watch's window. */
export const WATCHED_TRIP = 'Winter sun at Cardón Flat (watched)';

/** The watched trip's plan: one invented desert stop, arriving 6 days from `today`, 4 nights, no typed weather. */
export function watchedTripInput(rigId: string, today = new Date()) {
  const arrive = new Date(today.getTime() + 6 * 86_400_000).toISOString().slice(0, 10);
  return tripInputSchema.parse({
    rigId,
    name: WATCHED_TRIP,
    // Nothing typed: every day comes from the (fake) weather service's forecast, so turning the
    // weather on /dev changes the watch's answer. In the fake's normal December weather the van
    // makes it (lowest roughly 40–70 % in runs of 4 Dec 2026); under its storm (a tenth of the light,
    // 12 °C colder) the bank, outside and cold, cuts off within the first two nights.
    stops: [
      {
        name: 'Cardón Flat',
        lat: 24.0,
        lon: -110.3,
        timeZone: 'America/Mazatlan',
        arrive,
        nights: 4,
        arriveHour: 15,
        shadePct: 0,
        weather: [],
      },
    ],
    drives: [],
    reserveSocPct: 20,
  });
}

/**
 * Keeps one watched demo trip a week ahead: made when missing; a stale one (arrived already, or from
 * a demo database seeded long ago) is replaced with its forecasts and watch history. No forecast is
 * saved here: the watch's first run becomes the answer the crew has seen.
 */
async function ensureWatchedTrip(db: Kysely<DB>, ids: { crewId: string; ownerId: string }): Promise<void> {
  const van = await db
    .selectFrom('rigs')
    .select(['id', 'crew_id'])
    .where('crew_id', '=', ids.crewId)
    .where('name', '=', 'Camper van (6.1 m)')
    .executeTakeFirst();
  if (!van) return;
  const today = new Date().toISOString().slice(0, 10);
  const existing = await db
    .selectFrom('trips')
    .select(['id', 'stops'])
    .where('crew_id', '=', ids.crewId)
    .where('name', '=', WATCHED_TRIP)
    .execute();
  let fresh = false;
  for (const t of existing) {
    const arrive = (JSON.parse(t.stops) as { arrive?: string }[])[0]?.arrive ?? '';
    if (!fresh && arrive > today) fresh = true;
    else await db.deleteFrom('trips').where('id', '=', t.id).execute();
  }
  if (!fresh) await createTrip(db, ids.ownerId, van, watchedTripInput(van.id));
}

/**
 * A demo database seeded before the engine's current revision keeps its old snapshots (they are
 * never recomputed) and gets one new saved forecast per demo trip from today's engine, so the
 * demo opens on current numbers.
 */
async function reforecastDemoTrips(db: Kysely<DB>, ids: { crewId: string; ownerId: string }): Promise<void> {
  const trips = await db.selectFrom('trips').selectAll().where('crew_id', '=', ids.crewId).where('name', 'in', DEMO_TRIPS).execute();
  for (const trip of trips) {
    const current = await db
      .selectFrom('forecasts')
      .select('id')
      .where('trip_id', '=', trip.id)
      .where('engine_revision', '>=', ENGINE_REVISION)
      .executeTakeFirst();
    if (current) continue;
    const rig = await db.selectFrom('rigs').selectAll().where('id', '=', trip.rig_id).executeTakeFirstOrThrow();
    await createForecast(db, {
      rig: toRigDto(rig, true),
      loads: await listLoads(db, rig.id),
      trip: toTripDto(trip, true),
      userId: ids.ownerId,
      name: `First look (engine revision ${ENGINE_REVISION})`,
    });
  }
}

/** Seeds the demo rigs, loads, trips and one saved forecast each; a crew that has rigs already only gets forecasts from the current engine revision. */
export async function seedDemoRigs(db: Kysely<DB>, ids: { crewId: string; ownerId: string; memberId: string }): Promise<void> {
  const existing = await db.selectFrom('rigs').select('id').where('crew_id', '=', ids.crewId).executeTakeFirst();
  if (existing) {
    await reforecastDemoTrips(db, ids);
    return ensureWatchedTrip(db, ids);
  }
  const plan = demoPlan();

  const van = await createRig(
    db,
    ids.ownerId,
    ids.crewId,
    rigInputSchema.parse({
      name: 'Camper van (6.1 m)',
      bank: plan.bank,
      arrays: plan.arrays,
      chargers: plan.chargers,
      inverter: plan.inverter,
    }),
  );
  for (const load of plan.loads ?? []) {
    const standby = load.name === 'Parasitic draw';
    await createLoad(
      db,
      van.id,
      load.name === 'CPAP' || load.name === 'Laptop' ? ids.memberId : ids.ownerId,
      loadInputSchema.parse({ ...load, standby }),
    );
  }
  const trailerRig = await createRig(db, ids.ownerId, ids.crewId, rigInputSchema.parse(trailer));
  for (const load of trailerLoads) await createLoad(db, trailerRig.id, ids.ownerId, loadInputSchema.parse(load));

  for (const [rig, name] of [
    [van, DEMO_TRIPS[0]!],
    [trailerRig, DEMO_TRIPS[1]!],
  ] as const) {
    const trip = await createTrip(
      db,
      ids.ownerId,
      { id: rig.id, crew_id: ids.crewId },
      tripInputSchema.parse({ rigId: rig.id, name, stops: plan.stops, drives: plan.drives, reserveSocPct: rig === van ? 20 : 50 }),
    );
    await createForecast(db, { rig, loads: await listLoads(db, rig.id), trip, userId: ids.ownerId, name: 'First look' });
  }
  await ensureWatchedTrip(db, ids);
}
