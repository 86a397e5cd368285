import { lazy, Suspense, useState } from 'react';
import { useSeen } from '../../components/ui/useSeen';
import type { Forecast, ResolvedPlan } from '../../engine';
import type { Units } from '../../lib/units';
import AdvicePanel from './AdvicePanel';
import CsvButton from './CsvButton';
import HourlyTable from './HourlyTable';
import SocChartOnDemand from './SocChartOnDemand';
import SummaryCards from './SummaryCards';
import VerdictBanner from './VerdictBanner';
import WeatherPanel from './WeatherPanel';

// The charts below the fold bring recharts: they load when the camper scrolls to them (or prints).
const loadDaily = () => import('./DailyEnergyChart');
const loadHourly = () => import('./HourlyFlowChart');
const DailyEnergyChart = lazy(loadDaily);
const HourlyFlowChart = lazy(loadHourly);

/** Stands in for a chart that has not loaded yet, at the chart's height (nothing moves when it arrives). */
function ChartSpace({ height }: { height: number }) {
  return <div className="animate-pulse rounded-lg bg-sand/70" style={{ height }} aria-hidden="true" data-pending="" />;
}

/**
 * Prints the whole forecast: parts that load on view are loaded first, then the browser's print
 * dialog opens once nothing on the page is still pending (or after 3 s).
 */
async function printAll(wake: () => void): Promise<void> {
  wake();
  await Promise.all([loadDaily(), loadHourly(), import('../../domain/advice/advice')]).catch(() => undefined);
  const started = Date.now();
  while (document.querySelector('[data-pending]') && Date.now() - started < 3000) await new Promise((r) => setTimeout(r, 50));
  window.print();
}

export interface ForecastViewProps {
  forecast: Forecast;
  plan: ResolvedPlan;
  /** The trip's reserve; the bank's floor when null. */
  reserveSocPct?: number | null;
  /** A saved forecast's id: the CSV then comes from its route. */
  forecastId?: string | null;
  /** The forecast's name, for the CSV file. */
  name?: string;
  /** The reader's units setting: temperatures in the table, the words and the CSV follow it. */
  units?: Units;
}

// Heights the two day charts take with their keys and captions, px (measured at phone width).
const DAILY_SPACE = 320;
const HOURLY_SPACE = 380;

/** Class names that let charts shrink to the paper when printed (recharts draws at the screen's width). */
export const PRINT_CHARTS = 'print:[&_.recharts-wrapper]:!w-full print:[&_.recharts-surface]:h-auto print:[&_.recharts-surface]:max-w-full';

/** The whole forecast, top to bottom: verdict, SOC chart, summary, days, advice, details (ux.md). */
export default function ForecastView({ forecast, plan, reserveSocPct = null, forecastId = null, name, units = 'metric' }: ForecastViewProps) {
  const [everything, setEverything] = useState(false);
  const days = useSeen<HTMLElement>(everything);
  return (
    <div className={`space-y-5 ${PRINT_CHARTS}`} data-testid="forecast-view">
      <VerdictBanner forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} units={units} />

      <section aria-labelledby="soc-heading" className="card p-3 sm:p-5 print:break-inside-avoid">
        <h2 id="soc-heading" className="mb-1 text-xl">State of charge, hour by hour</h2>
        <SocChartOnDemand forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} />
      </section>

      <WeatherPanel forecast={forecast} plan={plan} units={units} />

      <section aria-labelledby="summary-heading" className="print:break-inside-avoid">
        <h2 id="summary-heading" className="mb-2 text-xl">The trip in numbers <span className="text-base font-semibold text-slate-text">(estimates)</span></h2>
        <SummaryCards forecast={forecast} />
      </section>

      <section ref={days.ref} aria-labelledby="days-heading" className="card p-3 sm:p-5 print:break-inside-avoid">
        <h2 id="days-heading" className="mb-2 text-xl">Days: loads against charging</h2>
        {days.seen ? (
          <Suspense fallback={<ChartSpace height={DAILY_SPACE} />}>
            <DailyEnergyChart forecast={forecast} />
          </Suspense>
        ) : (
          <ChartSpace height={DAILY_SPACE} />
        )}
        <h3 className="mb-2 mt-6 text-lg">One day, hour by hour</h3>
        {days.seen ? (
          <Suspense fallback={<ChartSpace height={HOURLY_SPACE} />}>
            <HourlyFlowChart forecast={forecast} />
          </Suspense>
        ) : (
          <ChartSpace height={HOURLY_SPACE} />
        )}
      </section>

      <AdvicePanel forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} now={everything} units={units} />

      <section aria-labelledby="details-heading" className="card p-3 sm:p-5 print:hidden">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="details-heading" className="text-xl">Details</h2>
          <div className="no-print flex flex-wrap gap-2">
            <CsvButton forecast={forecast} forecastId={forecastId} name={name} units={units} />
            <button type="button" className="btn btn-quiet" onClick={() => void printAll(() => setEverything(true))}>Print</button>
          </div>
        </div>
        <HourlyTable forecast={forecast} plan={plan} units={units} />
      </section>
    </div>
  );
}
