import { useState, type ReactNode } from 'react';

// The one in-page confirmation of the app (instead of the browser's confirm box): the button that asks
// is replaced by the question, the action ("Delete") and "Keep", right where the camper was looking.

interface AskFirstProps {
  /** The button that starts it: "Delete…", "Take access away…". */
  label: string;
  /** Its accessible name when the label alone is ambiguous in a list ("Delete Water pump"). */
  ariaLabel?: string;
  /** What is asked, with what goes with it. */
  question: ReactNode;
  /** The action's button: "Delete", "Withdraw". */
  confirmLabel: string;
  /** The way back: "Keep" (the loads' wording), or "Keep editing". */
  keepLabel?: string;
  onConfirm: () => void;
  /** Called when the question opens (to fetch what goes with a deletion). */
  onAsk?: () => void;
  busy?: boolean;
  /** Classes of the starting button (sizes differ between a table row and a form's foot). */
  buttonClassName?: string;
  className?: string;
}

/** A button that, pressed, asks in place: the question, the action and "Keep". */
export function AskFirst({
  label,
  ariaLabel,
  question,
  confirmLabel,
  keepLabel = 'Keep',
  onConfirm,
  onAsk,
  busy,
  buttonClassName = 'btn btn-quiet',
  className = '',
}: AskFirstProps) {
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <button
        type="button"
        className={buttonClassName}
        aria-label={ariaLabel}
        onClick={() => {
          setAsking(true);
          onAsk?.();
        }}
      >
        {label}
      </button>
    );
  }
  return (
    <Confirmation
      question={question}
      confirmLabel={confirmLabel}
      keepLabel={keepLabel}
      onConfirm={onConfirm}
      onKeep={() => setAsking(false)}
      busy={busy}
      className={className}
    />
  );
}

/** The question with its two answers, for a caller that keeps the asking state itself. */
export function Confirmation({
  question,
  confirmLabel,
  keepLabel = 'Keep',
  onConfirm,
  onKeep,
  busy,
  className = '',
}: {
  question: ReactNode;
  confirmLabel: string;
  keepLabel?: string;
  onConfirm: () => void;
  onKeep: () => void;
  busy?: boolean;
  className?: string;
}) {
  return (
    <div role="group" aria-label="Confirm" data-confirm className={`flex flex-wrap items-center justify-end gap-2 ${className}`}>
      <span className="text-sm font-semibold">{question}</span>
      <span className="flex flex-wrap gap-2">
        <button type="button" className="btn btn-primary min-h-[36px] px-3 py-1 text-sm" onClick={onConfirm} disabled={busy}>
          {confirmLabel}
        </button>
        <button type="button" className="btn btn-quiet min-h-[36px] px-3 py-1 text-sm" onClick={onKeep} disabled={busy}>
          {keepLabel}
        </button>
      </span>
    </div>
  );
}
