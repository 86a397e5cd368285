import { useState } from 'react';
import type { UseFormRegisterReturn } from 'react-hook-form';
import { Field, describedBy } from './Field';
import { parseTypedNumber, userLocale } from './form';
import { formatTypedReading } from '../../lib/format';
import { SignToggle } from './SignToggle';

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
  /** The number may be below zero (a longitude, a temperature): a ± button sits beside the box, as phone keypads have no minus. */
  signed?: boolean;
}

/**
 * What the typed text reads as, for the line beside the box: the number when its plain form differs from
 * what was typed ("1,200" → "Reads as 1200 W"), or the question when it could be two numbers.
 */
export function typedReading(text: string, unit: string | undefined, locale: string): { reads?: string; ambiguous?: string } {
  const typed = parseTypedNumber(text, locale);
  const u = unit ? ` ${unit}` : '';
  if (typed.kind === 'ambiguous') {
    const [a, b] = typed.readings.map((n) => formatTypedReading(n, locale));
    return { ambiguous: `Did you mean ${a} or ${b}? Type it as one of those.` };
  }
  if (typed.kind !== 'number') return {};
  const plain = formatTypedReading(typed.value, locale);
  return plain === text.trim() ? {} : { reads: `Reads as ${plain}${u}` };
}

/**
 * A number box: a text input with a decimal keypad on phones (so a mistyped value stays visible and
 * gets a message, where a browser number input would silently blank it), the unit inside the box.
 * Typed numbers are read by the browser's locale; what the box reads as is shown beside it before saving.
 */
export function NumberField({
  id,
  label,
  registration,
  error,
  hint,
  unit,
  className,
  errorName,
  disabled,
  placeholder,
  signed,
}: NumberFieldProps) {
  const [text, setText] = useState<string | null>(null);
  const reading = text === null ? {} : typedReading(text, unit, userLocale());
  const shownError = reading.ambiguous ?? error;
  return (
    <Field id={id} label={label} error={shownError} hint={hint} className={className} errorName={errorName}>
      <div className={signed ? 'flex gap-1.5' : undefined}>
        {signed ? <SignToggle inputId={id} label={label} disabled={disabled} /> : null}
        <div className="relative min-w-0 flex-1">
          <input
            id={id}
            inputMode="decimal"
            autoComplete="off"
            className={`field-input tabular-nums ${unit ? 'pr-12' : ''}`}
            disabled={disabled}
            placeholder={placeholder}
            {...describedBy(id, shownError, Boolean(hint))}
            {...registration}
            onChange={(e) => {
              setText(e.target.value);
              return registration.onChange(e);
            }}
          />
          {unit ? (
            <span
              aria-hidden="true"
              className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm font-semibold text-slate-text"
            >
              {unit}
            </span>
          ) : null}
        </div>
      </div>
      {reading.reads && !shownError ? (
        <p id={`${id}-reads`} className="field-hint mt-1" aria-live="polite">
          {reading.reads}
        </p>
      ) : null}
    </Field>
  );
}
