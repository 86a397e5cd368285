import type { UseFormRegisterReturn } from 'react-hook-form';
import { Field, describedBy } from './Field';

interface NumberFieldProps {
  id: string;
  label: string;
  registration: UseFormRegisterReturn;
  error?: string;
  hint?: string;
  /** The unit shown inside the box, e.g. "Ah", "%", "W". */
  unit?: string;
  className?: string;
  errorName?: string;
  disabled?: boolean;
  placeholder?: string;
}

/**
 * A number box: a text input with a decimal keypad on phones (so a mistyped value stays visible and
 * gets a message, where a browser number input would silently blank it), the unit inside the box.
 */
export function NumberField({ id, label, registration, error, hint, unit, className, errorName, disabled, placeholder }: NumberFieldProps) {
  return (
    <Field id={id} label={label} error={error} hint={hint} className={className} errorName={errorName}>
      <div className="relative">
        <input
          id={id}
          inputMode="decimal"
          autoComplete="off"
          className={`field-input tabular-nums ${unit ? 'pr-12' : ''}`}
          disabled={disabled}
          placeholder={placeholder}
          {...describedBy(id, error, Boolean(hint))}
          {...registration}
        />
        {unit ? <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text">{unit}</span> : null}
      </div>
    </Field>
  );
}
