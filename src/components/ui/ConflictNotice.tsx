import { useState, type MutableRefObject, type ReactNode } from 'react';
import { formatDistanceToNowStrict } from 'date-fns';
import { deviceZone, formatInstant } from '../../lib/clock';

interface ConflictNoticeProps {
  what: string;
  /** The row as it is now; `updatedBy` names who saved it (loads record it), so the notice can say who. */
  theirs: { version: number; updatedAt?: string; updatedBy?: { name: string } | null };
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
  // Shown only after a save in the browser (never server-rendered), so the browser's own zone is the reader's.
  const who = theirs.updatedBy?.name?.trim();
  const at = theirs.updatedAt && Number.isFinite(age) ? formatInstant(theirs.updatedAt, deviceZone(), age < 20 * 3_600_000 ? 'time' : 'dayTime') : null;
  return (
    <div role="alert" className="caution my-3" data-conflict>
      <p className="font-bold">{who ? `${who} changed this ${what}${at ? ` at ${at}` : ` ${when}`} (version ${theirs.version}).` : `Someone else saved this ${what} ${when} (version ${theirs.version}).`}</p>
      <p className="mt-1">Your changes are not saved yet. Keep yours to save them over the other version, or take theirs and drop your edit.</p>
      {children}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn btn-primary" onClick={onKeepMine} disabled={busy}>Keep mine</button>
        <button type="button" className="btn btn-quiet" onClick={onTakeTheirs} disabled={busy}>Take theirs</button>
      </div>
    </div>
  );
}

/**
 * The conflict state of an editor of a versioned row: `keepMine` sends the camper's edit again on
 * top of the version someone else saved (which the 409 carried); taking theirs is the editor's own
 * "saved" step with `conflict.current`.
 */
export function useConflict<Row extends { version: number }, Mine>(version: MutableRefObject<number>, resend: (mine: Mine) => void) {
  const [conflict, setConflict] = useState<{ current: Row; mine: Mine } | null>(null);
  const keepMine = () => {
    if (!conflict) return;
    version.current = conflict.current.version;
    setConflict(null);
    resend(conflict.mine);
  };
  return { conflict, setConflict, keepMine };
}
