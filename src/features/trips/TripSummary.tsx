import { ASSUMED_WEATHER } from '../../engine/light';
import { addDaysIso, formatDate, formatHour, formatNumber, rigSummary } from '../../lib/format';
import { formatTemp, type Units } from '../../lib/units';
import type { RigDto } from '../../domain/rigs/rigs.schema';
import { SKY_CHOICES } from '../../domain/trips/sky';
import type { TripDto } from '../../domain/trips/trips.schema';
import { StopWeather } from './StopWeather';

/** "Thu 21 Oct – Tue 26 Oct 2027 · 5 nights" for stops in travel order. */
export function spanText(stops: readonly { arrive: string; nights: number }[]): string {
  if (stops.length === 0) return '';
  const from = stops[0]!.arrive;
  const last = stops[stops.length - 1]!;
  const to = addDaysIso(last.arrive, last.nights);
  const nights = Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
  return `${formatDate(from, from.slice(0, 4) !== to.slice(0, 4))} – ${formatDate(to)} · ${nights} ${nights === 1 ? 'night' : 'nights'}`;
}

/** The sky choice in words; cover between the choices (from a weather service, say) keeps its oktas. */
function skyLabel(oktas: number): string {
  const exact = SKY_CHOICES.find((s) => s.oktas === oktas);
  if (exact) return exact.label;
  const near = [...SKY_CHOICES].sort((a, b) => Math.abs(a.oktas - oktas) - Math.abs(b.oktas - oktas))[0]!;
  return `${near.label} (${formatNumber(oktas, 1)} ${oktas === 1 ? 'okta' : 'oktas'})`;
}

const coord = (v: number, pos: string, neg: string) => `${formatNumber(Math.abs(v), 3)}° ${v < 0 ? neg : pos}`;

/**
 * The saved itinerary to read: the rig, every stop with its dates, shade, hookup and weather, the
 * drive days and the reserve. Light on purpose (no form code): the trip page opens with it, and
 * the editor loads when the camper asks for it.
 */
export function TripSummary({ trip, rigs, units, onEdit, editorLoading = false }: { trip: TripDto; rigs?: RigDto[]; units: Units; onEdit?: () => void; editorLoading?: boolean }) {
  const rig = rigs?.find((r) => r.id === trip.rigId);
  const hasGenerator = Boolean(rig?.chargers.some((c) => c.kind === 'generator'));
  return (
    <div className="space-y-5" data-testid="trip-summary">
      <div>
        <p className="text-sm font-bold"><a href="/trips" className="text-slate-text underline-offset-2 hover:underline">← Trips</a></p>
        <h1 className="text-2xl sm:text-3xl">{trip.name}</h1>
        <p className="mt-1 font-semibold text-slate-text">{spanText(trip.stops)}</p>
      </div>

      <section className="card grid gap-3 p-4 sm:grid-cols-[auto_1fr] sm:gap-x-6 sm:p-6" aria-label="Rig and reserve">
        <dl className="contents">
          <dt className="font-bold">Rig</dt>
          <dd>
            {rig ? (
              <>
                <a className="font-bold text-ember-deep underline" href={`/rigs/${encodeURIComponent(rig.id)}`}>{rig.name}</a>
                <span className="block text-sm text-slate-text">{rigSummary(rig)}</span>
              </>
            ) : (
              'This trip’s rig'
            )}
          </dd>
          <dt className="font-bold">Reserve</dt>
          <dd>{trip.reserveSocPct !== null ? `Keep at least ${formatNumber(trip.reserveSocPct)} % state of charge` : 'The rig’s usable floor'}</dd>
        </dl>
        {onEdit ? (
          <p className="sm:col-span-2">
            <button type="button" className="btn btn-primary" onClick={onEdit} disabled={editorLoading} aria-controls="itinerary">
              {editorLoading ? 'Opening the editor…' : 'Edit the itinerary'}
            </button>
          </p>
        ) : (
          <p className="text-sm text-slate-text sm:col-span-2">You can view this trip. A crew owner or editor can change it.</p>
        )}
      </section>

      <section aria-labelledby="stops-heading" className="space-y-3">
        <h2 id="stops-heading" className="text-xl">Stops</h2>
        <ol className="space-y-3">
          {trip.stops.map((s, i) => (
            <li key={`${s.name}-${s.arrive}`} className="card p-4 sm:p-5">
              <h3 className="text-lg">
                <span className="text-slate-text">{i + 1}.</span> {s.name}
              </h3>
              <p className="font-semibold">
                {formatDate(s.arrive)} from {formatHour(s.arriveHour)} · {s.nights} {s.nights === 1 ? 'night' : 'nights'} · leave {formatDate(addDaysIso(s.arrive, s.nights), false)}
              </p>
              <p className="text-sm text-slate-text">
                {coord(s.lat, 'N', 'S')}, {coord(s.lon, 'E', 'W')} · {s.timeZone} · {formatNumber(s.shadePct)} % shade · {s.hookup === 'shore' ? 'shore power' : 'no hookup (dry camping)'}
                {hasGenerator ? ` · generator allowed ${formatHour(s.generatorHours[0])}–${formatHour(s.generatorHours[1])}` : ''}
              </p>
              <StopWeather
                trip={trip}
                index={i}
                units={units}
                canEdit={Boolean(onEdit)}
                fallback={
                  <>
                  {s.weather.length > 0 ? (
                    <table className="mt-2 w-full max-w-md text-sm tabular-nums">
                      <caption className="sr-only">Weather planned at {s.name}</caption>
                      <thead className="text-left text-slate-text">
                        <tr>
                          <th scope="col" className="py-0.5 pr-2 font-semibold">Day</th>
                          <th scope="col" className="py-0.5 pr-2 font-semibold">Sky</th>
                          <th scope="col" className="py-0.5 pr-2 text-right font-semibold">High</th>
                          <th scope="col" className="py-0.5 text-right font-semibold">Low</th>
                        </tr>
                      </thead>
                      <tbody>
                        {s.weather.map((w) => (
                          <tr key={w.date} className="border-t border-sand">
                            <th scope="row" className="py-0.5 pr-2 text-left font-semibold">{formatDate(w.date, false)}</th>
                            <td className="py-0.5 pr-2">{skyLabel(w.cloudOktas)}</td>
                            <td className="py-0.5 pr-2 text-right">{formatTemp(w.highC, units)}</td>
                            <td className="py-0.5 text-right">{formatTemp(w.lowC, units)}</td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  ) : null}
                  {s.weather.length > 0 && s.weather.length < s.nights + 1 ? (
                    <p className="mt-1 text-sm text-slate-text">
                      Days not listed take the weather of the nearest listed day.
                    </p>
                  ) : null}
                  {s.weather.length === 0 ? (
                    <p className="mt-1 text-sm text-slate-text">
                      No weather entered: a forecast run fills these days from the weather service, and only if it cannot be reached assumes {skyLabel(ASSUMED_WEATHER.cloudOktas).toLowerCase()} days, a high of {formatTemp(ASSUMED_WEATHER.highC, units)} and a low of {formatTemp(ASSUMED_WEATHER.lowC, units)}.
                    </p>
                  ) : null}
                  </>
                }
              />
            </li>
          ))}
        </ol>
      </section>

      <section aria-labelledby="drives-heading" className="card p-4 sm:p-5">
        <h2 id="drives-heading" className="text-xl">Drive days</h2>
        {trip.drives.length > 0 ? (
          <ul className="mt-1 space-y-1">
            {trip.drives.map((d) => (
              <li key={`${d.date}-${d.startHour}`}>
                {formatDate(d.date)} from {formatHour(d.startHour)}, {d.hours} {d.hours === 1 ? 'hour' : 'hours'} (the alternator charges through the DC-DC charger)
              </li>
            ))}
          </ul>
        ) : (
          <p className="mt-1 text-slate-text">None: no alternator charging is counted between stops.</p>
        )}
      </section>
    </div>
  );
}
