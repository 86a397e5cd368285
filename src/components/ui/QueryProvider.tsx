import type { ComponentType } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { queryClient } from '../../lib/query-client';

/** Wraps an island in the page's one QueryClient, so islands share their cache. */
export function withQueryClient<P extends object>(Component: ComponentType<P>): ComponentType<P> {
  function WithQueryClient(props: P) {
    return (
      <QueryClientProvider client={queryClient}>
        <Component {...props} />
      </QueryClientProvider>
    );
  }
  WithQueryClient.displayName = `WithQueryClient(${Component.displayName ?? Component.name ?? 'Island'})`;
  return WithQueryClient;
}
