import type { ReactNode } from 'react';
import type { FieldValues, UseFormSetError } from 'react-hook-form';
import { ApiError, isConflict, type ApiIssue } from '../../lib/query-client';
import { applyServerIssues } from './form';
import { AskFirst } from './AskFirst';

/** A save's problem shown at the top of a form: the message, and the issues that have no field on the page. */
export interface FormProblem {
  message: string;
  issues: ApiIssue[];
}

/** The box at the top of an editor with what stopped the save (nothing when there is no problem). */
export function FormProblemBox({ problem }: { problem: FormProblem | null }) {
  if (!problem) return null;
  return (
    <div role="alert" className="caution">
      <p className="font-bold text-alert">{problem.message}</p>
      {problem.issues.length ? (
        <ul className="mt-1 list-disc pl-5">
          {problem.issues.map((i) => (
            <li key={i.path + i.message}>
              <code>{i.path}</code>: {i.message}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

/**
 * Sorts a failed save of a versioned row (rig, trip): a 409 carrying the current row becomes a
 * conflict for the camper to settle (nothing is overwritten); field issues go next to their fields
 * and the rest to the top of the form.
 */
export function handleSaveError<Row, Mine, F extends FieldValues>(
  err: unknown,
  mine: Mine,
  what: string,
  on: { conflict: (c: { current: Row; mine: Mine }) => void; problem: (p: FormProblem) => void; setError: UseFormSetError<F> },
): void {
  if (isConflict(err)) {
    const current = err.current<Row>();
    if (current) return on.conflict({ current, mine });
  }
  if (err instanceof ApiError) on.problem({ message: err.message, issues: applyServerIssues(err.issues, on.setError) });
  else on.problem({ message: `Could not save the ${what}. Try again.`, issues: [] });
}

/** What a refused delete of a versioned row shows: a 409 means someone changed it meanwhile. */
export function deleteProblem(err: unknown, what: string): FormProblem {
  if (isConflict(err)) return { message: `Someone changed this ${what} since you opened it. Reload the page to see their changes before deleting it.`, issues: [] };
  return { message: err instanceof Error ? err.message : `Could not delete the ${what}.`, issues: [] };
}

/**
 * The foot of an editor: "Delete …" asks once more before it deletes, in place (AskFirst). `onAsk` runs
 * when the question opens, so the question can say what goes with the deletion once it is known.
 */
export function DeleteRow({ label, question, onDelete, busy, onAsk }: { label: string; question: ReactNode; onDelete: () => void; busy: boolean; onAsk?: () => void }) {
  return (
    <div className="flex justify-end border-t border-sand-dark pt-4">
      <AskFirst label={label} question={question} confirmLabel="Delete" onConfirm={onDelete} onAsk={onAsk} busy={busy} />
    </div>
  );
}
