import { useQueries } from '@tanstack/react-query';
import { ErrorState, LoadingState } from '../../components/ui/States';
import CompareView from '../forecast/CompareView';
import { forecastQueries } from '../forecast/forecast.queries';
import { IslandQueryProvider } from '../../components/ui/QueryProvider';
import type { Units } from '../../lib/units';

/** Two saved forecasts loaded by id and overlaid. */
export default function CompareFromApi(props: { a: string; b: string; units?: Units }) {
  return (
    <IslandQueryProvider>
      <Inner {...props} />
    </IslandQueryProvider>
  );
}

function Inner({ a, b, units }: { a: string; b: string; units?: Units }) {
  const [qa, qb] = useQueries({ queries: [forecastQueries.detail(a), forecastQueries.detail(b)] });
  if (qa.isPending || qb.isPending) return <LoadingState label="Loading both forecasts…" />;
  if (qa.isError) return <ErrorState error={qa.error} title="Couldn't load the first forecast." onRetry={() => qa.refetch()} />;
  if (qb.isError) return <ErrorState error={qb.error} title="Couldn't load the second forecast." onRetry={() => qb.refetch()} />;
  return (
    <CompareView
      a={{ name: qa.data.name, forecast: qa.data.forecast, plan: qa.data.plan, createdAt: qa.data.createdAt, engineRevision: qa.data.engineRevision }}
      b={{ name: qb.data.name, forecast: qb.data.forecast, plan: qb.data.plan, createdAt: qb.data.createdAt, engineRevision: qb.data.engineRevision }}
      reserveSocPct={qa.data.reserveSocPct}
      units={units}
    />
  );
}
