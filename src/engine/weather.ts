// Weather per stop and local day (forecast-engine.md, "Weather and temperature").
import { dayNumber, isoDate } from './tz';

/** The sky and temperatures of one local day. */
export interface DayWeather {
  cloudOktas: number;
  highC: number;
  lowC: number;
  /** True when no day was given and the 4 oktas / 20 °C / 10 °C fallback applies. */
  assumed: boolean;
  /** Revision 2: measured or forecast GHI (W/m²) per local clock hour, NaN where not given. */
  ghiWm2?: Float64Array;
  /** Revision 2: measured or forecast air °C per local clock hour, NaN where not given. */
  tempC?: Float64Array;
}

/** One hour of weather from a source (Revision 2). */
export interface WeatherHour {
  hour: number;
  ghiWm2?: number | undefined;
  tempC?: number | undefined;
  cloudPct?: number | undefined;
}

/** Per-clock-hour GHI and temperature arrays (NaN where an hour gives none), or undefined without hours. */
export function hourlyArrays(hours: WeatherHour[] | undefined): { ghiWm2: Float64Array; tempC: Float64Array } | undefined {
  if (!hours || hours.length === 0) return undefined;
  const ghiWm2 = new Float64Array(24).fill(NaN);
  const tempC = new Float64Array(24).fill(NaN);
  for (const h of hours) {
    if (h.ghiWm2 !== undefined) ghiWm2[h.hour] = h.ghiWm2;
    if (h.tempC !== undefined) tempC[h.hour] = h.tempC;
  }
  return { ghiWm2, tempC };
}

/** Fallback when a stop gives no usable weather at all. */
export const ASSUMED_WEATHER = { cloudOktas: 4, highC: 20, lowC: 10 } as const;

interface WeatherEntry {
  date: string;
  cloudOktas: number;
  highC: number;
  lowC: number;
  hourly?: WeatherHour[] | undefined;
}

/** Weather of each owned day of one stop, plus the given dates it ignores. */
export interface StopWeather {
  byDay: Map<number, DayWeather>;
  ignoredDates: string[];
}

/**
 * Resolves a stop's weather for the local days it owns: the given day, else the nearest given
 * day by whole days (ties: the earlier), else the fallback. Given days the stop owns no hour of
 * are ignored (and not used as a nearest day).
 */
export function resolveStopWeather(entries: WeatherEntry[], ownedDays: number[]): StopWeather {
  const owned = new Set(ownedDays);
  const usable: { day: number; e: WeatherEntry }[] = [];
  const ignoredDates: string[] = [];
  for (const e of entries) {
    const day = dayNumber(e.date);
    if (owned.has(day)) usable.push({ day, e });
    else ignoredDates.push(e.date);
  }
  usable.sort((a, b) => a.day - b.day);
  ignoredDates.sort();
  const byDay = new Map<number, DayWeather>();
  for (const day of ownedDays) {
    let best: { day: number; e: WeatherEntry } | null = null;
    for (const u of usable) {
      // Sorted ascending, so a strict "<" keeps the earlier day on ties.
      if (best === null || Math.abs(u.day - day) < Math.abs(best.day - day)) best = u;
    }
    byDay.set(
      day,
      best
        ? { cloudOktas: best.e.cloudOktas, highC: best.e.highC, lowC: best.e.lowC, assumed: false, ...hourlyArrays(best.e.hourly) }
        : { ...ASSUMED_WEATHER, assumed: true },
    );
  }
  return { byDay, ignoredDates };
}

/** Plain-English text for the fallback warning. */
export function assumedMessage(stopName: string, day: number): string {
  return `No weather given for ${stopName} on ${isoDate(day)}: assumed partly cloudy skies (${ASSUMED_WEATHER.cloudOktas} oktas), a high of ${ASSUMED_WEATHER.highC} °C and a low of ${ASSUMED_WEATHER.lowC} °C.`;
}

/** Plain-English text for the ignored-days warning. */
export function ignoredMessage(stopName: string, dates: string[]): string {
  const list = dates.join(', ');
  return `Weather for ${stopName} on ${list} is ignored: the trip is not at ${stopName} on ${dates.length === 1 ? 'that day' : 'those days'}.`;
}
