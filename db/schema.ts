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

export interface DB {
  user: UserTable;
  session: SessionTable;
  account: AccountTable;
  verification: VerificationTable;
  crews: CrewTable;
  crew_members: CrewMemberTable;
}

export type User = Selectable<UserTable>;
export type Crew = Selectable<CrewTable>;
export type NewCrew = Insertable<CrewTable>;
export type CrewUpdate = Updateable<CrewTable>;
export type CrewMember = Selectable<CrewMemberTable>;
