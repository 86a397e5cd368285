import { useEffect, useRef, useState } from 'react';
import { useController, type Control, type FieldValues, type Path } from 'react-hook-form';
import { Field, describedBy } from './Field';
import { asNumber } from './form';
import { SignToggle } from './SignToggle';
import { fromDisplayTemp, tempRangeMessage, tempUnit, toDisplayTemp, type Units } from '../../lib/units';

interface TemperatureInputProps<T extends FieldValues> {
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  control: Control<T, any, any>;
  name: Path<T>;
  id: string;
  label: string;
  units: Units;
  /** The schema's bounds in °C, so an out-of-range message can be stated in the user's units. */
  minC: number;
  maxC: number;
  hint?: string;
  className?: string;
  errorName?: string;
}

/**
 * A temperature typed in the user's units (°C or °F) and kept in the form in °C, the unit the
 * API and the engine store. Range errors are restated in the user's units.
 */
export function TemperatureInput<T extends FieldValues>({
  control,
  name,
  id,
  label,
  units,
  minC,
  maxC,
  hint,
  className,
  errorName,
}: TemperatureInputProps<T>) {
  const { field, fieldState, formState } = useController({ control, name });
  const shown = (c: unknown) => (typeof c === 'number' && Number.isFinite(c) ? String(toDisplayTemp(c, units)) : '');
  const [text, setText] = useState(() => shown(field.value));
  const lastSent = useRef<unknown>(field.value);

  // A reset or "take theirs" changes the value from outside: show it.
  useEffect(() => {
    if (!Object.is(field.value, lastSent.current)) {
      lastSent.current = field.value;
      setText(shown(field.value));
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [field.value]);

  // A new weather day starts empty and adding it re-checks the whole list: its message waits until the
  // box is left or the form is saved, so no red "enter a number" shows before a key is pressed.
  const raw = fieldState.isTouched || formState.isSubmitted ? fieldState.error?.message : undefined;
  const message = raw && /must be (at least|at most)/.test(raw) ? tempRangeMessage(minC, maxC, units) : raw;
  const unit = tempUnit(units);

  return (
    <Field id={id} label={`${label} (${unit})`} error={message} hint={hint} className={className} errorName={errorName ?? label}>
      <div className="flex gap-1.5">
        {/* Temperatures go below zero: the ± button stands in for the minus key a phone's decimal keypad lacks. */}
        <SignToggle inputId={id} label={label} />
        <input
          id={id}
          ref={field.ref}
          name={field.name}
          inputMode="decimal"
          autoComplete="off"
          className="field-input min-w-0 flex-1"
          value={text}
          onBlur={field.onBlur}
          onChange={(e) => {
            setText(e.target.value);
            const n = asNumber(e.target.value);
            const c = n === undefined || Number.isNaN(n) ? n : fromDisplayTemp(n, units);
            lastSent.current = c;
            field.onChange(c);
          }}
          {...describedBy(id, message, Boolean(hint))}
        />
      </div>
    </Field>
  );
}
