// Plain fetchers of the proposals area (no React).
import { apiFetch } from '../../lib/query-client';
import type { ProposalDto, ProposalListItem, CandidatesInput, ChangesInput, DecisionInput, PriceList, ProposalPatchInput } from '../../domain/proposals/proposals.schema';
import type { SweepResult } from '../../domain/proposals/sweep';
import type { HandPlanInput, HandPlanResult } from '../../domain/proposals/sweep-edit';

const enc = encodeURIComponent;

/** The installer's price list as `GET /api/price-list` returns it. */
export type PriceListDto = PriceList & { version: number; saved: boolean; updatedAt: string | null };

/** What `POST /api/forecasts/:id/sweep` returns. */
export type SweepResponse = SweepResult & { forecastId: string; ms: number };

export const fetchPriceList = () => apiFetch<PriceListDto>('/api/price-list');

/** Saves the price list over the version read (0 for a first save). */
export const savePriceList = (input: PriceList & { version: number }) => apiFetch<PriceListDto>('/api/price-list', { method: 'PUT', json: input });

/** Runs the upgrade sweep on a saved forecast with the installer's saved prices. */
export const runSweep = (forecastId: string, candidates: CandidatesInput, signal?: AbortSignal) =>
  apiFetch<SweepResponse>(`/api/forecasts/${enc(forecastId)}/sweep`, { method: 'POST', json: { candidates }, signal });

/** Runs an after-plan edited by hand against a saved forecast's trip. */
export const runAfterPlan = (forecastId: string, edit: HandPlanInput) => apiFetch<HandPlanResult>(`/api/forecasts/${enc(forecastId)}/after-plan`, { method: 'POST', json: edit });

/** A draft proposal from a saved forecast and one option. */
export const createProposal = (forecastId: string, changes: ChangesInput) => apiFetch<ProposalDto>('/api/proposals', { method: 'POST', json: { forecastId, changes } });

/** A draft proposal from a saved forecast and an after-plan edited by hand. */
export const createHandProposal = (forecastId: string, handPlan: HandPlanInput) => apiFetch<ProposalDto>('/api/proposals', { method: 'POST', json: { forecastId, handPlan } });

export const fetchProposals = () => apiFetch<ProposalListItem[]>('/api/proposals');

export const fetchProposal = (id: string) => apiFetch<ProposalDto>(`/api/proposals/${enc(id)}`);

export const patchProposal = (id: string, input: ProposalPatchInput) => apiFetch<ProposalDto>(`/api/proposals/${enc(id)}`, { method: 'PATCH', json: input });

export const sendProposal = (id: string, version: number) => apiFetch<ProposalDto>(`/api/proposals/${enc(id)}/send`, { method: 'POST', json: { version } });

export const decideProposal = (id: string, input: DecisionInput) => apiFetch<ProposalDto>(`/api/proposals/${enc(id)}/decision`, { method: 'POST', json: input });

export const deleteProposal = (id: string, version: number) => apiFetch<void>(`/api/proposals/${enc(id)}?version=${version}`, { method: 'DELETE' });
