import clsx from "clsx";

export function Wordmark({ inverse = false, className }: { inverse?: boolean; className?: string }) {
  return (
    <span className={clsx("inline-flex items-center gap-2", className)}>
      <svg aria-hidden viewBox="0 0 32 32" className="size-6">
        <rect width="32" height="32" rx="7" fill={inverse ? "var(--color-paper)" : "var(--color-ink)"} />
        <circle cx="16" cy="16" r="9.5" fill="none" stroke={inverse ? "var(--color-ink)" : "var(--color-paper)"} strokeWidth="2" />
        <circle cx="16" cy="16" r="3.5" fill="var(--color-amber)" />
      </svg>
      <span className={clsx("text-[1.0625rem] font-semibold tracking-tight", inverse ? "text-paper" : "text-ink")}>
        Stillpoint
      </span>
    </span>
  );
}
