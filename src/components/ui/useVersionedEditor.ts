import { useRef, useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import type { FieldValues, UseFormHandleSubmit, UseFormSetError } from 'react-hook-form';
import { useConflict } from './ConflictNotice';
import { deleteProblem, handleSaveError, type FormProblem } from './SaveProblems';

interface VersionedEditorOptions<Row, Values extends FieldValues, Output> {
  /** What the row is called in messages ("rig", "trip"). */
  what: string;
  /** The saved row, or undefined for a new one. */
  row: Row | undefined;
  create: (values: Output) => Promise<Row>;
  update: (id: string, values: Output, version: number) => Promise<Row>;
  remove: (id: string, version: number) => Promise<unknown>;
  /** After a save (or "take theirs"): put the row in the query cache and reset the form to it. */
  onSaved: (next: Row) => void;
  /** After the first save of a new row (usually: go to its page). */
  onCreated: (next: Row) => void;
  /** After the row is deleted (usually: go to the list). */
  onDeleted: () => void;
  handleSubmit: UseFormHandleSubmit<Values, Output>;
  setError: UseFormSetError<Values>;
}

/**
 * The save, delete and submit steps every editor of a versioned row shares (rig, trip): the
 * version read travels with each PATCH and DELETE; a 409 becomes a conflict the camper settles
 * (keep mine sends the edit again on top of their version, take theirs shows it); field issues go
 * next to their fields and the rest to the top of the form.
 */
export function useVersionedEditor<Row extends { id: string; version: number }, Values extends FieldValues, Output>(o: VersionedEditorOptions<Row, Values, Output>) {
  const [formError, setFormError] = useState<FormProblem | null>(null);
  const [savedAt, setSavedAt] = useState<Date | null>(null);
  const version = useRef(o.row?.version ?? 0);
  const { conflict, setConflict, keepMine } = useConflict<Row, Output>(version, (again) => save.mutate(again));

  const saved = (next: Row) => {
    version.current = next.version;
    o.onSaved(next);
    setConflict(null);
    setSavedAt(new Date());
  };

  const save = useMutation({
    mutationFn: (values: Output) => (o.row ? o.update(o.row.id, values, version.current) : o.create(values)),
    onSuccess: (next) => (o.row ? saved(next) : o.onCreated(next)),
    onError: (err, values) => handleSaveError<Row, Output, Values>(err, values, o.what, { conflict: setConflict, problem: setFormError, setError: o.setError }),
  });

  const remove = useMutation({
    mutationFn: () => o.remove(o.row!.id, version.current),
    onSuccess: () => o.onDeleted(),
    onError: (err) => setFormError(deleteProblem(err, o.what)),
  });

  const onSubmit = o.handleSubmit(
    (values) => {
      setFormError(null);
      setSavedAt(null);
      save.mutate(values);
    },
    () => setFormError({ message: 'Some fields need fixing: see the messages next to them.', issues: [] }),
  );

  return { formError, savedAt, conflict, keepMine, takeTheirs: () => conflict && saved(conflict.current), save, remove, onSubmit };
}
