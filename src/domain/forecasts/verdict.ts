// The verdict: the forecast's answer in one sentence, before any chart (ux.md, "The forecast page").
import type { Forecast, ResolvedPlan } from '../../engine';
import { formatClock, formatDay, formatRowTime, formatWh, localParts, pct } from '../../lib/format';
import { assumedDays, type ForecastWithWeather } from '../weather/band';
import { ASSUMED_WEATHER } from '../../engine/light';
import { formatTemp, type Units } from '../../lib/units';

export type VerdictStatus = 'makes-it' | 'below-reserve' | 'runs-out' | 'weather-assumed' | 'some-years-short';

/** What the verdict says, in words, with the figures behind them. */
export interface Verdict {
  status: VerdictStatus;
  /** "Makes it — lowest 41 % on Sat 25 Oct, 06:00" or "Runs out Thu 23 Oct at 03:00 at Mesa camp — 14 hours short". */
  headline: string;
  /** One calm sentence of context under the headline. */
  detail: string;
  /** Row time of the first cutoff, or null. */
  cutoffAt: string | null;
  /** Name of the stop where the bank first runs out, or null. */
  cutoffStop: string | null;
  /** Hours with unmet energy. */
  hoursShort: number;
  lowestPct: number;
  lowestAt: string;
  /** The reserve the chart shades: the trip's reserve, or the bank's floor. */
  reservePct: number;
}

function hours(n: number): string {
  return n === 1 ? '1 hour' : `${n} hours`;
}

/** The reserve a forecast is judged against: the trip's reserve when set, else the bank's floor. */
export function reserveOf(forecast: Forecast, plan: ResolvedPlan, reserveSocPct?: number | null): number {
  const floor = forecast.summary.floorSocPct ?? plan.bank.floorSocPct;
  return reserveSocPct ?? floor;
}

/** Name of the stop that owns a row. */
export function stopNameAt(forecast: Forecast, plan: ResolvedPlan, rowIndex: number): string {
  const row = forecast.hourly[rowIndex];
  if (!row) return plan.stops[0]?.name ?? '';
  return forecast.stops?.[row.stop]?.name ?? plan.stops[row.stop]?.name ?? '';
}

/**
 * The forecast's answer in words: whether the bank lasts, and if not, when and where it runs out.
 * Never a plain "Makes it" on assumed weather; with a band ("how sure is this?") it counts the
 * years (or skies) the bank makes it in. Temperatures in the words follow `units`.
 */
export function verdict(forecast: Forecast, plan: ResolvedPlan, reserveSocPct?: number | null, units: Units = 'metric'): Verdict {
  const v = engineVerdict(forecast, plan, reserveSocPct);
  const extra = forecast as ForecastWithWeather;
  const band = extra.band ?? null;
  if (band && v.status !== 'runs-out') {
    const what = band.kind === 'years' ? `in ${band.madeIt} of the last ${band.total} years' weather` : `in ${band.madeIt} of ${band.total} sky cases`;
    if (band.madeIt < band.total) {
      v.status = 'some-years-short';
      v.headline = `Makes it ${what} only — ${v.headline.replace(/^Makes it(, but [^—]*)? — /, '')}`;
      v.detail = `${band.sentence} ${v.detail}`;
    } else {
      v.headline = `${v.headline.replace(/^Makes it/, `Makes it ${what}`)}`;
    }
  } else if (band && v.status === 'runs-out') {
    v.detail = `${v.detail} ${band.sentence}`;
  }
  const assumed = assumedDays(extra.weatherSources, forecast.warnings);
  if (assumed.length > 0 && v.status !== 'runs-out') {
    const n = assumed.length;
    v.status = 'weather-assumed';
    v.headline = `Not sure yet — ${n === 1 ? '1 day has' : `${n} days have`} no real weather, ${v.headline.charAt(0).toLowerCase()}${v.headline.slice(1)} on typical skies`;
    v.detail = `Those days use typical skies (${ASSUMED_WEATHER.cloudOktas} oktas, ${formatTemp(ASSUMED_WEATHER.highC, units)} by day, ${formatTemp(ASSUMED_WEATHER.lowC, units)} at night), not a forecast or past years. Type their skies on the trip, or use "Fill from the forecast" / "Use past years" there, then run the forecast again. ${v.detail}`;
  }
  return v;
}

function engineVerdict(forecast: Forecast, plan: ResolvedPlan, reserveSocPct?: number | null): Verdict {
  const s = forecast.summary;
  const reservePct = reserveOf(forecast, plan, reserveSocPct);
  const hoursShort = forecast.hourly.reduce((n, r) => n + (r.unmetWatts > 0 ? 1 : 0), 0);
  const lowest = `lowest ${pct(s.minSocPct)} on ${formatRowTime(s.minSocAt)}`;

  if (s.firstCutoffAt) {
    const row = forecast.hourly.findIndex((r) => r.time === s.firstCutoffAt);
    const stop = stopNameAt(forecast, plan, row < 0 ? 0 : row);
    const p = localParts(s.firstCutoffAt);
    const when = p ? `${formatDay(p.date)} at ${formatClock(s.firstCutoffAt)}` : s.firstCutoffAt;
    const short = hoursShort > 0 ? ` — ${hours(hoursShort)} short` : '';
    const detail =
      hoursShort > 0
        ? `The bank reaches its ${pct(s.floorSocPct)} floor and disconnects: loads go without about ${formatWh(s.unmetWh)} over ${hours(hoursShort)} (an estimate).`
        : `The bank touches its ${pct(s.floorSocPct)} floor and disconnects briefly (an estimate).`;
    return { status: 'runs-out', headline: `Runs out ${when} at ${stop}${short}`, detail, cutoffAt: s.firstCutoffAt, cutoffStop: stop, hoursShort, lowestPct: s.minSocPct, lowestAt: s.minSocAt, reservePct };
  }

  const end = `The bank ends the trip at ${pct(s.endSocPct)} (an estimate).`;
  if (reservePct > s.floorSocPct && s.minSocPct < reservePct) {
    return {
      status: 'below-reserve',
      headline: `Makes it, but dips below your ${pct(reservePct)} reserve — ${lowest}`,
      detail: `No cutoff: the bank stays above its ${pct(s.floorSocPct)} floor. ${end}`,
      cutoffAt: null,
      cutoffStop: null,
      hoursShort,
      lowestPct: s.minSocPct,
      lowestAt: s.minSocAt,
      reservePct,
    };
  }
  return {
    status: 'makes-it',
    headline: `Makes it — ${lowest}`,
    detail: `No cutoff, and the bank stays above the ${pct(reservePct)} ${reservePct > s.floorSocPct ? 'reserve' : 'floor'}. ${end}`,
    cutoffAt: null,
    cutoffStop: null,
    hoursShort,
    lowestPct: s.minSocPct,
    lowestAt: s.minSocAt,
    reservePct,
  };
}
