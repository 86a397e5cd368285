// What the proposal API returns: types only, shared by the server and the islands.
import type { Forecast, ForecastSummary, ResolvedPlan } from '../engine';
import type { CheckedCable } from './proposal';
import type { Changes, Part, ProposalStatus } from './schema';
import type { CostItem } from './sweep';

/** A proposal in a list: enough to see where it stands. */
export interface ProposalListItem {
  id: string;
  title: string;
  status: ProposalStatus;
  version: number;
  rigId: string;
  rigName: string;
  crewName: string;
  tripId: string | null;
  tripName: string | null;
  installerName: string;
  currency: string;
  total: number;
  label: string;
  before: Pick<ForecastSummary, 'minSocPct' | 'firstCutoffAt' | 'unmetWh'>;
  after: Pick<ForecastSummary, 'minSocPct' | 'firstCutoffAt' | 'unmetWh'>;
  createdAt: string;
  updatedAt: string;
  sentAt: string | null;
  decidedAt: string | null;
}

/** One side of a proposal: the plan and its forecast. */
export interface ProposalSide {
  plan: ResolvedPlan;
  forecast: Forecast;
}

/** A whole proposal, with what the caller may do with it. */
export interface ProposalDto extends ProposalListItem {
  forecastId: string | null;
  notes: string;
  changes: Changes;
  parts: (Part & { amount: number })[];
  running: CostItem[];
  cables: CheckedCable[];
  cautions: string[];
  reserveSocPct: number | null;
  before: ProposalSide & ProposalListItem['before'];
  after: ProposalSide & ProposalListItem['after'];
  decision: { comment: string; by: string | null; at: string } | null;
  /** The caller is its installer and it is still a draft. */
  canEdit: boolean;
  /** The caller is an owner of the rig's crew and it waits for an answer. */
  canDecide: boolean;
  /** The caller wrote it (an installer) rather than received it (the crew). */
  mine: boolean;
}
