// Phones' decimal keypads (iPhone's inputMode="decimal") have no minus key, so a western longitude or a
// night below zero could not be typed. Signed boxes keep that keypad and get this ± button beside them.

/** The typed text with its sign switched: "109.55" → "-109.55", "−4" → "4"; an empty box becomes "-". */
export function flippedSign(text: string): string {
  const t = text.trim();
  if (/^[-\u2212\u2012\u2013]/.test(t)) return t.slice(1).trimStart();
  return `-${t.replace(/^\+\s*/, '')}`;
}

/**
 * Switches the sign of the number in the box `inputId`, as if the camper had typed it: the form hears an
 * input event (so the locale reader and the validation run as for any keystroke) and the box keeps focus,
 * so a phone's keypad stays up for the digits.
 */
function flip(inputId: string): void {
  const input = document.getElementById(inputId);
  if (!(input instanceof HTMLInputElement)) return;
  const setValue = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value')?.set;
  setValue?.call(input, flippedSign(input.value));
  input.dispatchEvent(new Event('input', { bubbles: true }));
  input.focus();
  const end = input.value.length;
  input.setSelectionRange(end, end);
}

/** The ± button beside a signed number box; its accessible name says which field it changes. */
export function SignToggle({ inputId, label, disabled }: { inputId: string; label: string; disabled?: boolean }) {
  return (
    <button
      type="button"
      className="btn btn-quiet min-h-[44px] min-w-[44px] shrink-0 px-0 text-lg leading-none"
      aria-label={`Switch ${label} between plus and minus`}
      title="Switch between plus and minus"
      disabled={disabled}
      // Keeps the focus (and a phone's keypad) in the box while the button is pressed.
      onPointerDown={(e) => e.preventDefault()}
      onClick={() => flip(inputId)}
    >
      ±
    </button>
  );
}
