import type { Forecast, ResolvedPlan } from '../../engine';
import AdvicePanel from './AdvicePanel';
import CsvButton from './CsvButton';
import DailyEnergyChart from './DailyEnergyChart';
import HourlyFlowChart from './HourlyFlowChart';
import HourlyTable from './HourlyTable';
import SocChart from './SocChart';
import SummaryCards from './SummaryCards';
import VerdictBanner from './VerdictBanner';

export interface ForecastViewProps {
  forecast: Forecast;
  plan: ResolvedPlan;
  /** The trip's reserve; the bank's floor when null. */
  reserveSocPct?: number | null;
  /** A saved forecast's id: the CSV then comes from its route. */
  forecastId?: string | null;
  /** The forecast's name, for the CSV file. */
  name?: string;
}

/** Class names that let charts shrink to the paper when printed (recharts draws at the screen's width). */
export const PRINT_CHARTS = 'print:[&_.recharts-wrapper]:!w-full print:[&_.recharts-surface]:h-auto print:[&_.recharts-surface]:max-w-full';

/** The whole forecast, top to bottom: verdict, SOC chart, summary, days, advice, details (ux.md). */
export default function ForecastView({ forecast, plan, reserveSocPct = null, forecastId = null, name }: ForecastViewProps) {
  return (
    <div className={`space-y-5 ${PRINT_CHARTS}`} data-testid="forecast-view">
      <VerdictBanner forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} />

      <section aria-labelledby="soc-heading" className="card p-3 sm:p-5 print:break-inside-avoid">
        <h2 id="soc-heading" className="mb-1 text-xl">State of charge, hour by hour</h2>
        <SocChart forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} />
      </section>

      <section aria-labelledby="summary-heading" className="print:break-inside-avoid">
        <h2 id="summary-heading" className="mb-2 text-xl">The trip in numbers <span className="text-base font-semibold text-slate-text">(estimates)</span></h2>
        <SummaryCards forecast={forecast} />
      </section>

      <section aria-labelledby="days-heading" className="card p-3 sm:p-5 print:break-inside-avoid">
        <h2 id="days-heading" className="mb-2 text-xl">Days: loads against charging</h2>
        <DailyEnergyChart forecast={forecast} />
        <h3 className="mb-2 mt-6 text-lg">One day, hour by hour</h3>
        <HourlyFlowChart forecast={forecast} />
      </section>

      <AdvicePanel forecast={forecast} plan={plan} reserveSocPct={reserveSocPct} />

      <section aria-labelledby="details-heading" className="card p-3 sm:p-5 print:hidden">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="details-heading" className="text-xl">Details</h2>
          <div className="no-print flex flex-wrap gap-2">
            <CsvButton forecast={forecast} forecastId={forecastId} name={name} />
            <button type="button" className="btn btn-quiet" onClick={() => window.print()}>Print</button>
          </div>
        </div>
        <HourlyTable forecast={forecast} plan={plan} />
      </section>
    </div>
  );
}
