import { useState, useSyncExternalStore, type ComponentType, type ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { makeQueryClient, queryClient } from '../../lib/query-client';
import { LoadingState } from './States';

const noSubscribe = () => () => {};

/** False on the server and during hydration, true once the island runs in the browser. */
function useHydrated(): boolean {
  return useSyncExternalStore(noSubscribe, () => true, () => false);
}

interface Options {
  /**
   * What the island shows on the server and while it hydrates. Islands on one page share the
   * cache, so one island may already hold another's data when it hydrates; rendering that data
   * straight away would not match the server's HTML. With a fallback, the island first renders
   * exactly what the server sent, then its real content. Leave it out for islands whose first
   * render reads no shared data (plain forms). A function of the props decides per use: islands
   * handed their data by the page (read on the server) return undefined and render it at once.
   */
  fallback?: ReactNode | ((props: never) => ReactNode | undefined);
}

/** The page's shared client in the browser; a client of this render alone on the server. */
export function IslandQueryProvider({ children }: { children: ReactNode }) {
  const [client] = useState(() => (typeof window === 'undefined' ? makeQueryClient() : queryClient));
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}

/** Wraps an island in the page's one QueryClient, so islands share their cache. */
export function withQueryClient<P extends object>(Component: ComponentType<P>, options: Options = {}): ComponentType<P> {
  function WithQueryClient(props: P) {
    const hydrated = useHydrated();
    const fallback = typeof options.fallback === 'function' ? (options.fallback as (p: P) => ReactNode | undefined)(props) : options.fallback;
    const gate = fallback !== undefined && !hydrated;
    return <IslandQueryProvider>{gate ? fallback : <Component {...props} />}</IslandQueryProvider>;
  }
  WithQueryClient.displayName = `WithQueryClient(${Component.displayName ?? Component.name ?? 'Island'})`;
  return WithQueryClient;
}

/** The usual fallback: a loading line. */
export const loadingFallback = (label: string) => <LoadingState label={label} />;
