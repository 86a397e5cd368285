import { useState, type ReactNode } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch, isConflict } from '../../lib/query-client';
import { formatDate } from '../../lib/format';
import { formatTemp, type Units } from '../../lib/units';
import type { TripDto } from '../../domain/trips/trips.schema';
import { SKY_CHOICES } from '../../domain/trips/sky';
import type { StopFill } from '../../domain/weather/weather';
import { SourceBadge, WeatherCredit, usesService } from '../forecast/WeatherPanel';
import { updateTrip } from './trips.api';
import { tripKeys } from './trips.queries';

// A stop's weather on the itinerary, day by day with where it comes from (typed, forecast, past
// years, assumed), and one button that copies the weather service's days into the stop's typed
// weather after the camper confirms. Days the camper typed are never replaced.

/** The trip's weather fill as GET /api/trips/:id/weather answers it (the parts shown here). */
export interface TripWeatherFill {
  kind: 'near' | 'far';
  status: 'ok' | 'unreachable';
  message: string | null;
  medianYear: number | null;
  stops: StopFill[];
}

export const tripWeatherQuery = (tripId: string, version: number) => ({
  queryKey: [...tripKeys.detail(tripId), 'weather', version] as const,
  queryFn: () => apiFetch<TripWeatherFill>(`/api/trips/${encodeURIComponent(tripId)}/weather`),
  staleTime: 10 * 60_000,
  retry: false,
});

/** Untyped days of a stop the service filled, as typed weather entries. */
export function fetchedDays(fill: TripWeatherFill, i: number): { date: string; cloudOktas: number; highC: number; lowC: number }[] {
  return (fill.stops[i]?.weather ?? [])
    .filter((w) => w.source === 'forecast' || w.source === 'past-year')
    .map((w) => ({ date: w.date, cloudOktas: w.cloudOktas, highC: w.highC, lowC: w.lowC }));
}

/** The nearest sky choice in words, e.g. "Mostly cloudy". */
const sky = (oktas: number) => [...SKY_CHOICES].sort((a, b) => Math.abs(a.oktas - oktas) - Math.abs(b.oktas - oktas))[0]!.label;

export function StopWeather({ trip, index, units, canEdit, fallback }: { trip: TripDto; index: number; units: Units; canEdit: boolean; fallback: ReactNode }) {
  const fill = useQuery(tripWeatherQuery(trip.id, trip.version));
  const client = useQueryClient();
  const [asking, setAsking] = useState(false);
  const [saving, setSaving] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  if (!fill.data) return <>{fallback}</>;
  const f = fill.data;
  const stop = f.stops[index];
  if (!stop) return <>{fallback}</>;
  const byDate = new Map(stop.weather.map((w) => [w.date, w]));
  const copy = fetchedDays(f, index);
  const fromWhat = f.kind === 'near' ? 'the forecast' : `the past years (${f.medianYear ?? 'median year'})`;
  const buttonLabel = f.kind === 'near' ? 'Fill from the forecast' : 'Use past years';

  async function save() {
    setSaving(true);
    setProblem(null);
    try {
      const stops = trip.stops.map((s, i) => {
        if (i !== index) return s;
        const typed = new Set(s.weather.map((w) => w.date));
        const added = copy.filter((d) => !typed.has(d.date));
        return { ...s, weather: [...s.weather, ...added].sort((a, b) => (a.date < b.date ? -1 : 1)) };
      });
      const saved = await updateTrip(trip.id, { version: trip.version, stops } as never);
      client.setQueryData(tripKeys.detail(trip.id), saved);
      setAsking(false);
    } catch (err) {
      setProblem(
        isConflict(err)
          ? 'Someone else saved this trip meanwhile: nothing was changed. Reload the page to see their version, then try again.'
          : `The weather was not saved: ${(err as Error).message}`,
      );
    } finally {
      setSaving(false);
    }
  }

  return (
    <div className="mt-2 space-y-2" data-testid={`stop-weather-${index}`}>
      {f.message ? <p role="status" className="text-sm text-[#6b4e0e]">{f.message}</p> : null}
      <ul className="grid gap-1 text-sm tabular-nums sm:grid-cols-2">
        {stop.days.map((d) => {
          // A copied day shows the sky of the day it copies, as the engine uses it.
          const w = byDate.get(d.date) ?? (d.from ? byDate.get(d.from) : undefined);
          return (
            <li key={d.date} className="flex flex-wrap items-center gap-2 border-t border-sand py-0.5">
              <span className="w-24 font-semibold">{formatDate(d.date, false)}</span>
              <SourceBadge day={d} units={units} />
              <span className="text-slate-text">
                {w ? `${sky(w.cloudOktas)}, ${formatTemp(w.highC, units)} / ${formatTemp(w.lowC, units)}` : 'typical skies'}
              </span>
            </li>
          );
        })}
      </ul>
      {canEdit && copy.length > 0 ? (
        asking ? (
          <div className="rounded-lg border border-sand bg-[#faf6ee] p-3 text-sm" role="group" aria-label="Confirm copying the weather">
            <p>
              Copy {copy.length} {copy.length === 1 ? 'day' : 'days'} from {fromWhat} into this stop’s typed weather? Days you typed stay as they
              are, and you can change any day afterwards.
            </p>
            <div className="mt-2 flex flex-wrap gap-2">
              <button type="button" className="btn btn-primary" disabled={saving} onClick={() => void save()}>
                {saving ? 'Saving…' : `Copy ${copy.length} ${copy.length === 1 ? 'day' : 'days'}`}
              </button>
              <button type="button" className="btn btn-quiet" disabled={saving} onClick={() => setAsking(false)}>Cancel</button>
            </div>
            {problem ? <p role="alert" className="mt-2 text-alert">{problem}</p> : null}
          </div>
        ) : (
          <button type="button" className="btn btn-quiet" onClick={() => setAsking(true)}>{buttonLabel}</button>
        )
      ) : null}
      {index === f.stops.length - 1 && usesService(f) ? <WeatherCredit /> : null}
    </div>
  );
}
