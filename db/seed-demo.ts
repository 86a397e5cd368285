import type { Kysely } from 'kysely';
import type { DB } from './schema';

/** Demo rigs, loads and trip; filled in once the rig tables exist. */
export async function seedDemoRigs(_db: Kysely<DB>, _ids: { crewId: string; ownerId: string; memberId: string }): Promise<void> {}
