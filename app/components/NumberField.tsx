"use client";

/** A controlled text input for a number (kept as typed), with the validation message for its path. */
export function NumberField({
  label, value, onChange, error, hint, testId, width,
}: { label: string; value: string; onChange: (v: string) => void; error?: string; hint?: string; testId?: string; width?: number }) {
  return (
    <label>
      {label}
      {hint && <span className="hint">{hint}</span>}
      <input
        value={value}
        inputMode="decimal"
        size={width}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={error ? true : undefined}
        data-testid={testId}
      />
      {error && <span className="field-error" data-testid={testId ? `error-${testId}` : undefined}>{error}</span>}
    </label>
  );
}

/** "" → undefined, otherwise Number() (NaN is left for zod to refuse with the field's name). */
export const num = (s: string | undefined): number | undefined => (s === undefined || s.trim() === "" ? undefined : Number(s.trim()));
