// Plain fetchers of the forecast area (no React).
import type { Forecast, Plan, ResolvedPlan } from '../../engine';
import { fromColumns, toColumns, type ColumnarForecast } from '../../lib/forecast-columns';
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

/**
 * A saved forecast as one JSON string with its hours as columns (src/lib/forecast-columns.ts): how
 * the forecast page hands it to its island. Astro writes an object prop value by value, each
 * tagged, into the page (about 5 times the JSON, and the largest cost of rendering the page); a
 * string prop is written once.
 */
export function savedForecastToJson(saved: SavedForecast): string {
  return JSON.stringify({ ...saved, forecast: toColumns(saved.forecast) });
}

// The last texts decoded: the server renders the same page text (kept per process) again and
// again, and decoding 80 KB into hourly rows is a fifth of that page's work. Read-only once made.
const decoded = new Map<string, SavedForecast>();

/** The saved forecast back from `savedForecastToJson`. Treat it as read-only: the same text gives the same object. */
export function savedForecastFromJson(text: string): SavedForecast {
  const kept = decoded.get(text);
  if (kept) return kept;
  const s = JSON.parse(text) as Omit<SavedForecast, 'forecast'> & { forecast: ColumnarForecast };
  const saved = { ...s, forecast: fromColumns(s.forecast) };
  if (decoded.size >= 8) decoded.delete(decoded.keys().next().value as string);
  decoded.set(text, saved);
  return saved;
}
