import { sql, type Kysely } from 'kysely';
import { columnTypes } from './types';

// Rigs, their loads (with an activity trail) and trips. JSON columns hold the engine contract's
// shapes as text; every editable row carries a `version` for optimistic concurrency.
export async function up(db: Kysely<any>): Promise<void> {
  const ty = columnTypes(db);
  await db.schema
    .createTable('rigs')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('bank', ty.json, (c) => c.notNull())
    .addColumn('arrays', ty.json, (c) => c.notNull().defaultTo('[]'))
    .addColumn('chargers', ty.json, (c) => c.notNull().defaultTo('[]'))
    .addColumn('inverter', ty.json)
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('rigs_crew_idx').on('rigs').column('crew_id').execute();
  await db.schema.createIndex('rigs_created_by_idx').on('rigs').column('created_by').execute();

  await db.schema
    .createTable('loads')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('watts', ty.real, (c) => c.notNull())
    .addColumn('quantity', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('supply', 'text', (c) => c.notNull().defaultTo('dc').check(sql`supply in ('dc', 'ac')`))
    .addColumn('windows', ty.json, (c) => c.notNull().defaultTo('[[0,24]]'))
    .addColumn('duty_pct', ty.real, (c) => c.notNull().defaultTo(100))
    .addColumn('days', 'text', (c) => c.notNull().defaultTo('all').check(sql`days in ('all', 'camp', 'drive')`))
    .addColumn('response', 'text', (c) => c.notNull().defaultTo('none').check(sql`response in ('none', 'cooling', 'heating')`))
    .addColumn('setpoint_c', ty.real, (c) => c.notNull().defaultTo(18))
    .addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('standby', ty.flag, (c) => (ty.pg ? c.notNull().defaultTo(ty.off) : c.notNull().defaultTo(0).check(sql`standby in (0, 1)`)))
    .addColumn('position', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('added_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('loads_rig_position_idx').on('loads').columns(['rig_id', 'position']).execute();
  await db.schema.createIndex('loads_added_by_idx').on('loads').column('added_by').execute();

  // No foreign key on load_id: the trail of a removed load stays readable.
  await db.schema
    .createTable('load_activity')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('load_id', 'text')
    .addColumn('user_id', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('action', 'text', (c) => c.notNull().check(sql`action in ('added', 'changed', 'removed', 'imported')`))
    .addColumn('load_name', 'text', (c) => c.notNull())
    .addColumn('changes', ty.json, (c) => c.notNull().defaultTo('{}'))
    .addColumn('at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('load_activity_rig_at_idx').on('load_activity').columns(['rig_id', 'at']).execute();
  await db.schema.createIndex('load_activity_user_idx').on('load_activity').column('user_id').execute();

  await db.schema
    .createTable('trips')
    .addColumn('id', 'text', (c) => c.primaryKey())
    .addColumn('crew_id', 'text', (c) => c.notNull().references('crews.id').onDelete('cascade'))
    .addColumn('rig_id', 'text', (c) => c.notNull().references('rigs.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('stops', ty.json, (c) => c.notNull())
    .addColumn('drives', ty.json, (c) => c.notNull().defaultTo('[]'))
    .addColumn('reserve_soc_pct', ty.real)
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_by', 'text', (c) => c.references('user.id').onDelete('set null'))
    .addColumn('created_at', ty.time, (c) => c.notNull())
    .addColumn('updated_at', ty.time, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('trips_crew_idx').on('trips').column('crew_id').execute();
  await db.schema.createIndex('trips_rig_idx').on('trips').column('rig_id').execute();
  await db.schema.createIndex('trips_created_by_idx').on('trips').column('created_by').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['trips', 'load_activity', 'loads', 'rigs']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
}
