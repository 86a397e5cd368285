// Plain fetchers for a trip's saved forecasts.
import { apiFetch } from '../../lib/query-client';
import type { ForecastListItem } from '../../server/forecasts';
import type { SavedForecast } from '../forecast/forecast.api';

// A list item is the server module's type (type-only import: nothing of the server reaches the bundle).
export type { ForecastListItem };

export const fetchTripForecasts = (tripId: string, signal?: AbortSignal) =>
  apiFetch<ForecastListItem[]>(`/api/trips/${encodeURIComponent(tripId)}/forecasts`, { signal });

export const runTripForecast = (tripId: string, name?: string) =>
  apiFetch<SavedForecast>(`/api/trips/${encodeURIComponent(tripId)}/forecasts`, { method: 'POST', json: name ? { name } : {} });

export const deleteSavedForecast = (id: string) => apiFetch<void>(`/api/forecasts/${encodeURIComponent(id)}`, { method: 'DELETE' });
