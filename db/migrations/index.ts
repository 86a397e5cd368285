import type { Migration } from 'kysely';
import * as accounts from './2026_12_01_0001_accounts';

/**
 * Every migration, in order. Listed statically (not read from the folder) so the same list runs
 * under tsx, vitest and a bundled server alike.
 */
export const migrations: Record<string, Migration> = {
  '2026_12_01_0001_accounts': accounts,
};
