import type { ReactNode } from 'react';
import { ApiError } from '../../lib/query-client';

/** A visible, announced loading state. */
export function LoadingState({ label }: { label: string }) {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-6 text-slate-text">
      <span aria-hidden="true" className="inline-block h-5 w-5 animate-spin rounded-full border-[3px] border-sand-dark border-t-ember" />
      <span>{label}</span>
    </div>
  );
}

/** What went wrong and what to do, with a retry when one helps. */
export function ErrorState({ error, title, onRetry }: { error: unknown; title: string; onRetry?: () => void }) {
  const status = error instanceof ApiError ? error.status : 0;
  const message =
    status === 404
      ? 'It may have been deleted, or it belongs to a crew you are not in.'
      : status === 401
        ? 'Your session has ended. Sign in again to continue.'
        : error instanceof Error
          ? error.message
          : 'Something went wrong.';
  return (
    <div role="alert" className="caution my-4">
      <p className="font-bold">{title}</p>
      <p className="mt-1">{message}</p>
      <div className="mt-3 flex flex-wrap gap-2">
        {status === 401 ? <a className="btn btn-quiet" href={`/sign-in?next=${encodeURIComponent(typeof location === 'undefined' ? '/' : location.pathname)}`}>Sign in</a> : null}
        {onRetry && status !== 404 && status !== 401 ? <button type="button" className="btn btn-quiet" onClick={onRetry}>Try again</button> : null}
      </div>
    </div>
  );
}

/** An empty list, saying what goes here and how to start. */
export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-[14px] border-2 border-dashed border-sand-dark bg-card/60 px-5 py-8 text-center">
      <p className="text-lg font-extrabold">{title}</p>
      {children ? <div className="mx-auto mt-2 max-w-prose text-slate-text">{children}</div> : null}
    </div>
  );
}
