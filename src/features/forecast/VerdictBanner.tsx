import type { Forecast, ResolvedPlan } from '../../engine';
import { verdict, type VerdictStatus } from '../../domain/forecasts/verdict';
import type { Units } from '../../lib/units';

const LOOK: Record<VerdictStatus, { box: string; badge: string; mark: string; label: string }> = {
  'makes-it': { box: 'border-moss bg-[#eef5ef]', badge: 'bg-moss-deep text-white', mark: '✓', label: 'Makes it' },
  'below-reserve': { box: 'border-sun bg-[#fdf3dc]', badge: 'bg-[#7a5a12] text-white', mark: '!', label: 'Below reserve' },
  'runs-out': { box: 'border-ember bg-[#fbebe2]', badge: 'bg-alert text-white', mark: '✕', label: 'Runs out' },
  'weather-assumed': { box: 'border-sun bg-[#fdf3dc]', badge: 'bg-[#7a5a12] text-white', mark: '?', label: 'Weather assumed' },
  'some-years-short': { box: 'border-sun bg-[#fdf3dc]', badge: 'bg-[#7a5a12] text-white', mark: '!', label: 'Short in some years' },
};

export interface VerdictBannerProps {
  forecast: Forecast;
  plan: ResolvedPlan;
  reserveSocPct?: number | null;
  /** Heading level of the verdict sentence. */
  as?: 'h2' | 'h3';
  /** The reader's units for temperatures in the words. */
  units?: Units;
}

/** The verdict in words first; colour and mark only support them. */
export default function VerdictBanner({ forecast, plan, reserveSocPct, as: H = 'h2', units = 'metric' }: VerdictBannerProps) {
  const v = verdict(forecast, plan, reserveSocPct, units);
  const look = LOOK[v.status];
  return (
    <section className={`rounded-[14px] border-l-[6px] p-4 sm:p-5 ${look.box}`} data-testid="verdict" data-status={v.status} aria-live="polite">
      <div className="flex items-start gap-3">
        <span aria-hidden="true" className={`mt-1 inline-flex h-8 w-8 shrink-0 items-center justify-center rounded-full text-lg font-extrabold ${look.badge}`}>
          {look.mark}
        </span>
        <div>
          <H className="text-xl leading-snug sm:text-2xl" data-testid="verdict-headline">{v.headline}</H>
          <p className="mt-1 text-dusk">{v.detail}</p>
        </div>
      </div>
    </section>
  );
}
