import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

/** Table types of the Sunreckon database. better-auth's tables keep its camelCase column names. */
export interface UserTable {
  id: string;
  name: string;
  email: string;
  emailVerified: ColumnType<number | boolean, number | boolean, number | boolean>;
  image: string | null;
  kind: 'camper' | 'installer';
  units: Generated<'metric' | 'imperial'>;
  createdAt: ColumnType<string | Date, string | Date, string | Date>;
  updatedAt: ColumnType<string | Date, string | Date, string | Date>;
}

export interface SessionTable {
  id: string;
  expiresAt: ColumnType<string | Date, string | Date, string | Date>;
  token: string;
  createdAt: ColumnType<string | Date, string | Date, string | Date>;
  updatedAt: ColumnType<string | Date, string | Date, string | Date>;
  ipAddress: string | null;
  userAgent: string | null;
  userId: string;
}

export interface AccountTable {
  id: string;
  accountId: string;
  providerId: string;
  userId: string;
  accessToken: string | null;
  refreshToken: string | null;
  idToken: string | null;
  accessTokenExpiresAt: string | null;
  refreshTokenExpiresAt: string | null;
  scope: string | null;
  password: string | null;
  createdAt: ColumnType<string | Date, string | Date, string | Date>;
  updatedAt: ColumnType<string | Date, string | Date, string | Date>;
}

export interface VerificationTable {
  id: string;
  identifier: string;
  value: string;
  expiresAt: ColumnType<string | Date, string | Date, string | Date>;
  createdAt: ColumnType<string | Date, string | Date, string | Date>;
  updatedAt: ColumnType<string | Date, string | Date, string | Date>;
}

export interface CrewTable {
  id: string;
  name: string;
  version: Generated<number>;
  created_at: string;
  updated_at: string;
}

export type CrewRole = 'owner' | 'editor' | 'viewer';

export interface CrewMemberTable {
  crew_id: string;
  user_id: string;
  role: CrewRole;
  created_at: string;
}

/** A rig: bank, arrays, chargers and inverter are JSON text in the engine contract's shapes. */
export interface RigTable {
  id: string;
  crew_id: string;
  name: string;
  bank: string;
  arrays: string;
  chargers: string;
  inverter: string | null;
  version: Generated<number>;
  created_by: string | null;
  created_at: string;
  updated_at: string;
}

export interface LoadTable {
  id: string;
  rig_id: string;
  name: string;
  watts: number;
  quantity: number;
  supply: 'dc' | 'ac';
  /** JSON: [[from, to], …] local hours. */
  windows: string;
  duty_pct: number;
  days: 'all' | 'camp' | 'drive';
  response: 'none' | 'cooling' | 'heating';
  setpoint_c: number;
  note: string;
  standby: number;
  position: number;
  added_by: string | null;
  version: Generated<number>;
  created_at: string;
  updated_at: string;
}

export type LoadAction = 'added' | 'changed' | 'removed' | 'imported';

/** One write to a rig's load list; `load_id` has no foreign key so a removal keeps its trail. */
export interface LoadActivityTable {
  id: string;
  rig_id: string;
  load_id: string | null;
  user_id: string | null;
  action: LoadAction;
  load_name: string;
  /** JSON: { field: [before, after] }. */
  changes: string;
  at: string;
}

export interface TripTable {
  id: string;
  crew_id: string;
  rig_id: string;
  name: string;
  /** JSON: the engine contract's stops, weather days included. */
  stops: string;
  /** JSON: the engine contract's drives. */
  drives: string;
  reserve_soc_pct: number | null;
  version: Generated<number>;
  created_by: string | null;
  created_at: string;
  updated_at: string;
}

export interface DB {
  user: UserTable;
  session: SessionTable;
  account: AccountTable;
  verification: VerificationTable;
  crews: CrewTable;
  crew_members: CrewMemberTable;
  rigs: RigTable;
  loads: LoadTable;
  load_activity: LoadActivityTable;
  trips: TripTable;
}

export type User = Selectable<UserTable>;
export type Crew = Selectable<CrewTable>;
export type NewCrew = Insertable<CrewTable>;
export type CrewUpdate = Updateable<CrewTable>;
export type CrewMember = Selectable<CrewMemberTable>;
export type RigRow = Selectable<RigTable>;
export type LoadRow = Selectable<LoadTable>;
export type LoadActivityRow = Selectable<LoadActivityTable>;
export type TripRow = Selectable<TripTable>;
