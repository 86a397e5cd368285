// Plain fetchers for a trip's saved forecasts.
import type { Forecast } from '../../engine';
import { apiFetch } from '../../lib/query-client';
import type { SavedForecast } from '../forecast/forecast.api';

/** A saved forecast in a trip's list (no hourly series). */
export interface ForecastListItem {
  id: string;
  tripId: string;
  name: string;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  summary: Forecast['summary'];
  reserveSocPct: number | null;
}

export const fetchTripForecasts = (tripId: string, signal?: AbortSignal) =>
  apiFetch<ForecastListItem[]>(`/api/trips/${encodeURIComponent(tripId)}/forecasts`, { signal });

export const runTripForecast = (tripId: string, name?: string) =>
  apiFetch<SavedForecast>(`/api/trips/${encodeURIComponent(tripId)}/forecasts`, { method: 'POST', json: name ? { name } : {} });

export const deleteSavedForecast = (id: string) => apiFetch<void>(`/api/forecasts/${encodeURIComponent(id)}`, { method: 'DELETE' });
