// Plain fetchers for installer grants; hooks live in installer.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { GrantCreateInput, GrantDto, InstallerRigDto, ShareInviteDto } from '../../domain/crews/crews.schema';

const enc = encodeURIComponent;

/** The installers a rig is shared with, the addresses invited and not yet opened, and whether the user may change that. */
export const fetchRigGrants = (rigId: string) => apiFetch<{ grants: GrantDto[]; invited: ShareInviteDto[]; canManage: boolean }>(`/api/rigs/${enc(rigId)}/grants`);

/** Shares a rig with an e-mail address; the answer is the same whoever the address belongs to. */
export const grantRig = (rigId: string, input: GrantCreateInput) =>
  apiFetch<{ invited: ShareInviteDto; message: string }>(`/api/rigs/${enc(rigId)}/grants`, { method: 'POST', json: input });

/** Takes an installer's access away, or withdraws a share not yet opened. */
export const revokeGrant = (grantId: string) => apiFetch<void>(`/api/grants/${enc(grantId)}`, { method: 'DELETE' });

/** The rigs shared with the signed-in installer. */
export const fetchInstallerRigs = () => apiFetch<InstallerRigDto[]>('/api/installer/rigs');
