import clsx from "clsx";
import { useId, type InputHTMLAttributes, type ReactNode } from "react";

type CheckboxProps = Omit<InputHTMLAttributes<HTMLInputElement>, "type"> & { label: ReactNode; hint?: ReactNode };

export function Checkbox({ label, hint, className, ...rest }: CheckboxProps) {
  const id = useId();
  return (
    <div className={clsx("flex items-start gap-2", className)}>
      <input id={id} type="checkbox" aria-describedby={hint ? `${id}-hint` : undefined} className="mt-0.5 size-4 accent-[var(--color-ink)]" {...rest} />
      <div className="flex flex-col">
        <label htmlFor={id} className="text-[0.8125rem] font-medium text-ink-soft">
          {label}
        </label>
        {hint ? (
          <p id={`${id}-hint`} className="text-xs text-ink-muted">
            {hint}
          </p>
        ) : null}
      </div>
    </div>
  );
}

type RadioGroupProps = {
  legend: string;
  name: string;
  options: ReadonlyArray<{ value: string; label: ReactNode; hint?: ReactNode }>;
  value?: string;
  defaultValue?: string;
  onChange?: (value: string) => void;
  error?: string | null;
  className?: string;
  inline?: boolean;
};

/** A fieldset of radios; the legend names the group for assistive technology. */
export function RadioGroup({ legend, name, options, value, defaultValue, onChange, error, className, inline = true }: RadioGroupProps) {
  const id = useId();
  return (
    <fieldset className={clsx("flex flex-col gap-1", className)} aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1 text-[0.8125rem] font-medium text-ink-soft">{legend}</legend>
      <div className={clsx("flex gap-x-4 gap-y-1.5", inline ? "flex-wrap items-center" : "flex-col")}>
        {options.map((option) => (
          <label key={option.value} className="flex items-start gap-2 text-[0.8125rem] text-ink">
            <input
              type="radio"
              name={name}
              value={option.value}
              checked={value === undefined ? undefined : value === option.value}
              defaultChecked={defaultValue === undefined ? undefined : defaultValue === option.value}
              onChange={onChange ? () => onChange(option.value) : undefined}
              className="mt-0.5 size-4 accent-[var(--color-ink)]"
            />
            <span>
              {option.label}
              {option.hint ? <span className="block text-xs text-ink-muted">{option.hint}</span> : null}
            </span>
          </label>
        ))}
      </div>
      {error ? (
        <p id={`${id}-error`} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
