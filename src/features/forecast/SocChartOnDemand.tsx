import { lazy, Suspense, useState } from 'react';
import type { SocChartProps } from './SocChart';
import SocSketch from './SocSketch';

// The interactive chart brings recharts (the largest script of the page): it loads when wanted.
const SocChart = lazy(() => import('./SocChart'));

/**
 * The state-of-charge chart, light first: the sketch (server-drawn, no script) until the camper
 * points at, touches or tabs to the chart, then the interactive chart with its hourly tooltip in
 * the same place. The hour-by-hour table under "Details" holds every figure without it.
 */
export default function SocChartOnDemand(props: SocChartProps) {
  const [live, setLive] = useState(false);
  const wake = () => setLive(true);
  const sketch = <SocSketch forecast={props.forecast} plan={props.plan} reserveSocPct={props.reserveSocPct} height={props.height} showSummary={props.showSummary} />;
  return (
    <div
      role="group"
      aria-label="State of charge chart: hover, tap or focus it to read each hour"
      tabIndex={live ? -1 : 0}
      onPointerEnter={wake}
      onPointerDown={wake}
      onFocus={wake}
      data-testid="soc-chart-on-demand"
      data-live={live ? 'true' : 'false'}
    >
      {live ? (
        <Suspense fallback={sketch}>
          <SocChart {...props} />
        </Suspense>
      ) : (
        sketch
      )}
    </div>
  );
}
