import clsx from "clsx";
import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";

const CONTROL =
  "block rounded-md border bg-paper-raised px-2.5 text-sm text-ink placeholder:text-ink-muted " +
  "border-rule-strong hover:border-ink-muted aria-[invalid=true]:border-danger disabled:bg-paper-sunken disabled:text-ink-muted";

type FieldProps = {
  label: string;
  hint?: ReactNode;
  error?: string | null;
  className?: string;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
};

export function Field({ label, hint, error, className, children }: FieldProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={clsx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-[0.8125rem] font-medium text-ink-soft">
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(error) })}
      {hint ? (
        <p id={hintId} className="text-xs text-ink-muted">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type InputFieldProps = InputHTMLAttributes<HTMLInputElement> & {
  label: string;
  hint?: ReactNode;
  error?: string | null;
  fieldClassName?: string;
};

export function TextField({ label, hint, error, fieldClassName, className, ...rest }: InputFieldProps) {
  return (
    <Field label={label} hint={hint} error={error} className={fieldClassName}>
      {({ id, describedBy, invalid }) => (
        <input
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={clsx(CONTROL, "h-9 w-full", className)}
          {...rest}
        />
      )}
    </Field>
  );
}

type SelectFieldProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, "size"> & {
  label: string;
  hint?: ReactNode;
  error?: string | null;
  fieldClassName?: string;
  options: ReadonlyArray<{ value: string; label: string }>;
};

export function SelectField({ label, hint, error, fieldClassName, options, className, ...rest }: SelectFieldProps) {
  return (
    <Field label={label} hint={hint} error={error} className={fieldClassName}>
      {({ id, describedBy, invalid }) => (
        <Select id={id} aria-describedby={describedBy} aria-invalid={invalid || undefined} className={className} options={options} {...rest} />
      )}
    </Field>
  );
}

type SelectProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, "size"> & {
  options: ReadonlyArray<{ value: string; label: string }>;
  compact?: boolean;
};

/** A bare select for tables; it still needs an accessible name (aria-label) from the caller. */
export function Select({ options, className, compact = false, ...rest }: SelectProps) {
  return (
    <select className={clsx(CONTROL, compact ? "h-7 pr-7 text-[0.8125rem]" : "h-9 w-full pr-8", className)} {...rest}>
      {options.map((option) => (
        <option key={option.value} value={option.value}>
          {option.label}
        </option>
      ))}
    </select>
  );
}
