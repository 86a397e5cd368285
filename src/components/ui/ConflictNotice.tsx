import type { ReactNode } from 'react';
import { formatDistanceToNowStrict } from 'date-fns';

interface ConflictNoticeProps {
  what: string;
  theirs: { version: number; updatedAt?: string };
  onKeepMine: () => void;
  onTakeTheirs: () => void;
  busy?: boolean;
  children?: ReactNode;
}

/**
 * Someone else saved the same thing while this person was editing. Nothing is overwritten until
 * they choose: keep their own edit (sent again on top of the other version) or take the other one.
 */
export function ConflictNotice({ what, theirs, onKeepMine, onTakeTheirs, busy, children }: ConflictNoticeProps) {
  const age = theirs.updatedAt ? Date.now() - new Date(theirs.updatedAt).getTime() : NaN;
  const when = !Number.isFinite(age) ? 'while you were editing' : age < 60_000 ? 'just now' : formatDistanceToNowStrict(new Date(theirs.updatedAt!), { addSuffix: true });
  return (
    <div role="alert" className="caution my-3" data-conflict>
      <p className="font-bold">Someone else saved this {what} {when} (version {theirs.version}).</p>
      <p className="mt-1">Your changes are not saved yet. Keep yours to save them over the other version, or take theirs and drop your edit.</p>
      {children}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn btn-primary" onClick={onKeepMine} disabled={busy}>Keep mine</button>
        <button type="button" className="btn btn-quiet" onClick={onTakeTheirs} disabled={busy}>Take theirs</button>
      </div>
    </div>
  );
}
