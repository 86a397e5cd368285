import type { ProposalStatus } from '../../domain/proposals/proposals.schema';

/** How each status reads and looks, the same on the list and the proposal. */
export const STATUS_LOOK: Record<ProposalStatus, { label: string; cls: string }> = {
  draft: { label: 'Draft', cls: 'bg-sand-dark text-dusk' },
  sent: { label: 'Waiting for the crew', cls: 'bg-sun text-dusk' },
  accepted: { label: 'Accepted', cls: 'bg-moss-deep text-white' },
  declined: { label: 'Declined', cls: 'bg-alert text-white' },
};
