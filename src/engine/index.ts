// Public API of the forecast engine. Pure: no framework, database, clock or randomness.
//
//   runForecast(input: unknown)      → { ok: true, forecast } | { ok: false, envelope }   (API routes)
//   validatePlan(input: unknown)     → { ok: true, plan }     | { ok: false, envelope }
//   forecast(plan: ResolvedPlan)     → Forecast
//   prepareTrip(plan) + simulatePrepared(prepared, variant) (+ toForecast) for upgrade sweeps
//   prepareSun(plan) + prepareWithSun(sun, planWithOtherWeatherOrLoads) for many weathers on one
//     trip (the band); sunKey(plan) keys a cache of prepared suns
//   prepareSky(sun, plan) + prepareWithSky(sun, sky, planWithOtherLoadsOrBank) for many load lists
//     or banks in one trip's weather; skyKey(plan) keys a cache of prepared skies
export { runForecast, validatePlan, forecast, toForecast, ENGINE_REVISION } from './forecast';
export { toColumnsJson } from './columns-json';
export type { Forecast, HourlyRow, DayRow, ForecastSummary, ForecastWarning, RunResult, ValidationResult } from './forecast';
export { prepareTrip, prepareSun, prepareWithSun, prepareSky, prepareWithSky, sunKey, skyKey, SUBSTEPS, BATTERY_SUBSTEPS } from './prepare';
export type { PreparedTrip, PreparedSun, PreparedSky, PreparedArray, PreparedDemand, RowWarning } from './prepare';
export { simulatePrepared, variantSchema, CUTOFF_NONE, CUTOFF_FLOOR, CUTOFF_VOLTS } from './simulate';
export type { SimResult, SimSummary, Variant } from './simulate';
export { planSchema, bankSchema, arraySchema, chargerSchema, inverterSchema, loadSchema, stopSchema, driveSchema, weatherSchema, resolveBank, LIMITS, BANK_LOCATIONS, LOAD_LOCATIONS, WEATHER_SOURCES, weatherHourSchema } from './schema';
export type { Plan, ResolvedPlan, ResolvedBank, ResolvedArray, ResolvedCharger, ResolvedInverter, ResolvedLoad, ResolvedStop, ResolvedDrive, BankLocation, LoadLocation } from './schema';
export { PlanValidationError, zodIssuesToEnvelope, issuePath } from './errors';
export type { InvalidPlanEnvelope, PlanIssue } from './errors';
export { demoPlan } from './demo-plan';
// The zod-free helpers (chemistries, time zones, timeline, load windows, resting voltage), also
// importable alone through './light' by islands that must not load zod.
export * from './light';
// Revision 2: the battery and load rules, for reference tests, sweeps and pages.
export {
  acceptanceAmps,
  bankResistanceOhms,
  busCurrent,
  busCurrentOrNaN,
  capacityFactor,
  chargeCurrent,
  coldChargeBlocked,
  dischargeCurrent,
  isLeadAcid,
  peukertAh,
  peukertFactor,
  strandedAh,
  taperedChargeAh,
  taperFactor,
  taperKnee,
  terminalVolts,
  thermalStep,
  usablePct,
} from './battery';
export { cabinTemp, dutyAt, loadTemp, windowFraction } from './loads';
export { hourlyArrays } from './weather';
export type { WeatherHour } from './weather';
