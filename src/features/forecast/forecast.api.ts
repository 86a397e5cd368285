// Plain fetchers of the forecast area (no React).
import type { Forecast, Plan, ResolvedPlan } from '../../engine';
import { fromColumns, type ColumnarForecast } from '../../lib/forecast-columns';
import { apiFetch } from '../../lib/query-client';

/** A saved forecast as `GET /api/forecasts/:id` returns it. */
export interface SavedForecast {
  id: string;
  tripId: string;
  name: string;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  plan: ResolvedPlan;
  forecast: Forecast;
  reserveSocPct: number | null;
  /** The engine revision that made it; snapshots saved before revisions were recorded are 1. */
  engineRevision?: number;
}

/** Loads one saved forecast. */
export function fetchForecast(id: string, signal?: AbortSignal): Promise<SavedForecast> {
  return apiFetch<SavedForecast>(`/api/forecasts/${encodeURIComponent(id)}`, { signal });
}

/** Forecasts a plan without saving it (anonymous, rate limited): `POST /api/forecasts/preview`, hours as columns. */
export async function previewForecast(plan: Plan, signal?: AbortSignal): Promise<Forecast> {
  return fromColumns(await apiFetch<ColumnarForecast>('/api/forecasts/preview?hourly=columns', { method: 'POST', json: plan, signal }));
}
