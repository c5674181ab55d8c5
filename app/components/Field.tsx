import type { FormState } from "@/lib/validation";

interface FieldProps extends React.InputHTMLAttributes<HTMLInputElement> {
  name: string;
  label: string;
  hint?: string;
  /** key of this field in the validation errors (defaults to name) */
  errorKey?: string;
  state: FormState;
}

/** A labelled input that shows its own validation message and keeps the user's value after a refusal. */
export function Field({ name, label, hint, errorKey, state, defaultValue, ...input }: FieldProps) {
  const error = state.fieldErrors?.[errorKey ?? name];
  const id = `f-${name}`;
  return (
    <label htmlFor={id}>
      {label}
      {hint && <span className="hint">{hint}</span>}
      <input
        id={id}
        name={name}
        {...input}
        defaultValue={state.values?.[name] ?? defaultValue}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
      />
      {error && (
        <span className="field-error" id={`${id}-error`} data-testid={`error-${name}`}>
          {error}
        </span>
      )}
    </label>
  );
}

export function FormMessage({ state }: { state: FormState }) {
  if (!state.message && !state.fieldErrors?.form) return null;
  return (
    <p className="form-error" data-testid="form-error" role="status">
      {state.message ?? state.fieldErrors?.form}
    </p>
  );
}
