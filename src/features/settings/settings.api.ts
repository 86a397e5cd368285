import { apiFetch } from '../../lib/query-client';
import type { SettingsDto, SettingsInput } from '../../domain/accounts/accounts.schema';

/** Saves the signed-in user's name and units. */
export const saveSettings = (input: SettingsInput) => apiFetch<SettingsDto>('/api/settings', { method: 'PATCH', json: input });
