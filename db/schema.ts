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
  /** The zone app-event times are shown in; null until the browser tells it or the user chooses (migration 0016). */
  timeZone: ColumnType<string | null, string | null | undefined, string | null>;
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
  version: Generated<number>;
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
  /** What the rig may still carry, kg (migration 0014), or null when not stated. */
  payload_kg: ColumnType<number | null, number | null | undefined, number | null>;
  /** Room for batteries, litres (migration 0014), or null when not stated. */
  battery_space_l: ColumnType<number | null, number | null | undefined, number | null>;
  /** When the rig was deleted (migration 0010): hidden, restorable for 30 days, then purged; null while in use. */
  deleted_at: ColumnType<string | null, string | null | undefined, string | null>;
  /** Who deleted it (migration 0010). */
  deleted_by: ColumnType<string | null, string | null | undefined, string | null>;
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
  /** Where the load sits (engine revision 2): cooling loads follow that place's temperature. */
  location: Generated<'cabin' | 'outside'>;
  /** Watts of one unit while starting or running flat out, or null for its running watts. */
  surge_watts: ColumnType<number | null, number | null | undefined, number | null>;
  note: string;
  standby: number;
  position: number;
  added_by: string | null;
  /** Who saved the load last (migration 0010); null before it was recorded. */
  updated_by: ColumnType<string | null, string | null | undefined, string | null>;
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
  /** When the trip was deleted (migration 0010): hidden, restorable for 30 days, then purged; null while in use. */
  deleted_at: ColumnType<string | null, string | null | undefined, string | null>;
  /** Who deleted it (migration 0010). */
  deleted_by: ColumnType<string | null, string | null | undefined, string | null>;
}

/** An invitation to join a crew; only a SHA-256 of the link's token is stored. */
export interface InvitationTable {
  id: string;
  crew_id: string;
  email: string;
  role: CrewRole;
  token_hash: string;
  invited_by: string | null;
  expires_at: string;
  accepted_at: string | null;
  accepted_by: string | null;
  revoked_at: string | null;
  version: Generated<number>;
  created_at: string;
  updated_at: string;
}

/** An installer's read access to one rig, given by a crew owner. */
export interface RigGrantTable {
  id: string;
  rig_id: string;
  installer_id: string;
  granted_by: string | null;
  created_at: string;
}

/** A rig share not yet opened (any address); an installer's grant with the same id waits on it. */
export interface RigShareInviteTable {
  id: string;
  rig_id: string;
  email: string;
  invited_by: string | null;
  created_at: string;
}

/** The crew a user last switched to. */
export interface ActiveCrewTable {
  user_id: string;
  crew_id: string;
  updated_at: string;
}

export type OutboxStatus = 'queued' | 'sending' | 'sent';

/** Every e-mail, written with the change that causes it and sent (and retried) from here. */
export interface OutboxTable {
  id: string;
  kind: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  status: Generated<OutboxStatus>;
  attempts: Generated<number>;
  last_error: string | null;
  next_attempt_at: string;
  locked_until: string | null;
  message_id: string | null;
  created_at: string;
  sent_at: string | null;
  /** Extra header lines as JSON (migration 0019), or null. */
  headers: string | null;
}

/** What the local SMTP catcher received (development, demo and tests only). */
export interface CaughtMailTable {
  id: Generated<number>;
  message_id: string | null;
  from_address: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  received_at: string;
  /** The header lines received, as JSON [{ key, line }] (migration 0019). */
  headers: Generated<string | null>;
}

/** A saved forecast: the exact plan that ran (JSON) and its result, hourly rows stored column-wise. */
export interface ForecastTable {
  id: string;
  crew_id: string;
  trip_id: string;
  rig_id: string;
  name: string;
  plan: string;
  summary: string;
  result: string;
  reserve_soc_pct: number | null;
  created_by: string | null;
  created_at: string;
  /** The engine revision that made the result; null for forecasts saved before it was recorded (revision 1). */
  engine_revision: ColumnType<number | null, number | null | undefined, number | null>;
  /** 'plan' (run by a person) or 'watch' (run by the trip watch, migration 0015). */
  kind: ColumnType<'plan' | 'watch', 'plan' | 'watch' | undefined, 'plan' | 'watch'>;
}

/** An uploaded battery-monitor CSV: the original file, the column mapping it was read with, its span. */
export interface MonitorLogTable {
  id: string;
  crew_id: string;
  rig_id: string;
  name: string;
  original: Uint8Array;
  original_bytes: number;
  /** JSON: the confirmed column mapping (src/monitor/mapping.ts). */
  mapping: string;
  time_zone: string;
  sample_count: number;
  started_at: string;
  ended_at: string;
  version: Generated<number>;
  created_by: string | null;
  created_at: string;
  /** JSON: the thinned series, night baseline and daily Ah (LogSeries), made at save; null until first opened for older logs. */
  overview: ColumnType<string | null, string | null | undefined, string | null>;
}

/** One reading of a monitor log; amps are positive while charging. */
export interface MonitorSampleTable {
  log_id: string;
  t: number;
  volts: number | null;
  amps: number | null;
  soc_pct: number | null;
  temp_c: number | null;
}

/** An at-camp reading and the re-forecast of the rest of the trip made from it. */
export interface CheckInTable {
  id: string;
  crew_id: string;
  trip_id: string;
  /** ISO 8601 with the offset the reading was given with. */
  at: string;
  at_ms: number;
  source: 'soc' | 'volts';
  soc_pct: number;
  resting_volts: number | null;
  /** The saved forecast whose plan the re-forecast ran on (null: the trip as it was then). */
  forecast_id: string | null;
  /** JSON: the re-forecast's summary and the saved forecast's, side by side. */
  result: string;
  version: Generated<number>;
  created_by: string | null;
  created_at: string;
}

/** An installer's prices: `prices` is JSON of src/proposals/schema.ts priceListSchema without its currency. */
export interface PriceListTable {
  installer_id: string;
  currency: string;
  prices: string;
  version: Generated<number>;
  created_at: string;
  updated_at: string;
}

export type ProposalStatus = 'draft' | 'sent' | 'accepted' | 'declined';

/** An installer's upgrade proposal: its own copies of the before/after plans and forecasts (JSON, hourly column-wise). */
export interface ProposalTable {
  id: string;
  crew_id: string;
  rig_id: string;
  trip_id: string | null;
  forecast_id: string | null;
  installer_id: string | null;
  installer_name: string;
  title: string;
  notes: Generated<string>;
  status: Generated<ProposalStatus>;
  /** JSON: the option's changes (src/proposals/schema.ts changesSchema). */
  changes: string;
  currency: string;
  /** JSON: parts list lines. */
  parts: string;
  /** JSON: running-cost lines over the trip (generator hours). */
  running: string;
  /** JSON: cable runs, each with its input and its computed check. */
  cables: string;
  /** JSON: the cautions shown with the proposal. */
  cautions: string;
  reserve_soc_pct: number | null;
  /** JSON: { before, after } forecast summaries, for lists. */
  summary: string;
  before_plan: string;
  before_result: string;
  after_plan: string;
  after_result: string;
  decision_comment: string | null;
  /** JSON: the business document's fields (src/domain/proposals/document.schema.ts); '{}' before migration 0011. */
  document: Generated<string>;
  /** The name the crew owner typed to accept. */
  accepted_name: string | null;
  decided_by: string | null;
  decided_at: string | null;
  sent_at: string | null;
  version: Generated<number>;
  created_at: string;
  updated_at: string;
}

/** One answer of the weather service: place in tenths of a degree, UTC date range and kind. */
export interface WeatherCacheTable {
  kind: 'forecast' | 'archive';
  lat_tenths: number;
  lon_tenths: number;
  start_date: string;
  end_date: string;
  /** JSON: the decoded hourly series (`HourlySeries` of src/domain/weather). */
  series: string;
  fetched_at: string;
}

/** Trip watch: who holds a piece of background work until when (epoch ms). */
export interface WatchLeaseTable {
  name: string;
  holder: string;
  expires_at: number;
}

/** Trip watch state of one trip (migration 0015): the choice, the last run, the answer the crew saw, the notice. */
export interface TripWatchTable {
  trip_id: string;
  /** 0/1 when the owner or an editor chose; null: on by default within 21 days of the first arrival. */
  enabled: number | null;
  last_run_at: string | null;
  seen_forecast_id: string | null;
  seen_status: string | null;
  seen_min_soc_pct: number | null;
  /** Row time with the stop's offset. */
  seen_cutoff_at: string | null;
  last_error: string | null;
  last_error_at: string | null;
  notice_at: string | null;
  notice_forecast_id: string | null;
  notice_status: string | null;
  notice_previous_status: string | null;
  notice_summary: string | null;
  updated_at: string;
}

/** One watch run's figures (the saved forecast holds the rest). */
export interface WatchRunTable {
  forecast_id: string;
  trip_id: string;
  ran_at: string;
  status: string;
  min_soc_pct: number;
  first_cutoff_at: string | null;
  first_cutoff_local: string | null;
  changed: number;
  reason: string | null;
  band_low_pct: number | null;
  band_high_pct: number | null;
}

/** One person's watch mail for one trip: 'follow', 'stop' or null (the role's default), and the last mail. */
export interface WatchPersonTable {
  trip_id: string;
  user_id: string;
  choice: 'follow' | 'stop' | null;
  last_mailed_at: string | null;
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
  forecasts: ForecastTable;
  invitations: InvitationTable;
  rig_grants: RigGrantTable;
  rig_share_invites: RigShareInviteTable;
  active_crews: ActiveCrewTable;
  outbox: OutboxTable;
  caught_mail: CaughtMailTable;
  price_lists: PriceListTable;
  proposals: ProposalTable;
  monitor_logs: MonitorLogTable;
  monitor_samples: MonitorSampleTable;
  check_ins: CheckInTable;
  weather_cache: WeatherCacheTable;
  watch_leases: WatchLeaseTable;
  trip_watches: TripWatchTable;
  watch_runs: WatchRunTable;
  watch_people: WatchPersonTable;
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
export type InvitationRow = Selectable<InvitationTable>;
export type RigGrantRow = Selectable<RigGrantTable>;
export type OutboxRow = Selectable<OutboxTable>;
export type CaughtMail = Selectable<CaughtMailTable>;
export type PriceListRow = Selectable<PriceListTable>;
export type ProposalRow = Selectable<ProposalTable>;
export type MonitorLogRow = Selectable<MonitorLogTable>;
export type CheckInRow = Selectable<CheckInTable>;
