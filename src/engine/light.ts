// The engine's zod-free door: plain data and small helpers (chemistries, calendar and time-zone
// arithmetic, the trip's timeline, load windows, resting voltage, the assumed weather) that a
// light page island may import without pulling in the validation library and the simulation.
// `index.ts` re-exports all of it, so server and domain code keep one door; import from here
// only where the browser bundle should stay small (a page island that shows figures, not a form).
export { CHEMISTRIES, CHEMISTRY_DEFAULTS } from './chemistry';
export type { Chemistry } from './chemistry';
export { HOUR_MS, DAY_MS, daysFromCivil, civilFromDays, parseIsoDate, dayNumber, isoDate, isValidTimeZone, offsetMinutes, localToInstant } from './tz';
export { planTimeline } from './timeline';
export type { TripTimeline } from './timeline';
export { ASSUMED_WEATHER } from './weather';
export { windowMask, inWindow, loadWattsAt, inverterDcWatts } from './loads';
export type { LoadSpec, InverterSpec } from './loads';
export { ocvVolts } from './battery';
