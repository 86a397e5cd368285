import type { Forecast, ResolvedPlan } from '../../engine';
import type { Band, ForecastWithWeather, WeatherSources } from '../../domain/weather/band';
import type { DayOrigin, DaySource } from '../../domain/weather/weather';
import { formatDay } from '../../lib/format';
import { formatTemp, type Units } from '../../lib/units';
import { ASSUMED_WEATHER } from '../../engine/light';
import { useWidth } from './useWidth';

// Where each day's weather came from, and "How sure is this?" (the band), on the forecast page.

/** Our own words for a day's source. */
export const SOURCE_WORDS: Record<DaySource, { label: string; title: string; look: string }> = {
  typed: { label: 'Typed', title: 'The sky you typed for this day', look: 'bg-[#e6eef7] text-[#23456b] border-[#9db5d3]' },
  forecast: { label: 'Forecast', title: "The weather service's forecast for this day", look: 'bg-[#eef5ef] text-[#2f5b3a] border-[#9cc3a5]' },
  'past-year': { label: 'Past years', title: 'The same date in the median of the last ten years', look: 'bg-[#f3eefa] text-[#4d3a6e] border-[#bfaed8]' },
  copied: { label: 'Copied', title: "No weather for this day: the stop's nearest day with weather is used", look: 'bg-[#f1efe9] text-[#4a4436] border-[#c4bba5]' },
  assumed: { label: 'Assumed', title: 'Nothing known for this stop: typical skies (partly cloudy, 4 oktas; 20 °C by day, 10 °C at night)', look: 'bg-[#fdf3dc] text-[#6b4e0e] border-[#e0bd6a]' },
};

/** The "Assumed" badge's explanation, with the typical high and low in the reader's units. */
export function assumedTitle(units: Units): string {
  return `Nothing known for this stop: typical skies (partly cloudy, ${ASSUMED_WEATHER.cloudOktas} oktas; ${formatTemp(ASSUMED_WEATHER.highC, units)} by day, ${formatTemp(ASSUMED_WEATHER.lowC, units)} at night)`;
}

/** Where a copied day's weather came from, in the badge's words. */
const FROM_WORDS: Record<string, string> = { typed: 'typed', forecast: 'forecast', 'past-year': 'past years' };

/**
 * A day's source as a small badge with words (never colour alone): what the engine really used
 * for the day. A copied day names the day it copies ("Copied from Tue 21 Oct, typed").
 */
export function SourceBadge({ day, units = 'metric' }: { day: Pick<DayOrigin, 'source' | 'from' | 'fromSource'>; units?: Units }) {
  const source: DaySource = day.source;
  const w = SOURCE_WORDS[source];
  const copied = source === 'copied' && day.from;
  const label = copied ? `Copied from ${formatDay(day.from!)}${day.fromSource ? `, ${FROM_WORDS[day.fromSource] ?? day.fromSource}` : ''}` : w.label;
  const title = copied ? `No weather for this day: ${formatDay(day.from!)}'s is used, the stop's nearest day with weather` : source === 'assumed' ? assumedTitle(units) : w.title;
  return (
    <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-bold ${w.look}`} title={title} data-source={source}>
      {label}
    </span>
  );
}

/** True when some day's weather came from the weather service (directly or copied). */
export function usesService(sources: { stops: { days: DayOrigin[] }[] }): boolean {
  return sources.stops.some((s) => s.days.some((d) => d.source === 'forecast' || d.source === 'past-year' || d.fromSource === 'forecast' || d.fromSource === 'past-year'));
}

/** The weather service's data credit (its data is offered under CC BY 4.0, which asks for it wherever the data is shown). */
export function WeatherCredit() {
  return (
    <p className="mt-2 text-xs text-dusk" data-testid="weather-credit">
      Weather data by{' '}
      <a className="underline" href="https://open-meteo.com/" rel="noopener noreferrer">
        Open-Meteo.com
      </a>{' '}
      (
      <a className="underline" href="https://creativecommons.org/licenses/by/4.0/" rel="noopener noreferrer">
        CC BY 4.0
      </a>
      ), reworked into stop-days and past-year medians.
    </p>
  );
}

/** Per stop, each day with its source badge. */
export function DaySources({ sources, units = 'metric' }: { sources: WeatherSources; units?: Units }) {
  return (
    <ul className="space-y-2" data-testid="day-sources">
      {sources.stops.map((s, i) => (
        <li key={`${s.name}-${i}`}>
          <span className="font-semibold">{s.name}</span>
          <ul className="mt-1 flex flex-wrap gap-x-3 gap-y-1">
            {s.days.map((d) => (
              <li key={d.date} className="flex items-center gap-1 text-sm">
                <span className="text-dusk">{formatDay(d.date)}</span>
                <SourceBadge day={d} units={units} />
              </li>
            ))}
          </ul>
        </li>
      ))}
    </ul>
  );
}

/** The drawing's height in CSS px at any width (its width follows the card). */
const H = 220;
const PAD = { l: 34, r: 8, t: 8, b: 22 };

/** The band as a drawing: lowest to highest run shaded, the trip's own line, the floor dashed. */
export function BandChart({ band, forecast, floorPct }: { band: Band; forecast: Forecast; floorPct: number }) {
  const { ref, width } = useWidth<HTMLElement>();
  const W = width > 0 ? width : 640;
  const n = forecast.hourly.length;
  if (n < 2 || band.lowPct.length !== n) return null;
  const x = (i: number) => PAD.l + (i / (n - 1)) * (W - PAD.l - PAD.r);
  const y = (v: number) => PAD.t + (1 - v / 100) * (H - PAD.t - PAD.b);
  const upper = band.highPct.map((v, i) => `${x(i).toFixed(1)},${y(v).toFixed(1)}`).join(' ');
  const lower = band.lowPct.map((v, i) => `${x(n - 1 - i).toFixed(1)},${y(band.lowPct[n - 1 - i]!).toFixed(1)}`).join(' ');
  const line = forecast.hourly.map((r, i) => `${x(i).toFixed(1)},${y(r.usablePct ?? r.socPct).toFixed(1)}`).join(' ');
  const days = forecast.hourly.map((r, i) => ({ i, t: r.time })).filter((r) => r.t.slice(11, 13) === '00');
  const lineName = band.kind === 'years' ? 'median year' : 'as forecast';
  const bandName = band.kind === 'years' ? `lowest to highest of ${band.total} years` : 'two steps cloudier to two steps clearer';
  return (
    <figure ref={ref}>
      <svg viewBox={`0 0 ${W} ${H}`} width="100%" height={H} className="block w-full" role="img" aria-label={`Usable charge: ${bandName}, and the ${lineName}`} data-testid="band-chart">
        {[0, 25, 50, 75, 100].map((v) => (
          <g key={v}>
            <line x1={PAD.l} x2={W - PAD.r} y1={y(v)} y2={y(v)} stroke="#e3ddd0" strokeWidth="1" />
            <text x={PAD.l - 4} y={y(v) + 4} textAnchor="end" fontSize="11" fill="#5b6470">{v}%</text>
          </g>
        ))}
        {days.map((d) => (
          <text key={d.i} x={x(d.i)} y={H - 6} textAnchor="middle" fontSize="10" fill="#5b6470">{d.t.slice(8, 10)}</text>
        ))}
        <polygon points={`${upper} ${lower}`} fill="#8fb3d9" fillOpacity="0.45" stroke="none" />
        <line x1={PAD.l} x2={W - PAD.r} y1={y(floorPct)} y2={y(floorPct)} stroke="#b4452c" strokeWidth="1.5" strokeDasharray="5 4" />
        <polyline points={line} fill="none" stroke="#1f3a5f" strokeWidth="2" />
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-sm text-dusk">
        <span><span aria-hidden="true" className="mr-1 inline-block h-3 w-5 rounded-sm bg-[#8fb3d9]/70 align-middle" />{bandName}</span>
        <span><span aria-hidden="true" className="mr-1 inline-block h-0.5 w-5 bg-[#1f3a5f] align-middle" />{lineName}</span>
        <span><span aria-hidden="true" className="mr-1 inline-block w-5 border-t-2 border-dashed border-[#b4452c] align-middle" />floor {Math.round(floorPct)} %</span>
      </figcaption>
    </figure>
  );
}

/** "How sure is this?" and where the weather came from; nothing for forecasts saved without them. */
export default function WeatherPanel({ forecast, plan, units = 'metric' }: { forecast: Forecast; plan: ResolvedPlan; units?: Units }) {
  const f = forecast as ForecastWithWeather;
  const sources = f.weatherSources;
  const band = f.band ?? null;
  if (!sources && !band) return null;
  const floorPct = forecast.summary.floorSocPct ?? plan.bank.floorSocPct;
  return (
    <section aria-labelledby="sure-heading" className="card space-y-4 p-3 sm:p-5 print:break-inside-avoid" data-testid="weather-panel">
      <h2 id="sure-heading" className="text-xl">How sure is this?</h2>
      {sources?.message && (
        <p role="status" className="rounded-lg border border-[#e0bd6a] bg-[#fdf3dc] p-3 text-[#6b4e0e]" data-testid="weather-message">{sources.message}</p>
      )}
      {band ? (
        <>
          <p className="text-lg" data-testid="band-sentence">{band.sentence}</p>
          <p className="text-sm text-dusk">Usable charge hour by hour (the floor is judged on it; cold leaves part of the bank out of reach).</p>
          <BandChart band={band} forecast={forecast} floorPct={floorPct} />
        </>
      ) : (
        <p className="text-dusk">No band: every day's weather is typed, copied from a typed day or assumed, so there is nothing to vary.</p>
      )}
      {sources && (
        <div>
          <h3 className="mb-2 text-lg">Where each day's weather came from</h3>
          {sources.medianYear && <p className="mb-2 text-sm text-dusk">Past-year days use {sources.medianYear}, the median of the last ten years by sunshine.</p>}
          <DaySources sources={sources} units={units} />
          {usesService(sources) && <WeatherCredit />}
        </div>
      )}
    </section>
  );
}
