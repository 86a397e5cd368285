// The one QueryClient shared by every island on a page (islands are separate React roots, but
// they import this same module instance), and the JSON fetch helper the feature fetchers use.
import { QueryClient } from '@tanstack/react-query';

export interface ApiIssue {
  path: string;
  message: string;
}

/** A failed API call, carrying the error envelope: code, message, issues, and (on 409) the current row. */
export class ApiError extends Error {
  constructor(
    public status: number,
    public code: string,
    message: string,
    public issues: ApiIssue[] = [],
    public body: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }

  /** The row as it is now on the server, sent with a 409. */
  current<T>(): T | undefined {
    return this.body.current as T | undefined;
  }
}

export const isConflict = (e: unknown): e is ApiError => e instanceof ApiError && e.status === 409;
export const isNotFound = (e: unknown): e is ApiError => e instanceof ApiError && e.status === 404;

type FetchInit = Omit<RequestInit, 'body'> & { json?: unknown; body?: BodyInit };

/** Fetches a same-origin API path and returns its JSON; throws ApiError with the envelope on failure. */
export async function apiFetch<T>(path: string, init: FetchInit = {}): Promise<T> {
  const headers = new Headers(init.headers);
  headers.set('accept', 'application/json');
  let body = init.body;
  if (init.json !== undefined) {
    headers.set('content-type', 'application/json');
    body = JSON.stringify(init.json);
  }
  let res: Response;
  try {
    res = await fetch(path, { ...init, headers, body, credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'Could not reach Sunreckon. Check your connection, then try again.');
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }
  if (!res.ok) {
    const env = (data ?? {}) as { error?: { code?: string; message?: string }; issues?: ApiIssue[] };
    const message =
      env.error?.message ??
      (res.status === 401
        ? 'Your session has ended. Sign in again.'
        : res.status >= 500
          ? 'Something went wrong on our side. Your data was not changed; try again.'
          : `The request failed (${res.status}).`);
    throw new ApiError(res.status, env.error?.code ?? String(res.status), message, Array.isArray(env.issues) ? env.issues : [], (data ?? {}) as Record<string, unknown>);
  }
  return data as T;
}

/** Client errors (4xx) are answers, not hiccups: retry only network and server failures. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

/** A client with Sunreckon's defaults. */
export function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      // offlineFirst: without signal a query still asks once, and the service worker answers with
      // the copy saved on the phone (public/sw.js); 'online' would leave it paused and loading.
      queries: { staleTime: 30_000, retry: shouldRetry, refetchOnWindowFocus: true, networkMode: 'offlineFirst' },
      mutations: { retry: false },
    },
  });
}

/**
 * The page's one client in the browser: islands share its cache. On the server each island
 * render gets its own (see IslandQueryProvider): a shared server cache would keep every page's
 * data for ever and hand one visitor's answers to the next.
 */
export const queryClient = makeQueryClient();
