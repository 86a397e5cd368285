import { useState } from 'react';
import type { Forecast, ResolvedPlan } from '../../engine';
import { formatRowTimeWithZone } from '../../lib/format';
import { tempUnit, toDisplayTemp, type Units } from '../../lib/units';

/** Every hour as a table: the accessible view of the charts, folded under "Details". */
export default function HourlyTable({ forecast, plan, open = false, units = 'metric' }: { forecast: Forecast; plan: ResolvedPlan; open?: boolean; units?: Units }) {
  // The rows (one per hour: hundreds on a long trip) are built when the table is first opened.
  const [opened, setOpened] = useState(open);
  return (
    <details className="group" open={open} data-testid="hourly-details" onToggle={(e) => e.currentTarget.open && setOpened(true)}>
      <summary className="cursor-pointer rounded-lg py-2 font-bold text-dusk">
        Details: the hour-by-hour table ({forecast.hourly.length} hours)
      </summary>
      <div className="mt-2 max-h-[32rem] overflow-auto rounded-xl border border-sand-dark bg-white" tabIndex={0} role="region" aria-label="Hour-by-hour table">
        <table className="w-full border-collapse text-sm tabular-nums" data-testid="hourly-table">
          <caption className="sr-only">State of charge, usable charge, volts and power for every hour of the trip, in each stop’s local time. Watts are hour averages; state of charge, usable charge and volts are at the hour’s end; lowest volts is the hour’s lowest, surges included.</caption>
          <thead className="sticky top-0 bg-sand text-left">
            <tr>
              <th scope="col" className="px-2 py-1.5">Local time</th>
              <th scope="col" className="px-2 py-1.5">Stop</th>
              <th scope="col" className="px-2 py-1.5 text-right">SOC %</th>
              <th scope="col" className="px-2 py-1.5 text-right" title="Charge the loads can still draw: the cold strands some of it">Usable %</th>
              <th scope="col" className="px-2 py-1.5 text-right">Volts</th>
              <th scope="col" className="px-2 py-1.5 text-right" title="The hour’s lowest terminal voltage, surges included">Lowest V</th>
              <th scope="col" className="px-2 py-1.5 text-right">Solar W</th>
              <th scope="col" className="px-2 py-1.5 text-right">Charging W</th>
              <th scope="col" className="px-2 py-1.5 text-right">Loads W</th>
              <th scope="col" className="px-2 py-1.5 text-right">Unmet W</th>
              <th scope="col" className="px-2 py-1.5 text-right">Curtailed W</th>
              <th scope="col" className="px-2 py-1.5 text-right">Air {tempUnit(units)}</th>
            </tr>
          </thead>
          <tbody>
            {(opened ? forecast.hourly : []).map((r) => {
              const stop = forecast.stops?.[r.stop] ?? plan.stops[r.stop];
              return (
                <tr key={r.time + r.stop} className={`border-t border-sand ${r.unmetWatts > 0 ? 'bg-[#fbebe2]' : ''}`}>
                  <th scope="row" className="whitespace-nowrap px-2 py-1 text-left font-semibold">{formatRowTimeWithZone(r.time, stop?.timeZone)}</th>
                  <td className="min-w-[7rem] px-2 py-1">{stop?.name}{r.driving ? ' (driving)' : ''}{r.generatorOn ? ' (generator)' : ''}</td>
                  <td className="px-2 py-1 text-right">{r.socPct.toFixed(1)}</td>
                  {/* Snapshots saved before engine revision 2 carry no usable charge or lowest volts. */}
                  <td className="px-2 py-1 text-right">{r.usablePct === undefined ? '–' : r.usablePct.toFixed(1)}</td>
                  <td className="px-2 py-1 text-right">{r.volts.toFixed(2)}</td>
                  <td className="px-2 py-1 text-right">{r.minVolts === undefined ? '–' : r.minVolts.toFixed(2)}</td>
                  <td className="px-2 py-1 text-right">{r.solarWatts}</td>
                  <td className="px-2 py-1 text-right">{r.chargeWatts}</td>
                  <td className="px-2 py-1 text-right">{r.loadWatts}</td>
                  <td className={`px-2 py-1 text-right ${r.unmetWatts > 0 ? 'font-bold text-alert' : ''}`}>{r.unmetWatts}</td>
                  <td className="px-2 py-1 text-right">{r.curtailedWatts}</td>
                  <td className="px-2 py-1 text-right">{toDisplayTemp(r.ambientC, units).toFixed(1)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </details>
  );
}
