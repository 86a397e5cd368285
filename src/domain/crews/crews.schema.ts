import { z } from 'zod';
import { emailField } from '../accounts/accounts.schema';
import { versionField } from '../shared/patch';

/** Crews, members, invitations and installer grants: request shapes shared by routes and forms. */

export const CREW_ROLES = ['owner', 'editor', 'viewer'] as const;
export type CrewRoleName = (typeof CREW_ROLES)[number];

export const roleField = z.enum(CREW_ROLES, { error: 'Choose owner, editor or viewer.' });

export const crewNameField = z.string({ error: 'must be text' }).trim().min(1, { error: 'Give the crew a name.' }).max(80, { error: 'Use at most 80 characters.' });

export const crewCreateSchema = z.object({ name: crewNameField });
export const crewRenameSchema = z.object({ name: crewNameField, version: versionField });
export type CrewRenameInput = z.input<typeof crewRenameSchema>;

export const activeCrewSchema = z.object({ crewId: z.string({ error: 'Choose a crew.' }).min(1, { error: 'Choose a crew.' }) });

export const memberRoleSchema = z.object({ role: roleField, version: versionField });

export const invitationCreateSchema = z.object({ email: emailField, role: roleField });
export type InvitationCreateInput = z.input<typeof invitationCreateSchema>;

export const invitationResendSchema = z.object({ version: versionField });

export const invitationAcceptSchema = z.object({ token: z.string({ error: 'Open the link from the invitation e-mail.' }).min(16, { error: 'The invitation link is incomplete: open the whole link from the e-mail.' }).max(200) });

export const grantCreateSchema = z.object({ email: emailField });
export type GrantCreateInput = z.input<typeof grantCreateSchema>;

export interface CrewSummaryDto {
  id: string;
  name: string;
  role: CrewRoleName;
  version: number;
  memberCount: number;
  active: boolean;
}

export interface MemberDto {
  userId: string;
  name: string;
  email: string;
  role: CrewRoleName;
  version: number;
  joinedAt: string;
  isYou: boolean;
}

export type InvitationStatus = 'pending' | 'expired' | 'accepted' | 'revoked';

export interface InvitationDto {
  id: string;
  crewId: string;
  email: string;
  role: CrewRoleName;
  status: InvitationStatus;
  invitedBy: string | null;
  expiresAt: string;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface CrewDetailDto {
  id: string;
  name: string;
  version: number;
  /** The signed-in user's role in this crew. */
  role: CrewRoleName;
  active: boolean;
  members: MemberDto[];
  /** Open and expired invitations; only owners see them (empty otherwise). */
  invitations: InvitationDto[];
}

export interface GrantDto {
  id: string;
  rigId: string;
  installer: { id: string; name: string; email: string };
  grantedBy: string | null;
  createdAt: string;
}

/** A rig share not yet opened: the address as the owner typed it. */
export interface ShareInviteDto {
  id: string;
  rigId: string;
  email: string;
  invitedBy: string | null;
  createdAt: string;
}

export interface InstallerRigDto {
  grantId: string;
  rigId: string;
  rigName: string;
  crewName: string;
  grantedBy: string | null;
  grantedAt: string;
  loadCount: number;
  tripCount: number;
  bank: { chemistry?: string; capacityAh?: number; nominalVolts?: number } | null;
}

export interface ActivityDto {
  id: string;
  loadId: string | null;
  loadName: string;
  action: 'added' | 'changed' | 'removed' | 'imported';
  by: string | null;
  changes: Record<string, [unknown, unknown]>;
  at: string;
}
