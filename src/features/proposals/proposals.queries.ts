// Query keys and options of the proposals area.
import { queryOptions } from '@tanstack/react-query';
import { fetchPriceList, fetchProposal, fetchProposals } from './proposals.api';

export const proposalKeys = {
  all: ['proposals'] as const,
  list: () => [...proposalKeys.all, 'list'] as const,
  detail: (id: string) => [...proposalKeys.all, 'detail', id] as const,
  priceList: () => ['price-list'] as const,
};

export const proposalQueries = {
  list: () => queryOptions({ queryKey: proposalKeys.list(), queryFn: fetchProposals }),
  detail: (id: string) => queryOptions({ queryKey: proposalKeys.detail(id), queryFn: () => fetchProposal(id) }),
  priceList: () => queryOptions({ queryKey: proposalKeys.priceList(), queryFn: fetchPriceList }),
};
