import type { Migration } from 'kysely';
import * as accounts from './2026_12_01_0001_accounts';
import * as rigsLoadsTrips from './2026_12_01_0002_rigs_loads_trips';
import * as forecasts from './2026_12_01_0003_forecasts';
import * as crewsMail from './2026_12_01_0004_crews_mail';
import * as proposals from './2026_12_01_0005_proposals';
import * as logsCheckIns from './2026_12_01_0006_logs_checkins';
import * as weatherCache from './2026_12_04_0007_weather_cache';
import * as rigShareInvites from './2026_12_04_0008_rig_share_invites';
import * as revision2Inputs from './2026_12_04_0009_revision2_inputs';
import * as softDelete from './2026_12_04_0010_soft_delete';
import * as watchLeases from './2026_12_04_0012_watch_leases';
import * as logOverview from './2026_12_04_0013_log_overview';
import * as rigLimits from './2026_12_04_0014_rig_limits';
import * as proposalDocument from './2026_12_04_0011_proposal_document';
import * as userTimeZone from './2026_12_04_0016_user_time_zone';
import * as sharedLimits from './2026_12_04_0018_shared_limits';
import * as mailHeaders from './2026_12_05_0019_mail_headers';
import * as tripWatch from './2026_12_04_0015_trip_watch';

/**
 * Every migration, in order. Listed statically (not read from the folder) so the same list runs
 * under tsx, vitest and a bundled server alike.
 */
export const migrations: Record<string, Migration> = {
  '2026_12_01_0001_accounts': accounts,
  '2026_12_01_0002_rigs_loads_trips': rigsLoadsTrips,
  '2026_12_01_0003_forecasts': forecasts,
  '2026_12_01_0004_crews_mail': crewsMail,
  '2026_12_01_0005_proposals': proposals,
  '2026_12_01_0006_logs_checkins': logsCheckIns,
  '2026_12_04_0007_weather_cache': weatherCache,
  '2026_12_04_0008_rig_share_invites': rigShareInvites,
  '2026_12_04_0009_revision2_inputs': revision2Inputs,
  '2026_12_04_0010_soft_delete': softDelete,
  '2026_12_04_0011_proposal_document': proposalDocument,
  '2026_12_04_0012_watch_leases': watchLeases,
  '2026_12_04_0013_log_overview': logOverview,
  '2026_12_04_0014_rig_limits': rigLimits,
  '2026_12_04_0015_trip_watch': tripWatch,
  '2026_12_04_0016_user_time_zone': userTimeZone,
  '2026_12_04_0018_shared_limits': sharedLimits,
  '2026_12_05_0019_mail_headers': mailHeaders,
};
