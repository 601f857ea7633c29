import clsx from "clsx";

type ProgressBarProps = {
  /** 0..1; null draws an indeterminate bar. */
  value: number | null;
  label: string;
  valueText?: string;
  className?: string;
};

export function ProgressBar({ value, label, valueText, className }: ProgressBarProps) {
  const fraction = value === null ? null : Math.min(1, Math.max(0, value));
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={fraction === null ? undefined : Math.round(fraction * 100)}
      aria-valuetext={valueText}
      className={clsx("h-2 w-full overflow-hidden rounded-full bg-paper-sunken ring-1 ring-rule ring-inset", className)}
    >
      <div
        className={clsx("h-full rounded-full bg-ink transition-[width] duration-500", fraction === null && "w-1/3 animate-pulse")}
        style={fraction === null ? undefined : { width: `${(fraction * 100).toFixed(1)}%` }}
      />
    </div>
  );
}
