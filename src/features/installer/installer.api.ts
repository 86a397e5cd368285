// Plain fetchers for installer grants; hooks live in installer.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { GrantCreateInput, GrantDto, InstallerRigDto } from '../../domain/crews/crews.schema';

const enc = encodeURIComponent;

/** The installers a rig is shared with, and whether the user may change that. */
export const fetchRigGrants = (rigId: string) => apiFetch<{ grants: GrantDto[]; canManage: boolean }>(`/api/rigs/${enc(rigId)}/grants`);

/** Shares a rig with an installer account by e-mail. */
export const grantRig = (rigId: string, input: GrantCreateInput) => apiFetch<GrantDto>(`/api/rigs/${enc(rigId)}/grants`, { method: 'POST', json: input });

/** Takes an installer's access away. */
export const revokeGrant = (grantId: string) => apiFetch<void>(`/api/grants/${enc(grantId)}`, { method: 'DELETE' });

/** The rigs shared with the signed-in installer. */
export const fetchInstallerRigs = () => apiFetch<InstallerRigDto[]>('/api/installer/rigs');
