import type { ReactNode } from 'react';

interface FieldProps {
  id: string;
  label: string;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
  className?: string;
  /** What the error message calls the field, when the label is long or has a unit; the label otherwise. */
  errorName?: string;
}

/**
 * Names the field in a message that starts with a verb ("must be at least 0" → "Capacity must be
 * at least 0"); other messages are kept, starting with a capital.
 */
export function fieldMessage(name: string, message?: string): string | undefined {
  if (!message) return undefined;
  // zod says "must be a number" both for an empty box and for text: one plain instruction covers both.
  if (message === 'must be a number') return `${name}: enter a number.`;
  // "must be at least 0" → "Capacity must be at least 0"; any other lower-case message gets a capital.
  if (/^(must|is|are|should|cannot|needs?|overlaps)\b/.test(message)) return `${name} ${message}`;
  return message.charAt(0).toUpperCase() + message.slice(1);
}

/** A labelled form field with its hint and its error next to it. */
export function Field({ id, label, error, hint, children, className = '', errorName }: FieldProps) {
  const message = fieldMessage(errorName ?? label, error);
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">{label}</label>
      {children}
      {hint && !message ? <p id={`${id}-hint`} className="field-hint mt-1">{hint}</p> : null}
      {message ? <p id={`${id}-error`} className="field-error" role="alert">{message}</p> : null}
    </div>
  );
}

/** aria props that tie an input to its error or hint. */
export function describedBy(id: string, error?: string, hint?: boolean) {
  return {
    'aria-invalid': error ? (true as const) : undefined,
    'aria-describedby': error ? `${id}-error` : hint ? `${id}-hint` : undefined,
  };
}
