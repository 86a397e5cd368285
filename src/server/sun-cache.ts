import { LRUCache } from 'lru-cache';
import {
  prepareSky,
  prepareSun,
  prepareWithSky,
  simulatePrepared,
  skyKey,
  sunKey,
  toColumnsJson,
  toForecast,
  validatePlan,
  type Forecast,
  type PreparedSky,
  type PreparedSun,
  type ResolvedPlan,
  type RunResult,
} from '../engine';

/**
 * The prepared sun of recent trips (sun positions, clear-sky irradiance, angles on each array), kept
 * in this process's memory and keyed by the engine's `sunKey`: places, time zones, dates, arrival
 * hours, drives and the arrays' geometry. A preview or re-run of the same trip with other loads,
 * bank, chargers or weather reuses it and skips the CPU-heavy part of a forecast.
 * Least recently used trips leave first; the cache holds at most SUN_CACHE_MB (default 64) of arrays,
 * prepared suns and skies (below) together.
 */
const MAX_BYTES = Math.max(1, Number(process.env.SUN_CACHE_MB ?? 64)) * 1024 * 1024;

/** Roughly what a prepared sun takes in memory: its typed arrays, strings and small collections. */
export function sizeOfSun(sun: PreparedSun | PreparedSky): number {
  let bytes = 0;
  const seen = new Set<unknown>();
  const walk = (v: unknown): void => {
    if (v === null || typeof v !== 'object') {
      bytes += typeof v === 'string' ? 40 + v.length * 2 : 8;
      return;
    }
    if (seen.has(v)) return;
    seen.add(v);
    if (ArrayBuffer.isView(v)) {
      bytes += v.byteLength + 64;
      return;
    }
    if (v instanceof Map) {
      bytes += 64;
      for (const [k, x] of v) {
        bytes += 32;
        walk(k);
        walk(x);
      }
      return;
    }
    bytes += 32;
    for (const x of Array.isArray(v) ? v : Object.values(v)) walk(x);
  };
  walk(sun);
  return Math.max(1, bytes);
}

/** Suns under `sun:` + sunKey, skies under `sky:` + skyKey, in one byte budget. */
const kept = new LRUCache<string, PreparedSun | PreparedSky>({ maxSize: MAX_BYTES, sizeCalculation: sizeOfSun });
const counts = { hits: 0, misses: 0 };

/**
 * The prepared sky (the weather's part: air temperature, irradiance and each array's output per
 * rated watt) of recent trips, keyed by the engine's `skyKey`: a preview or re-run of the same trip in
 * the same weather with other loads or another bank skips it too.
 */
const skyCounts = { hits: 0, misses: 0 };

/** The prepared sky of a validated plan on its sun, from the cache when a plan of the same trip and weather made it. */
export function skyOf(sun: PreparedSun, plan: ResolvedPlan): PreparedSky {
  const key = `sky:${skyKey(plan)}`;
  const cached = kept.get(key) as PreparedSky | undefined;
  if (cached && cached.sunKey === sun.key) {
    skyCounts.hits += 1;
    return cached;
  }
  skyCounts.misses += 1;
  const sky = prepareSky(sun, plan);
  if (sizeOfSun(sky) <= MAX_BYTES) kept.set(key, sky);
  return sky;
}

/** The prepared trip of a validated plan, with its sun and sky from the caches. */
function preparedOf(plan: ResolvedPlan) {
  const sun = sunOf(plan);
  return prepareWithSky(sun, skyOf(sun, plan), plan);
}

/** The prepared sun of a validated plan, from the cache when a plan of the same trip made it. */
export function sunOf(plan: ResolvedPlan): PreparedSun {
  const key = `sun:${sunKey(plan)}`;
  const cached = kept.get(key) as PreparedSun | undefined;
  if (cached) {
    counts.hits += 1;
    return cached;
  }
  counts.misses += 1;
  const sun = prepareSun(plan);
  // A trip larger than the whole cache is computed but not kept.
  if (sizeOfSun(sun) <= MAX_BYTES) kept.set(key, sun);
  return sun;
}

/** `forecast(plan)` with the sun from the cache; the same figures as the engine's own. */
export function cachedForecast(plan: ResolvedPlan): Forecast {
  const prepared = preparedOf(plan);
  return toForecast(prepared, simulatePrepared(prepared));
}

/** `runForecast(input)` with the sun from the cache: validates an untrusted plan and forecasts it. */
export function runCachedForecast(input: unknown): RunResult {
  const v = validatePlan(input);
  if (!v.ok) return v;
  return { ok: true, forecast: cachedForecast(v.plan) };
}

/**
 * `runCachedForecast` with the hours as columns (`src/lib/forecast-columns.ts`), as UTF-8 JSON written
 * straight from the simulation (the preview's `?hourly=columns` answer): no object per hour is made.
 */
export function runCachedColumnsJson(
  input: unknown,
): { ok: true; json: Uint8Array } | { ok: false; envelope: Extract<RunResult, { ok: false }>['envelope'] } {
  const v = validatePlan(input);
  if (!v.ok) return v;
  const prepared = preparedOf(v.plan);
  return { ok: true, json: toColumnsJson(prepared, simulatePrepared(prepared)) };
}

/** What the cache holds (suns and skies together) and how often each was found, for tests and the load test's notes. */
export function sunCacheStats(): {
  entries: number;
  bytes: number;
  maxBytes: number;
  hits: number;
  misses: number;
  sky: { hits: number; misses: number };
} {
  return {
    entries: kept.size,
    bytes: kept.calculatedSize,
    maxBytes: MAX_BYTES,
    ...counts,
    sky: { ...skyCounts },
  };
}
