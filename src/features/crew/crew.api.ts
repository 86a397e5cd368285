// Plain fetchers for crews, members and invitations; hooks live in crew.queries.ts and the islands.
import { apiFetch } from '../../lib/query-client';
import type { CrewDetailDto, CrewRenameInput, CrewRoleName, CrewSummaryDto, InvitationCreateInput, InvitationDto, MemberDto } from '../../domain/crews/crews.schema';

const enc = encodeURIComponent;

/** The crews the user is in, with the active one marked. */
export const fetchCrews = () => apiFetch<CrewSummaryDto[]>('/api/crews');

/** One crew with its members (and invitations for owners). */
export const fetchCrew = (id: string) => apiFetch<CrewDetailDto>(`/api/crews/${enc(id)}`);

/** Switches the active crew. */
export const switchCrew = (crewId: string) => apiFetch<CrewSummaryDto[]>('/api/crews/active', { method: 'PUT', json: { crewId } });

/** Starts a new crew with the user as owner. */
export const createCrew = (name: string) => apiFetch<CrewDetailDto>('/api/crews', { method: 'POST', json: { name } });

/** Renames a crew as of the version read. */
export const renameCrew = (id: string, input: CrewRenameInput) => apiFetch<{ id: string; name: string; version: number }>(`/api/crews/${enc(id)}`, { method: 'PATCH', json: input });

/** Changes a member's role as of the version read. */
export const changeRole = (crewId: string, userId: string, role: CrewRoleName, version: number) =>
  apiFetch<MemberDto>(`/api/crews/${enc(crewId)}/members/${enc(userId)}`, { method: 'PATCH', json: { role, version } });

/** Removes a member (or leaves, with one's own id). */
export const removeMember = (crewId: string, userId: string, version: number) =>
  apiFetch<void>(`/api/crews/${enc(crewId)}/members/${enc(userId)}?version=${version}`, { method: 'DELETE' });

/** Invites an e-mail address with a role. */
export const invite = (crewId: string, input: InvitationCreateInput) => apiFetch<InvitationDto>(`/api/crews/${enc(crewId)}/invitations`, { method: 'POST', json: input });

/** E-mails a fresh link for an invitation. */
export const resendInvitation = (id: string, version: number) => apiFetch<InvitationDto>(`/api/invitations/${enc(id)}/resend`, { method: 'POST', json: { version } });

/** Withdraws an invitation. */
export const revokeInvitation = (id: string, version: number) => apiFetch<void>(`/api/invitations/${enc(id)}?version=${version}`, { method: 'DELETE' });

/** Accepts the invitation of a link for the signed-in user. */
export const acceptInvitation = (token: string) => apiFetch<{ crewId: string; role: CrewRoleName; joined: boolean }>('/api/invitations/accept', { method: 'POST', json: { token } });
